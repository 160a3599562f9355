// Package external locates the outside tools that TestExternal... tests
// compare against. A missing tool skips the test, except under CI (the
// environment variable CI set), where it fails: there the comparison must run.
package external

import (
	"os"
	"os/exec"
	"testing"
)

// python is Debian's interpreter, which has python3-mpmath and python3-scipy;
// the python3 first on PATH may not.
const python = "/usr/bin/python3"

// Python returns the path of a Python interpreter that can import mpmath and
// scipy, or skips (fails under CI) the test when there is none.
func Python(t testing.TB) string {
	t.Helper()
	out, err := exec.Command(python, "-c", "import mpmath, scipy").CombinedOutput()
	if err != nil {
		msg := python + " cannot import mpmath and scipy: " + err.Error() + " " + string(out)
		if os.Getenv("CI") != "" {
			t.Fatal(msg)
		}
		t.Skip(msg)
	}
	return python
}
