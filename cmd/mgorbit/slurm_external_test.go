package main

import (
	"context"
	"fmt"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"mgorbit/cmd/mgorbit/internal/scan"
	"mgorbit/testdata/external"
)

// slurmMissing skips the test, or fails it under CI, where the array job
// must run.
func slurmMissing(t *testing.T, why string) {
	t.Helper()
	if os.Getenv("CI") != "" {
		t.Fatalf("Slurm job-array test required in CI: %s", why)
	}
	t.Skipf("skipping: %s", why)
}

// freePortPair finds two consecutive free TCP ports (slurmctld, slurmd).
func freePortPair(t *testing.T) int {
	t.Helper()
	for try := 0; try < 50; try++ {
		l, err := net.Listen("tcp", "127.0.0.1:0")
		if err != nil {
			t.Fatal(err)
		}
		p := l.Addr().(*net.TCPAddr).Port
		l.Close()
		if p > 65000 {
			continue
		}
		if l2, err := net.Listen("tcp", fmt.Sprintf(":%d", p+1)); err == nil {
			l2.Close()
			if l1, err := net.Listen("tcp", fmt.Sprintf(":%d", p)); err == nil {
				l1.Close()
				return p
			}
		}
	}
	t.Fatal("no two consecutive free ports")
	return 0
}

// TestExternalSlurmArray runs a scan as a real Slurm job array: a one-node
// cluster on this machine (testdata/slurm/cluster.sh), the script that
// mgorbit scan --emit-slurm writes, submitted with sbatch; then mgorbit
// merge, compared row for row with the same scan run on one machine, and
// the part files read through a glob by DuckDB.
func TestExternalSlurmArray(t *testing.T) {
	if os.Geteuid() != 0 {
		slurmMissing(t, "the one-node cluster needs root (slurmd starts jobs as their owner)")
	}
	for _, tool := range []string{"munged", "slurmctld", "slurmd", "sbatch", "squeue", "sinfo", "scontrol"} {
		if _, err := exec.LookPath(tool); err != nil {
			slurmMissing(t, tool+" not found: run testdata/slurm/cluster.sh install (Debian's slurm-wlm and munge)")
		}
	}
	script := filepath.Join(external.RepoRoot(t), "testdata", "slurm", "cluster.sh")
	t0 := time.Now()
	bin := build(t)
	t.Logf("built mgorbit in %.1f s", time.Since(t0).Seconds())
	dir := t.TempDir()

	cluster := filepath.Join(dir, "cluster")
	port := freePortPair(t)
	ctx, cancel := context.WithTimeout(context.Background(), 120*time.Second)
	defer cancel()
	startCmd := exec.CommandContext(ctx, "bash", script, "start", cluster)
	startCmd.Env = append(os.Environ(), fmt.Sprintf("MGORBIT_SLURM_PORT=%d", port))
	t.Cleanup(func() {
		out, err := exec.Command("bash", script, "stop", cluster).CombinedOutput()
		if err != nil {
			t.Errorf("stopping the cluster: %v\n%s", err, out)
		}
	})
	began := time.Now()
	if out, err := startCmd.CombinedOutput(); err != nil {
		t.Fatalf("starting the one-node Slurm cluster failed: %v\n%s", err, out)
	}
	t.Logf("cluster up in %.1f s (ports %d, %d)", time.Since(began).Seconds(), port, port+1)
	env := append(os.Environ(), "SLURM_CONF="+filepath.Join(cluster, "slurm.conf"))
	for _, k := range []string{"SLURM_ARRAY_TASK_ID", "SLURM_ARRAY_TASK_COUNT", "SLURM_ARRAY_TASK_MIN", "SLURM_JOB_ID"} {
		if os.Getenv(k) != "" {
			t.Fatalf("%s is set: the test itself runs inside a Slurm job", k)
		}
	}
	slurm := func(name string, args ...string) (string, error) {
		c := exec.Command(name, args...)
		c.Env = env
		out, err := c.CombinedOutput()
		return string(out), err
	}

	scenario := filepath.Join(dir, "probe.toml")
	if err := os.WriteFile(scenario, []byte(probeTOML), 0o644); err != nil {
		t.Fatal(err)
	}
	sweep := "kernel.yukawa.lambda=log:0.3 au:30 au:7"
	arr := filepath.Join(dir, "array")
	sbatch := filepath.Join(dir, "scan.sbatch")
	if out, err := exec.Command(bin, "scan", scenario, "--sweep", sweep, "--method", "both", "--out", arr,
		"--emit-slurm", sbatch, "--slurm-tasks", "3").CombinedOutput(); err != nil {
		t.Fatalf("--emit-slurm: %v\n%s", err, out)
	}
	out, err := slurm("sbatch", "--parsable", sbatch)
	if err != nil {
		t.Fatalf("sbatch: %v\n%s", err, out)
	}
	job := strings.TrimSpace(strings.Split(strings.TrimSpace(out), ";")[0])
	began = time.Now()
	for {
		q, err := slurm("squeue", "-h", "-j", job)
		if err == nil && strings.TrimSpace(q) == "" {
			break
		}
		if time.Since(began) > 180*time.Second {
			slurm("scancel", job)
			info, _ := slurm("sinfo", "-N", "-l")
			t.Fatalf("job %s not done after 180 s:\nsqueue: %s\nsinfo: %s", job, q, info)
		}
		time.Sleep(500 * time.Millisecond)
	}
	t.Logf("array job %s of 3 tasks done in %.1f s", job, time.Since(began).Seconds())
	state, _ := slurm("scontrol", "-o", "show", "job", job)
	logs, _ := filepath.Glob(filepath.Join(arr, "mgorbit-scan-*.out"))
	var logText strings.Builder
	for _, l := range logs {
		b, _ := os.ReadFile(l)
		fmt.Fprintf(&logText, "---- %s\n%s", filepath.Base(l), b)
	}
	if n := strings.Count(state, "JobState=COMPLETED"); n != 3 {
		t.Fatalf("%d of 3 array tasks completed:\n%s\n%s", n, state, logText.String())
	}
	parts, _ := filepath.Glob(scan.PartGlob(filepath.Join(arr, "scan.parquet")))
	if len(parts) != 3 {
		t.Fatalf("%d part files, want 3:\n%s", len(parts), logText.String())
	}

	if out, err := exec.Command(bin, "merge", arr).CombinedOutput(); err != nil {
		t.Fatalf("merge: %v\n%s", err, out)
	}
	single := filepath.Join(dir, "single")
	if out, err := exec.Command(bin, "scan", scenario, "--sweep", sweep, "--method", "both", "--out", single,
		"--workers", "2", "--no-plot", "--quiet").CombinedOutput(); err != nil {
		t.Fatalf("single-machine scan: %v\n%s", err, out)
	}
	merged, err := scan.ReadTable(filepath.Join(arr, "scan.parquet"))
	if err != nil {
		t.Fatal(err)
	}
	one, err := scan.ReadTable(filepath.Join(single, "scan.parquet"))
	if err != nil {
		t.Fatal(err)
	}
	if d := scan.DiffRows(one, merged); d != "" {
		t.Errorf("merged array output against the single-machine run: %s", d)
	}
	for k, v := range one.Meta {
		if k != scan.MetaShard && k != scan.MetaWorkers && merged.Meta[k] != v {
			t.Errorf("metadata %s: single %q, merged %q", k, v, merged.Meta[k])
		}
	}
	t.Logf("whole test so far %.1f s", time.Since(t0).Seconds())
	t.Logf("merged %d rows from 3 tasks: identical to the single-machine run (shards recorded %q, workers %q)",
		len(merged.Rows), merged.Meta[scan.MetaShard], merged.Meta[scan.MetaWorkers])

	// Any reader over the part files gives the whole table: DuckDB's glob.
	view := external.ReadDuckDB(t, scan.PartGlob(filepath.Join(arr, "scan.parquet")))
	if view.RowCount != len(one.Rows) {
		t.Errorf("DuckDB reads %d rows over the part files, the scan has %d", view.RowCount, len(one.Rows))
	}
}
