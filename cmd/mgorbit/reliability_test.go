package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"mgorbit/cmd/mgorbit/internal/report"
	"mgorbit/cmd/mgorbit/internal/table"
	"mgorbit/integrator/study"
	"mgorbit/scenarios"
)

// build compiles the command (go build, from the same sources as this
// test) into a temporary directory.
func build(t *testing.T) string {
	t.Helper()
	bin := filepath.Join(t.TempDir(), "mgorbit")
	out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput()
	if err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

// longScenario takes a second or two: a relativistic orbit for 120 periods.
const longScenario = `name = "long-run"
[integrator]
method = "yoshida6"
steps_per_orbit = 300.7
orbits = 120
output_every = 10
[[kernel]]
name = "gr1pn"
[[body]]
name = "Aster"
mass = "1 Msun"
radius = "6.96e5 km"
[[body]]
name = "Tiber"
mass = "1.7e-7 Msun"
primary = "Aster"
a = "0.35 au"
e = 0.21
i = "3.5 deg"
mean_anomaly = "17 deg"
`

type result struct {
	code           int
	stdout, stderr string
}

// bin is the command under test, built by TestProcess.
var bin string

func start(t *testing.T, args ...string) (*exec.Cmd, *bytes.Buffer, *bytes.Buffer) {
	t.Helper()
	cmd := exec.Command(bin, args...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	return cmd, &out, &errb
}

func finish(t *testing.T, cmd *exec.Cmd, out, errb *bytes.Buffer) result {
	t.Helper()
	err := cmd.Wait()
	var ee *exec.ExitError
	if err != nil && !errors.As(err, &ee) {
		t.Fatal(err)
	}
	return result{cmd.ProcessState.ExitCode(), out.String(), errb.String()}
}

func mgorbit(t *testing.T, args ...string) result {
	t.Helper()
	cmd, out, errb := start(t, args...)
	return finish(t, cmd, out, errb)
}

var computedRe = regexp.MustCompile(`mgorbit: (\d+) steps computed(?:, (\d+) taken over from the checkpoint)?`)

// stepsComputed reads the run's report of the steps it computed and took
// over from a checkpoint.
func stepsComputed(t *testing.T, stderr string) (computed, resumed int64) {
	t.Helper()
	m := computedRe.FindStringSubmatch(stderr)
	if m == nil {
		t.Fatalf("no step count on stderr:\n%s", stderr)
	}
	computed, _ = strconv.ParseInt(m[1], 10, 64)
	if m[2] != "" {
		resumed, _ = strconv.ParseInt(m[2], 10, 64)
	}
	return computed, resumed
}

func sameFiles(t *testing.T, a, b string) {
	t.Helper()
	for _, name := range []string{"summary.parquet", "trajectory.parquet"} {
		x, err := os.ReadFile(filepath.Join(a, name))
		if err != nil {
			t.Fatal(err)
		}
		y, err := os.ReadFile(filepath.Join(b, name))
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(x, y) {
			t.Errorf("%s differs between %s and %s (%d and %d bytes)", name, a, b, len(x), len(y))
		}
	}
}

// TestProcess runs the built command as a user would: real processes,
// real signals, exit codes.
func TestProcess(t *testing.T) {
	bin = build(t)
	t.Run("KilledRunResumes", testKilledRunResumes)
	t.Run("InterruptSavesCheckpoint", testInterruptSavesCheckpoint)
	t.Run("ExitCodes", testExitCodes)
	t.Run("ResumeOtherScenarioRefused", testResumeOtherScenarioRefused)
}

// testKilledRunResumes: a real process killed with SIGKILL after its first
// periodic checkpoint leaves that checkpoint and no output; resumed, it
// computes fewer steps than a fresh run (the rest come from the
// checkpoint, and the two add up to the fresh run's count), and writes
// Parquet files byte for byte equal to an uninterrupted run's.
func testKilledRunResumes(t *testing.T) {
	dir := t.TempDir()
	scen := filepath.Join(dir, "long.toml")
	if err := os.WriteFile(scen, []byte(longScenario), 0o644); err != nil {
		t.Fatal(err)
	}
	fresh := mgorbit(t, "run", scen, "--out", filepath.Join(dir, "fresh"))
	if fresh.code != 0 {
		t.Fatalf("fresh run: exit %d\n%s", fresh.code, fresh.stderr)
	}
	need, _ := stepsComputed(t, fresh.stderr)

	out := filepath.Join(dir, "killed")
	ckpt := filepath.Join(out, checkpointName)
	cmd, o, e := start(t, "run", scen, "--out", out, "--checkpoint-every", "4000")
	deadline := time.Now().Add(2 * time.Minute)
	for {
		if _, err := os.Stat(ckpt); err == nil {
			break
		}
		if time.Now().After(deadline) || cmd.ProcessState != nil {
			cmd.Process.Kill()
			t.Fatalf("no checkpoint appeared; stderr:\n%s", e.String())
		}
		time.Sleep(5 * time.Millisecond)
	}
	if err := cmd.Process.Kill(); err != nil {
		t.Fatal(err)
	}
	killed := finish(t, cmd, o, e)
	if ws, ok := cmd.ProcessState.Sys().(syscall.WaitStatus); !ok || !ws.Signaled() || ws.Signal() != syscall.SIGKILL {
		t.Fatalf("the run was not killed (exit %d): it finished before the test could kill it\n%s", killed.code, killed.stderr)
	}
	for _, name := range []string{"summary.parquet", "trajectory.parquet"} {
		if _, err := os.Stat(filepath.Join(out, name)); err == nil {
			t.Errorf("%s exists after the kill: an output from an unfinished run", name)
		}
	}

	resumed := mgorbit(t, "run", scen, "--out", out, "--resume", "--checkpoint-every", "4000")
	if resumed.code != 0 {
		t.Fatalf("resume: exit %d\n%s", resumed.code, resumed.stderr)
	}
	computed, taken := stepsComputed(t, resumed.stderr)
	t.Logf("fresh run: %d steps; killed and resumed: %d computed after the resume, %d taken over from the checkpoint", need, computed, taken)
	if computed >= need || taken == 0 || computed+taken != need {
		t.Errorf("resume computed %d and took over %d steps; a fresh run computes %d", computed, taken, need)
	}
	sameFiles(t, filepath.Join(dir, "fresh"), out)
	if _, err := os.Stat(ckpt); err == nil {
		t.Error("the checkpoint is still there after a successful run")
	}
	if left, _ := filepath.Glob(filepath.Join(out, ".*")); len(left) > 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

// testInterruptSavesCheckpoint: SIGINT and SIGTERM stop a run with exit
// code 4, a checkpoint, no output, and a message saying how to resume;
// the resumed run matches an uninterrupted one byte for byte.
func testInterruptSavesCheckpoint(t *testing.T) {
	dir := t.TempDir()
	scen := filepath.Join(dir, "long.toml")
	if err := os.WriteFile(scen, []byte(longScenario), 0o644); err != nil {
		t.Fatal(err)
	}
	fresh := mgorbit(t, "run", scen, "--out", filepath.Join(dir, "fresh"), "--quiet")
	if fresh.code != 0 {
		t.Fatalf("fresh run: exit %d\n%s", fresh.code, fresh.stderr)
	}
	for _, sig := range []syscall.Signal{syscall.SIGINT, syscall.SIGTERM} {
		out := filepath.Join(dir, sig.String())
		cmd, o, e := start(t, "run", scen, "--out", out, "--quiet")
		time.Sleep(150 * time.Millisecond)
		if err := cmd.Process.Signal(sig); err != nil {
			t.Fatal(err)
		}
		r := finish(t, cmd, o, e)
		if r.code != exitInterrupted {
			t.Fatalf("%v: exit %d, want %d\n%s", sig, r.code, exitInterrupted, r.stderr)
		}
		for _, want := range []string{"interrupted after", "saved", filepath.Join(out, checkpointName), "continue with: mgorbit run", "--resume"} {
			if !strings.Contains(r.stderr, want) {
				t.Errorf("%v: message lacks %q:\n%s", sig, want, r.stderr)
			}
		}
		if _, err := os.Stat(filepath.Join(out, "summary.parquet")); err == nil {
			t.Errorf("%v: summary.parquet written by an interrupted run", sig)
		}
		again := mgorbit(t, "run", scen, "--out", out)
		if again.code != exitBadInput || !strings.Contains(again.stderr, "pass --resume") {
			t.Errorf("a new run over a checkpoint: exit %d, want %d with advice\n%s", again.code, exitBadInput, again.stderr)
		}
		// the scenario comes from the checkpoint when not named
		res := mgorbit(t, "run", "--out", out, "--resume", "--quiet")
		if res.code != 0 {
			t.Fatalf("%v: resume: exit %d\n%s", sig, res.code, res.stderr)
		}
		sameFiles(t, filepath.Join(dir, "fresh"), out)
	}
}

// testExitCodes: bad input is 2 with the file and field named, a
// tolerance breach 3, a collision 5 (real processes).
func testExitCodes(t *testing.T) {
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	base := strings.Replace(longScenario, "orbits = 120", "orbits = 5", 1)
	cases := []struct {
		name, scenario string
		args           []string
		code           int
		want           []string
	}{
		{"typo in a key", strings.Replace(base, "orbits = 5", "orbitz = 5", 1), nil, exitBadInput,
			[]string{"typo.toml:5: integrator.orbitz", "unknown key"}},
		{"tight tolerance", strings.Replace(base, "output_every = 10", "output_every = 10\nenergy_tolerance = 1e-15", 1), nil, exitAccuracy,
			[]string{"accuracy lost", "relative energy error", "exceeds the tolerance 1e-15"}},
		{"tight tolerance, keep going", strings.Replace(base, "output_every = 10", "output_every = 10\nenergy_tolerance = 1e-15", 1), []string{"--keep-going", "--quiet"}, exitOK, nil},
		// pericentre 0.035 au inside a star of 0.05 au (10.7 Rsun)
		{"collision", strings.NewReplacer("e = 0.21", "e = 0.9", `radius = "6.96e5 km"`, `radius = "0.05 au"`, "steps_per_orbit = 300.7", "steps_per_orbit = 6000.3").Replace(base), nil, exitCollision,
			[]string{"collision: Aster and Tiber touch"}},
		{"resume without checkpoint", base, []string{"--resume"}, exitBadInput, []string{"nothing to resume"}},
		{"bad --checkpoint-every", base, []string{"--checkpoint-every", "often"}, exitBadInput, []string{"--checkpoint-every", "wall-clock interval"}},
	}
	for k, c := range cases {
		file := "typo.toml"
		if k > 0 {
			file = fmt.Sprintf("case%d.toml", k)
		}
		args := append([]string{"run", write(file, c.scenario), "--out", filepath.Join(dir, fmt.Sprint("out", k))}, c.args...)
		r := mgorbit(t, args...)
		if r.code != c.code {
			t.Errorf("%s: exit %d, want %d\n%s", c.name, r.code, c.code, r.stderr)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(r.stderr, w) {
				t.Errorf("%s: stderr lacks %q:\n%s", c.name, w, r.stderr)
			}
		}
	}
}

// testResumeOtherScenarioRefused: a checkpoint resumed with another
// scenario file is bad input (exit 2), and the message names both.
func testResumeOtherScenarioRefused(t *testing.T) {
	dir := t.TempDir()
	scen := filepath.Join(dir, "long.toml")
	other := filepath.Join(dir, "other.toml")
	os.WriteFile(scen, []byte(longScenario), 0o644)
	os.WriteFile(other, []byte(strings.Replace(longScenario, "e = 0.21", "e = 0.22", 1)), 0o644)
	out := filepath.Join(dir, "out")
	cmd, o, e := start(t, "run", scen, "--out", out, "--quiet")
	time.Sleep(200 * time.Millisecond)
	cmd.Process.Signal(syscall.SIGINT)
	if r := finish(t, cmd, o, e); r.code != exitInterrupted {
		t.Fatalf("exit %d\n%s", r.code, r.stderr)
	}
	r := mgorbit(t, "run", other, "--out", out, "--resume")
	if r.code != exitBadInput || !strings.Contains(r.stderr, "written for the scenario "+scen) || !strings.Contains(r.stderr, other) {
		t.Errorf("exit %d, want %d naming both scenarios:\n%s", r.code, exitBadInput, r.stderr)
	}
}

// TestRunDeterministic: the same scenario, binary and flags give the same
// Parquet bytes, and the metadata records the tool version and the
// scenario's SHA-256 (computed here from the built-in text).
func TestRunDeterministic(t *testing.T) {
	dir := t.TempDir()
	a, b := filepath.Join(dir, "a"), filepath.Join(dir, "b")
	runCLI(t, "run", "aster-gr", "--out", a, "--quiet")
	runCLI(t, "run", "aster-gr", "--out", b, "--quiet")
	sameFiles(t, a, b)
	text, err := scenarios.BuiltinText("aster-gr")
	if err != nil {
		t.Fatal(err)
	}
	sum := sha256.Sum256([]byte(text))
	for _, name := range []string{"summary.parquet", "trajectory.parquet"} {
		var meta map[string]string
		if name == "summary.parquet" {
			_, meta, err = table.Read[report.SummaryRow](filepath.Join(a, name))
		} else {
			_, meta, err = table.Read[report.TrajectoryRow](filepath.Join(a, name))
		}
		if err != nil {
			t.Fatal(err)
		}
		if meta["mgorbit.version"] != report.Version || meta["mgorbit.scenario.sha256"] != hex.EncodeToString(sum[:]) {
			t.Errorf("%s metadata: version %q, sha256 %q; want %q and %x", name, meta["mgorbit.version"], meta["mgorbit.scenario.sha256"], report.Version, sum)
		}
	}
}

// TestExitCodeMapping: each error kind maps to its documented code.
func TestExitCodeMapping(t *testing.T) {
	for _, c := range []struct {
		err  error
		code int
	}{
		{nil, exitOK},
		{errors.New("disk full"), exitFailure},
		{inputError{errors.New("bad")}, exitBadInput},
		{fmt.Errorf("main run: %w", &study.AccuracyError{Msg: "drift"}), exitAccuracy},
		{fmt.Errorf("main run: %w", &study.EncounterError{A: "a", B: "b", H: 1, TimeScale: 1}), exitAccuracy},
		{&study.InterruptedError{Saved: true}, exitInterrupted},
		{fmt.Errorf("main run: %w", &study.CollisionError{A: "a", B: "b"}), exitCollision},
	} {
		if got := exitCode(c.err); got != c.code {
			t.Errorf("%v: exit %d, want %d", c.err, got, c.code)
		}
	}
}
