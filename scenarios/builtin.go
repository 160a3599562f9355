package scenarios

import (
	"embed"
	"fmt"
	"path"
	"sort"
	"strings"
)

// DefaultName is the built-in scenario run when none is named.
const DefaultName = "aster-gr"

//go:embed builtin/*.toml
var builtinFS embed.FS

// BuiltinNames lists the built-in scenarios, sorted.
func BuiltinNames() []string {
	entries, _ := builtinFS.ReadDir("builtin")
	var names []string
	for _, e := range entries {
		if n, ok := strings.CutSuffix(e.Name(), ".toml"); ok {
			names = append(names, n)
		}
	}
	sort.Strings(names)
	return names
}

// BuiltinText returns the TOML text of a built-in scenario, for showing or
// copying as a starting point.
func BuiltinText(name string) (string, error) {
	b, err := builtinFS.ReadFile(path.Join("builtin", name+".toml"))
	if err != nil || strings.ContainsAny(name, "/\\") {
		return "", fmt.Errorf("no built-in scenario %q (built-in: %s)", name, strings.Join(BuiltinNames(), ", "))
	}
	return string(b), nil
}

// Builtin loads a built-in scenario; its Source is "builtin:NAME".
func Builtin(name string) (*Scenario, error) {
	text, err := BuiltinText(name)
	if err != nil {
		return nil, err
	}
	return Parse("builtin:"+name, []byte(text))
}
