package scan

import (
	"context"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"mgorbit/integrator/study"
)

// integratedSpec is a small integrated scan: 6 points, a few tenths of a
// second each.
func integratedSpec(t *testing.T) *Spec {
	return newSpec(t, yukawaText, Both, "kernel.yukawa.lambda=log:0.3 au:30 au:3", "body.Probe.e=list:0.005,0.02")
}

// The table's data do not depend on the worker count or the split into
// shards: cell for cell, bit for bit.
func TestDeterministicAcrossWorkersAndShards(t *testing.T) {
	spec := integratedSpec(t)
	one, r1 := runScan(t, spec, Options{Workers: 1})
	two, r2 := runScan(t, spec, Options{Workers: 2})
	if r1.PeakConcurrent != 1 || r2.Workers != 2 || r2.PeakConcurrent != 2 {
		t.Fatalf("worker use: 1 worker ran %d at once; 2 workers: %d used, %d at once (want 1; 2, 2)",
			r1.PeakConcurrent, r2.Workers, r2.PeakConcurrent)
	}
	if d := DiffRows(one, two); d != "" {
		t.Errorf("1 worker against 2: %s", d)
	}
	if k := sameMetaExcept(one.Meta, two.Meta, MetaWorkers); k != "" {
		t.Errorf("metadata %s differs: %q against %q", k, one.Meta[k], two.Meta[k])
	}
	if one.Meta[MetaWorkers] != "1" || two.Meta[MetaWorkers] != "2" {
		t.Errorf("recorded workers %q and %q", one.Meta[MetaWorkers], two.Meta[MetaWorkers])
	}
	if len(one.Rows) != spec.Points() {
		t.Errorf("%d rows for %d points of one body", len(one.Rows), spec.Points())
	}
	for r := range one.Rows {
		if one.Point(r) != r {
			t.Fatalf("row %d holds point %d: not sorted", r, one.Point(r))
		}
	}

	for _, n := range []int{2, 4} {
		dir := t.TempDir()
		var parts []string
		for k := 1; k <= n; k++ {
			out := PartPath(filepath.Join(dir, "scan.parquet"), Shard{k, n})
			part, res := runScan(t, spec, Options{Out: out, Workers: 1 + k%2, Shard: Shard{k, n}})
			for r := range part.Rows {
				if p := part.Point(r); p%n != k-1 {
					t.Errorf("shard %d/%d holds point %d", k, n, p)
				}
			}
			if res.Points != len(part.Rows) {
				t.Errorf("shard %d/%d: %d points, %d rows", k, n, res.Points, len(part.Rows))
			}
			parts = append(parts, out)
		}
		merged, err := Merge(parts)
		if err != nil {
			t.Fatal(err)
		}
		if d := DiffRows(one, merged); d != "" {
			t.Errorf("%d shards merged against one run: %s", n, d)
		}
		if k := sameMetaExcept(one.Meta, merged.Meta, MetaWorkers, MetaShard); k != "" {
			t.Errorf("%d shards: metadata %s differs: %q against %q", n, k, one.Meta[k], merged.Meta[k])
		}
		if _, err := Merge(parts[1:]); err == nil || !strings.Contains(err.Error(), "missing shards 1/") {
			t.Errorf("merge without shard 1: error %v", err)
		}
		if _, err := Merge(append(parts, parts[0])); err == nil || !strings.Contains(err.Error(), "twice") {
			t.Errorf("merge with shard 1 twice: error %v", err)
		}
	}
}

// An interrupted scan keeps its finished points; --resume computes only
// the others, and the result is the uninterrupted table.
func TestResumeComputesOnlyMissing(t *testing.T) {
	spec := integratedSpec(t)
	full, _ := runScan(t, spec, Options{Workers: 2})

	out := filepath.Join(t.TempDir(), "scan.parquet")
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	res, err := Run(ctx, spec, Options{Out: out, Workers: 2, AfterPoint: func(done int) {
		if done == 2 {
			cancel()
		}
	}})
	if !errors.Is(err, study.ErrInterrupted) {
		t.Fatalf("interrupted run: error %v, want ErrInterrupted", err)
	}
	if _, err := os.Stat(out); !errors.Is(err, fs.ErrNotExist) {
		t.Fatalf("an interrupted run wrote %s", out)
	}
	kept, err := ReadTable(CheckpointPath(out))
	if err != nil {
		t.Fatal(err)
	}
	first := res.Computed
	if first < 2 || first >= spec.Points() || len(kept.Rows) != first {
		t.Fatalf("interrupted after %d points with %d kept; want at least 2 and fewer than %d", first, len(kept.Rows), spec.Points())
	}

	computed := 0
	res, err = Run(context.Background(), spec, Options{Out: out, Workers: 2, Resume: true,
		AfterPoint: func(int) { computed++ }})
	if err != nil {
		t.Fatal(err)
	}
	if computed != spec.Points()-first || res.Computed != computed || res.Resumed != first {
		t.Errorf("resumed run computed %d (reported %d, resumed %d); want %d computed and %d resumed",
			computed, res.Computed, res.Resumed, spec.Points()-first, first)
	}
	got, err := ReadTable(out)
	if err != nil {
		t.Fatal(err)
	}
	if d := DiffRows(full, got); d != "" {
		t.Errorf("resumed table against an uninterrupted one: %s", d)
	}
	if _, err := os.Stat(CheckpointPath(out)); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("checkpoint left behind after the scan completed")
	}

	// Resuming a finished scan computes nothing; a different scan is refused.
	computed = 0
	res, err = Run(context.Background(), spec, Options{Out: out, Resume: true, AfterPoint: func(int) { computed++ }})
	if err != nil || !res.AlreadyComplete || computed != 0 {
		t.Errorf("resuming a complete scan: %+v, %v, %d computed", res, err, computed)
	}
	other := newSpec(t, yukawaText, Both, "kernel.yukawa.lambda=log:0.3 au:30 au:4")
	var in InputError
	if _, err := Run(context.Background(), other, Options{Out: out, Resume: true}); !errors.As(err, &in) {
		t.Errorf("resuming another scan into %s: error %v, want an input error", out, err)
	}
	if _, err := Run(context.Background(), spec, Options{Out: out}); !errors.Is(err, fs.ErrExist) {
		t.Errorf("rerun without --force or --resume: error %v, want fs.ErrExist", err)
	}
}

// A point that loses accuracy stops the scan (keeping the others), unless
// KeepGoing, which records the breach as a warning on that point.
func TestAccuracyLossAndKeepGoing(t *testing.T) {
	sweep := "integrator.energy_tolerance=list:1e-3,1e-17"
	spec := newSpec(t, yukawaText, Integrate, sweep)
	out := filepath.Join(t.TempDir(), "scan.parquet")
	_, err := Run(context.Background(), spec, Options{Out: out, Workers: 1})
	var acc *study.AccuracyError
	if !errors.As(err, &acc) || !strings.Contains(err.Error(), "point 1") {
		t.Fatalf("error %v, want an accuracy error at point 1", err)
	}
	if kept, err := ReadTable(CheckpointPath(out)); err != nil || len(kept.Rows) != 1 || kept.Point(0) != 0 {
		t.Errorf("checkpoint after the failure: %v, %v; want point 0 kept", kept, err)
	}

	spec.KeepGoing = true
	tab, res := runScan(t, spec, Options{Workers: 2})
	if res.Computed != 2 {
		t.Fatalf("keep-going: %d points computed", res.Computed)
	}
	w := tab.Column(WarningsColumn)
	if tab.String(0, w) != "" || !strings.Contains(tab.String(1, w), "exceeds the tolerance") {
		t.Errorf("warnings %q and %q; want none, then the tolerance breach", tab.String(0, w), tab.String(1, w))
	}
}
