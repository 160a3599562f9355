package scenarios

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"os"

	"github.com/BurntSushi/toml"
)

// Load reads, checks and converts the scenario file at path.
func Load(path string) (*Scenario, error) {
	text, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("scenario %s: %w", path, err)
	}
	return Parse(path, text)
}

// Parse checks and converts a scenario text; name stands for the file in
// messages and becomes the Source. Every problem found is reported, as
// Problems.
func Parse(name string, text []byte) (*Scenario, error) {
	sum := sha256.Sum256(text)
	sc := &Scenario{Source: name, Hash: hex.EncodeToString(sum[:]), Text: string(text)}
	r := &report{file: name, lines: locateKeys(string(text))}

	var doc map[string]any
	if _, err := toml.Decode(string(text), &doc); err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			r.list = append(r.list, &Problem{File: name, Line: pe.Position.Line, Field: pe.LastKey,
				Msg: "TOML syntax: " + pe.Message})
			return nil, r.list
		}
		r.add("", nil, "TOML: %v", err)
		return nil, r.list
	}
	b := &builder{r: r, sc: sc}
	b.build(&table{m: doc, r: r})
	if err := r.err(); err != nil {
		return nil, err
	}
	return sc, nil
}
