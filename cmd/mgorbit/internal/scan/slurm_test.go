package scan

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

func env(m map[string]string) func(string) string { return func(k string) string { return m[k] } }

func TestShardFromEnv(t *testing.T) {
	cases := []struct {
		vars map[string]string
		want Shard
		ok   bool
		bad  bool
	}{
		{map[string]string{}, Shard{}, false, false},
		// --array=1-4: ids 1..4, SLURM_ARRAY_TASK_MIN=1.
		{map[string]string{"SLURM_ARRAY_TASK_ID": "3", "SLURM_ARRAY_TASK_COUNT": "4", "SLURM_ARRAY_TASK_MIN": "1"}, Shard{3, 4}, true, false},
		// --array=0-3: ids from 0.
		{map[string]string{"SLURM_ARRAY_TASK_ID": "0", "SLURM_ARRAY_TASK_COUNT": "4", "SLURM_ARRAY_TASK_MIN": "0"}, Shard{1, 4}, true, false},
		// No MIN: taken as 1, as in the scripts EmitSlurm writes.
		{map[string]string{"SLURM_ARRAY_TASK_ID": "4", "SLURM_ARRAY_TASK_COUNT": "4"}, Shard{4, 4}, true, false},
		{map[string]string{"SLURM_ARRAY_TASK_ID": "5", "SLURM_ARRAY_TASK_COUNT": "4"}, Shard{}, true, true},
		{map[string]string{"SLURM_ARRAY_TASK_ID": "x", "SLURM_ARRAY_TASK_COUNT": "4"}, Shard{}, true, true},
	}
	for _, c := range cases {
		sh, ok, err := ShardFromEnv(env(c.vars))
		if ok != c.ok || (err != nil) != c.bad || (!c.bad && sh != c.want) {
			t.Errorf("%v: shard %v, in array %v, error %v; want %v, %v, error %v", c.vars, sh, ok, err, c.want, c.ok, c.bad)
		}
	}
}

func TestEmitSlurm(t *testing.T) {
	var b strings.Builder
	job := SlurmJob{Executable: "/opt/bin/mgorbit", Args: []string{"/data/my scenario.toml", "--sweep", "kernel.yukawa.lambda=log:0.1 au:100 au:40", "--out", "/data/out"},
		Tasks: 8, CPUs: 2, Time: "1:00:00", Out: "/data/out/scan.parquet", Extra: []string{"--mem=2G"}}
	if err := EmitSlurm(&b, job); err != nil {
		t.Fatal(err)
	}
	s := b.String()
	for _, want := range []string{"#!/bin/bash\n", "#SBATCH --array=1-8\n", "#SBATCH --cpus-per-task=2\n", "#SBATCH --time=1:00:00\n",
		"#SBATCH --mem=2G\n", "exec /opt/bin/mgorbit scan \\\n  '/data/my scenario.toml'", "--sweep 'kernel.yukawa.lambda=log:0.1 au:100 au:40'",
		`--workers "${SLURM_CPUS_PER_TASK:-1}"`, "--resume", "/opt/bin/mgorbit merge /data/out   #"} {
		if !strings.Contains(s, want) {
			t.Errorf("script lacks %q:\n%s", want, s)
		}
	}
	if strings.Contains(s, "--shard") {
		t.Errorf("script fixes a shard; each task must take its own:\n%s", s)
	}
	// The script is valid shell (bash -n parses without running).
	if bash, err := exec.LookPath("bash"); err == nil {
		path := filepath.Join(t.TempDir(), "scan.sbatch")
		if err := os.WriteFile(path, []byte(s), 0o644); err != nil {
			t.Fatal(err)
		}
		if out, err := exec.Command(bash, "-n", path).CombinedOutput(); err != nil {
			t.Errorf("bash -n: %v\n%s", err, out)
		}
	}
	if err := EmitSlurm(&b, SlurmJob{Executable: "mgorbit", Tasks: 2}); err == nil {
		t.Error("a relative executable path was accepted")
	}
}

func TestShellQuote(t *testing.T) {
	for in, want := range map[string]string{
		"plain/path-1.toml": "plain/path-1.toml",
		"a b":               "'a b'",
		"it's":              `'it'\''s'`,
		"":                  "''",
		"$HOME":             "'$HOME'",
	} {
		if got := shellQuote(in); got != want {
			t.Errorf("shellQuote(%q) = %s, want %s", in, got, want)
		}
	}
}

func TestProgressText(t *testing.T) {
	for _, c := range []struct {
		done, total int
		elapsed     time.Duration
		want        string
	}{
		{0, 100, 0, "0/100 points"},
		// 25 points in 10 s: 2.5 points/s, 75 left take 30 s.
		{25, 100, 10 * time.Second, "25/100 points, 2.5 points/s, about 30s left"},
		{3, 10, 30 * time.Second, "3/10 points, 10 s/point, about 1m10s left"},
		{100, 100, 4 * time.Second, "100/100 points, 25 points/s, done in 4s"},
	} {
		if got := ProgressText(c.done, c.total, c.elapsed); got != c.want {
			t.Errorf("ProgressText(%d, %d, %v) = %q, want %q", c.done, c.total, c.elapsed, got, c.want)
		}
	}
}
