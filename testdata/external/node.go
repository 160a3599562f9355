package external

import (
	"os"
	"os/exec"
	"path/filepath"
	"testing"
)

// DuckDB returns the node binary and the path of testdata/duckdb/check.mjs,
// a Parquet reader built on DuckDB. The npm packages come from
// `npm ci` in testdata/duckdb, or from the directory named by
// MGORBIT_DUCKDB_DIR (one holding node_modules/@duckdb/node-api).
// When either node or the packages are missing the test is skipped, or
// fails if CI is set, since CI must run every check.
func DuckDB(t testing.TB) (node, script string) {
	t.Helper()
	node, err := exec.LookPath("node")
	if err != nil {
		duckdbMissing(t, "node not found on PATH")
	}
	root := RepoRoot(t)
	script = filepath.Join(root, "testdata", "duckdb", "check.mjs")
	if _, err := os.Stat(script); err != nil {
		t.Fatalf("DuckDB check script: %v", err)
	}

	modules := filepath.Join(root, "testdata", "duckdb", "node_modules")
	if dir := os.Getenv("MGORBIT_DUCKDB_DIR"); dir != "" {
		modules = filepath.Join(dir, "node_modules")
	}
	if _, err := os.Stat(filepath.Join(modules, "@duckdb", "node-api")); err != nil {
		duckdbMissing(t, "@duckdb/node-api not installed (run `npm ci` in testdata/duckdb or set MGORBIT_DUCKDB_DIR)")
	}
	if os.Getenv("MGORBIT_DUCKDB_DIR") != "" {
		// ES module imports resolve from the script's own directory, so
		// run a copy placed beside a link to the outside node_modules.
		dir := t.TempDir()
		body, err := os.ReadFile(script)
		if err != nil {
			t.Fatal(err)
		}
		script = filepath.Join(dir, "check.mjs")
		if err := os.WriteFile(script, body, 0o644); err != nil {
			t.Fatal(err)
		}
		if err := os.Symlink(modules, filepath.Join(dir, "node_modules")); err != nil {
			t.Fatal(err)
		}
	}
	return node, script
}

func duckdbMissing(t testing.TB, why string) {
	t.Helper()
	if os.Getenv("CI") != "" {
		t.Fatalf("DuckDB reader required in CI: %s", why)
	}
	t.Skipf("skipping: DuckDB reader unavailable: %s", why)
}

// RepoRoot walks up from the test's working directory to go.mod.
func RepoRoot(t testing.TB) string {
	t.Helper()
	dir, err := os.Getwd()
	if err != nil {
		t.Fatal(err)
	}
	for {
		if _, err := os.Stat(filepath.Join(dir, "go.mod")); err == nil {
			return dir
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			t.Fatal("go.mod not found above the working directory")
		}
		dir = parent
	}
}
