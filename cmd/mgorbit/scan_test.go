package main

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"mgorbit/cmd/mgorbit/internal/scan"
)

// probeTOML: a near-circular test body under a weak Yukawa term.
var probeTOML = func() string {
	b, err := os.ReadFile(filepath.Join("internal", "scan", "testdata", "yukawa-probe.toml"))
	if err != nil {
		panic(err)
	}
	return string(b)
}()

// scanCLI runs the command in-process and returns stdout and the exit code.
func scanCLI(t *testing.T, args ...string) (string, int) {
	t.Helper()
	root := newRoot()
	var out bytes.Buffer
	root.SetOut(&out)
	root.SetErr(&out)
	root.SetArgs(args)
	err := root.ExecuteContext(context.Background())
	return out.String(), exitCode(err)
}

func writeProbe(t *testing.T) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "probe.toml")
	if err := os.WriteFile(path, []byte(probeTOML), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestScanPlotMergeCommands(t *testing.T) {
	scenario := writeProbe(t)
	dir := t.TempDir()
	sweep := "kernel.yukawa.lambda=log:0.3 au:30 au:5"
	out, code := scanCLI(t, "scan", scenario, "--sweep", sweep, "--method", "semi", "--out", dir, "--workers", "2", "--bound", "1000")
	if code != exitOK {
		t.Fatalf("scan: exit %d\n%s", code, out)
	}
	for _, f := range []string{"scan.parquet", "scan.png"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("scan wrote no %s: %v\n%s", f, err, out)
		}
	}
	if !strings.Contains(out, "5 rows, 5 points") || !strings.Contains(out, "log x") {
		t.Errorf("scan output:\n%s", out)
	}
	// A second run without --force or --resume is refused; --resume finds it complete.
	if out, code := scanCLI(t, "scan", scenario, "--sweep", sweep, "--method", "semi", "--out", dir); code != exitBadInput {
		t.Errorf("rerun: exit %d, want %d\n%s", code, exitBadInput, out)
	}
	if out, code := scanCLI(t, "scan", scenario, "--sweep", sweep, "--method", "semi", "--out", dir, "--resume"); code != exitOK || !strings.Contains(out, "nothing to compute") {
		t.Errorf("resume of a finished scan: exit %d\n%s", code, out)
	}

	svg := filepath.Join(dir, "again.svg")
	if out, code := scanCLI(t, "plot", filepath.Join(dir, "scan.parquet"), "--y", "semi_analytic_anomaly_rad_per_orbit", "--out", svg, "--bound", "1e-4", "--bound-label", "limit"); code != exitOK {
		t.Fatalf("plot: exit %d\n%s", code, out)
	}
	if b, err := os.ReadFile(svg); err != nil || !bytes.Contains(b, []byte("<svg")) || !bytes.Contains(b, []byte("limit")) {
		t.Errorf("plot wrote no SVG with the bound: %v", err)
	}
	if out, code := scanCLI(t, "plot", filepath.Join(dir, "scan.parquet"), "--y", "no_such_column"); code != exitBadInput {
		t.Errorf("plot of an unknown column: exit %d\n%s", code, out)
	}

	// Shards, then merge: the single run's rows.
	parts := t.TempDir()
	for _, sh := range []string{"1/2", "2/2"} {
		if out, code := scanCLI(t, "scan", scenario, "--sweep", sweep, "--method", "semi", "--out", parts, "--shard", sh); code != exitOK {
			t.Fatalf("scan --shard %s: exit %d\n%s", sh, code, out)
		}
	}
	if _, err := os.Stat(filepath.Join(parts, "scan.png")); err == nil {
		t.Error("a shard drew the plot; only whole scans should")
	}
	if out, code := scanCLI(t, "merge", parts); code != exitOK || !strings.Contains(out, "5 rows") {
		t.Fatalf("merge: exit %d\n%s", code, out)
	}
	single, err := scan.ReadTable(filepath.Join(dir, "scan.parquet"))
	if err != nil {
		t.Fatal(err)
	}
	merged, err := scan.ReadTable(filepath.Join(parts, "scan.parquet"))
	if err != nil {
		t.Fatal(err)
	}
	if d := scan.DiffRows(single, merged); d != "" {
		t.Errorf("merged shards against the single run: %s", d)
	}
	// The plot command reads part files as one table too.
	if out, code := scanCLI(t, "plot", filepath.Join(parts, "scan.part-*-of-2.parquet"), "--out", filepath.Join(parts, "parts.png")); code != exitOK {
		t.Errorf("plot over part files: exit %d\n%s", code, out)
	}
}

func TestScanRejectsBadInput(t *testing.T) {
	scenario := writeProbe(t)
	for _, args := range [][]string{
		{"scan", scenario, "--sweep", "kernel.yukawa.lambda=geo:1:2:3", "--out", t.TempDir()},
		{"scan", scenario, "--sweep", "body.Nobody.e=list:0.1", "--out", t.TempDir()},
		{"scan", scenario, "--out", t.TempDir()},
		{"scan", scenario, "--sweep", "body.Probe.e=list:0.01", "--method", "guess", "--out", t.TempDir()},
		{"scan", scenario, "--sweep", "body.Probe.e=list:0.01", "--shard", "3/2", "--out", t.TempDir()},
	} {
		if out, code := scanCLI(t, args...); code != exitBadInput {
			t.Errorf("%v: exit %d, want %d\n%s", args, code, exitBadInput, out)
		}
	}
}

// Inside an array job the shard comes from Slurm's variables.
func TestScanShardFromSlurmEnvironment(t *testing.T) {
	scenario := writeProbe(t)
	dir := t.TempDir()
	t.Setenv("SLURM_ARRAY_TASK_ID", "2")
	t.Setenv("SLURM_ARRAY_TASK_COUNT", "3")
	t.Setenv("SLURM_ARRAY_TASK_MIN", "1")
	if out, code := scanCLI(t, "scan", scenario, "--sweep", "kernel.yukawa.lambda=log:0.3 au:30 au:5", "--method", "semi", "--out", dir); code != exitOK {
		t.Fatalf("exit %d\n%s", code, out)
	}
	part, err := scan.ReadTable(filepath.Join(dir, "scan.part-2-of-3.parquet"))
	if err != nil {
		t.Fatal(err)
	}
	// Shard 2 of 3 of points 0..4: points 1 and 4.
	if len(part.Rows) != 2 || part.Point(0) != 1 || part.Point(1) != 4 || part.Meta[scan.MetaShard] != "2/3" {
		t.Errorf("part holds %d rows (points %d, %d), shard %q; want points 1 and 4 of shard 2/3",
			len(part.Rows), part.Point(0), part.Point(len(part.Rows)-1), part.Meta[scan.MetaShard])
	}
}

func TestEmitSlurmCommand(t *testing.T) {
	scenario := writeProbe(t)
	dir := t.TempDir()
	script := filepath.Join(dir, "scan.sbatch")
	out, code := scanCLI(t, "scan", scenario, "--sweep", "kernel.yukawa.lambda=log:0.3 au:30 au:5", "--out", filepath.Join(dir, "res"),
		"--emit-slurm", script, "--slurm-tasks", "3", "--slurm-cpus", "2")
	if code != exitOK {
		t.Fatalf("exit %d\n%s", code, out)
	}
	b, err := os.ReadFile(script)
	if err != nil {
		t.Fatal(err)
	}
	exe, _ := os.Executable()
	if real, err := filepath.EvalSymlinks(exe); err == nil {
		exe = real
	}
	s := string(b)
	for _, want := range []string{"#SBATCH --array=1-3", "#SBATCH --cpus-per-task=2", exe, scenario, "--method both", filepath.Join(dir, "res")} {
		if !strings.Contains(s, want) {
			t.Errorf("script lacks %q:\n%s", want, s)
		}
	}
	if _, err := os.Stat(filepath.Join(dir, "res", "scan.parquet")); err == nil {
		t.Error("--emit-slurm ran the scan")
	}
}

var resumedRe = regexp.MustCompile(`computed (\d+) points in \S+ with \d+ workers(?: \((\d+) taken from the checkpoint\))?`)

// Ctrl-C stops a scan with exit code 4 and its finished points kept;
// --resume computes only the others.
func TestScanInterruptAndResumeProcess(t *testing.T) {
	exe := build(t)
	// 200 orbits: each point takes a tenth of a second or so.
	scenario := filepath.Join(t.TempDir(), "long.toml")
	if err := os.WriteFile(scenario, []byte(strings.Replace(probeTOML, "orbits = 10", "orbits = 200", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	args := []string{"scan", scenario, "--sweep", "kernel.yukawa.lambda=log:0.3 au:30 au:16", "--method", "integrate",
		"--out", dir, "--workers", "1", "--no-plot", "--checkpoint-every", "1ms"}
	cmd := exec.Command(exe, args...)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	// Interrupt once the first checkpoint is written (a point is done).
	ckpt := scan.CheckpointPath(filepath.Join(dir, "scan.parquet"))
	for deadline := time.Now().Add(60 * time.Second); ; time.Sleep(50 * time.Millisecond) {
		if _, err := os.Stat(ckpt); err == nil {
			break
		}
		if time.Now().After(deadline) {
			cmd.Process.Kill()
			t.Fatalf("no checkpoint within 60 s\n%s", stderr.String())
		}
	}
	if err := cmd.Process.Signal(os.Interrupt); err != nil {
		t.Fatal(err)
	}
	err := cmd.Wait()
	if code := cmd.ProcessState.ExitCode(); code != exitInterrupted {
		t.Fatalf("interrupted scan: exit %d (%v), want %d\n%s", code, err, exitInterrupted, stderr.String())
	}
	if !strings.Contains(stderr.String(), "--resume") {
		t.Errorf("the message does not say how to resume:\n%s", stderr.String())
	}
	if _, err := os.Stat(ckpt); err != nil {
		t.Fatalf("no checkpoint after the interruption: %v", err)
	}
	out, err := exec.Command(exe, append(args, "--resume")...).Output()
	if err != nil {
		t.Fatalf("resume: %v\n%s", err, out)
	}
	m := resumedRe.FindStringSubmatch(string(out))
	if m == nil || m[2] == "" {
		t.Fatalf("resume output has no counts:\n%s", out)
	}
	computed, _ := strconv.Atoi(m[1])
	resumed, _ := strconv.Atoi(m[2])
	t.Logf("interrupted after %d points; the resumed run computed %d", resumed, computed)
	if resumed < 1 || computed < 1 || computed+resumed != 16 {
		t.Errorf("resumed %d and computed %d points of 16", resumed, computed)
	}
}
