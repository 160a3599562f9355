package atomicfile

import (
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func writeString(s string) func(io.Writer) error {
	return func(w io.Writer) error {
		_, err := io.WriteString(w, s)
		return err
	}
}

// entries lists the directory so tests can see stray temporary files.
func entries(t *testing.T, dir string) []string {
	t.Helper()
	list, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range list {
		names = append(names, e.Name())
	}
	return names
}

func TestWriteCreatesFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	if err := Write(path, false, writeString("hello\n")); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if string(got) != "hello\n" {
		t.Errorf("content = %q, want %q", got, "hello\n")
	}
	if names := entries(t, dir); len(names) != 1 || names[0] != "out.txt" {
		t.Errorf("directory holds %v, want only out.txt", names)
	}
	info, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	if perm := info.Mode().Perm(); perm&0o044 != 0o044 {
		t.Errorf("mode %v: output should be readable by group and others", perm)
	}
}

func TestWriteFailureLeavesNothing(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	boom := errors.New("boom")
	err := Write(path, false, func(w io.Writer) error {
		io.WriteString(w, "partial")
		return boom
	})
	if !errors.Is(err, boom) {
		t.Fatalf("err = %v, want the error from fill", err)
	}
	if names := entries(t, dir); len(names) != 0 {
		t.Errorf("directory holds %v after a failed write, want nothing", names)
	}
}

func TestWritePanicLeavesNothing(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	func() {
		defer func() {
			if recover() == nil {
				t.Error("panic in fill was swallowed")
			}
		}()
		Write(path, false, func(w io.Writer) error {
			io.WriteString(w, "partial")
			panic("boom")
		})
	}()
	if names := entries(t, dir); len(names) != 0 {
		t.Errorf("directory holds %v after a panic, want nothing", names)
	}
}

func TestWriteRefusesExistingWithoutForce(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	called := false
	err := Write(path, false, func(w io.Writer) error {
		called = true
		return writeString("new")(w)
	})
	if !errors.Is(err, fs.ErrExist) {
		t.Fatalf("err = %v, want one wrapping fs.ErrExist", err)
	}
	if !strings.Contains(err.Error(), "--force") {
		t.Errorf("error %q does not mention --force", err)
	}
	if called {
		t.Error("fill ran although the write was refused up front")
	}
	if got, _ := os.ReadFile(path); string(got) != "old" {
		t.Errorf("existing file changed to %q", got)
	}
	if names := entries(t, dir); len(names) != 1 {
		t.Errorf("directory holds %v, want only out.txt", names)
	}
}

// A file that appears while fill runs must not be clobbered either.
func TestWriteRefusesFileCreatedDuringFill(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	err := Write(path, false, func(w io.Writer) error {
		if err := os.WriteFile(path, []byte("other"), 0o644); err != nil {
			return err
		}
		return writeString("new")(w)
	})
	if !errors.Is(err, fs.ErrExist) {
		t.Fatalf("err = %v, want one wrapping fs.ErrExist", err)
	}
	if got, _ := os.ReadFile(path); string(got) != "other" {
		t.Errorf("concurrent file changed to %q", got)
	}
	if names := entries(t, dir); len(names) != 1 {
		t.Errorf("directory holds %v, want only out.txt", names)
	}
}

func TestWriteForceReplaces(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	if err := os.WriteFile(path, []byte("old content that is longer"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := Write(path, true, writeString("new")); err != nil {
		t.Fatal(err)
	}
	if got, _ := os.ReadFile(path); string(got) != "new" {
		t.Errorf("content = %q, want %q", got, "new")
	}
	if names := entries(t, dir); len(names) != 1 {
		t.Errorf("directory holds %v, want only out.txt", names)
	}
}

func TestWriteForceFailureKeepsOld(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "out.txt")
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	err := Write(path, true, func(w io.Writer) error { return errors.New("boom") })
	if err == nil {
		t.Fatal("failed fill reported success")
	}
	if got, _ := os.ReadFile(path); string(got) != "old" {
		t.Errorf("old file changed to %q by a failed write", got)
	}
	if names := entries(t, dir); len(names) != 1 {
		t.Errorf("directory holds %v, want only out.txt", names)
	}
}

func TestWriteRelativePath(t *testing.T) {
	t.Chdir(t.TempDir())
	if err := Write("rel.txt", false, writeString("x")); err != nil {
		t.Fatal(err)
	}
	if got, _ := os.ReadFile("rel.txt"); string(got) != "x" {
		t.Errorf("content = %q, want %q", got, "x")
	}
}
