package scan

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"runtime"
	"sort"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/parquet-go/parquet-go"

	"mgorbit/integrator/study"
	"mgorbit/scenarios"
)

// Options say how to run a scan; none of them changes the table's data.
type Options struct {
	// Out is the table to write (scan.parquet, or a shard's part file).
	Out string
	// Workers is the number of points computed at once (default: all cores).
	Workers int
	Shard   Shard
	// Resume takes the points kept in Out's checkpoint instead of computing
	// them again. Without it an old checkpoint is discarded.
	Resume bool
	// Force replaces an existing Out.
	Force bool
	// CheckpointEvery is the shortest time between checkpoint writes
	// (0: DefaultCheckpointEvery; negative: after every point). Each write
	// holds every finished point, so writing after every point of a dense
	// scan would cost time quadratic in its size.
	CheckpointEvery time.Duration
	// Progress, if set, receives the points computed so far in this run and
	// the number this run has to compute.
	Progress func(done, total int)
	// AfterPoint, if set, is called after each point is stored (in one
	// goroutine), with the count computed so far: tests interrupt through it.
	AfterPoint func(done int)
}

// Result tells what a run did.
type Result struct {
	Path string
	// Points is the shard's share of the grid; Resumed of them came from a
	// checkpoint (or a finished table) and Computed were computed now.
	Points, Resumed, Computed int
	// Failed counts points recorded with point_error (KeepGoing only).
	Failed int
	Rows   int
	// Workers is the number of distinct workers that computed a point, and
	// PeakConcurrent the most points computed at the same moment.
	Workers, PeakConcurrent int
	Elapsed                 time.Duration
	// AlreadyComplete is set when Out already held this scan's finished table.
	AlreadyComplete bool
}

// DefaultCheckpointEvery bounds the work an interruption can lose.
const DefaultCheckpointEvery = 2 * time.Second

// CheckpointPath is where completed points of the table at out are kept.
// It does not end in .parquet, so globs over part files never match it.
func CheckpointPath(out string) string { return out + ".checkpoint" }

// Run computes the shard's points that are not done yet and writes the table.
func Run(ctx context.Context, s *Spec, opt Options) (*Result, error) {
	start := time.Now()
	if opt.Shard == (Shard{}) {
		opt.Shard = Whole
	}
	if err := opt.Shard.check(); err != nil {
		return nil, InputError{err}
	}
	if opt.Workers <= 0 {
		opt.Workers = runtime.NumCPU()
	}
	if opt.CheckpointEvery == 0 {
		opt.CheckpointEvery = DefaultCheckpointEvery
	}
	res := &Result{Path: opt.Out}
	var mine []int
	for p := 0; p < s.Points(); p++ {
		if opt.Shard.Has(p) {
			mine = append(mine, p)
		}
	}
	res.Points = len(mine)
	hash := s.Hash()
	meta := s.Metadata(opt.Workers, opt.Shard)

	if _, err := os.Stat(opt.Out); err == nil {
		switch {
		case opt.Resume:
			t, err := ReadTable(opt.Out)
			if err != nil {
				return nil, err
			}
			if t.Meta[MetaHash] != hash || t.Meta[MetaShard] != opt.Shard.String() {
				return nil, InputError{fmt.Errorf("%s holds another scan (or another shard); choose another --out, or pass --force without --resume to replace it", opt.Out)}
			}
			res.Resumed, res.AlreadyComplete, res.Rows = len(mine), true, len(t.Rows)
			res.Elapsed = time.Since(start)
			return res, nil
		case !opt.Force:
			return nil, InputError{fmt.Errorf("%s exists; pass --force to replace it, --resume to keep it, or choose another --out: %w", opt.Out, fs.ErrExist)}
		}
	}

	done := map[int][]parquet.Row{}
	ckpt := CheckpointPath(opt.Out)
	if opt.Resume {
		if t, err := ReadTable(ckpt); err == nil {
			if t.Meta[MetaHash] != hash || t.Meta[MetaShard] != opt.Shard.String() {
				return nil, InputError{fmt.Errorf("%s is the checkpoint of another scan (or shard): remove it, or rerun without --resume to start over", ckpt)}
			}
			if !parquet.SameNodes(t.Schema, s.layout.schema) {
				return nil, fmt.Errorf("%s: columns do not match this scan's", ckpt)
			}
			for r := range t.Rows {
				p := t.Point(r)
				done[p] = append(done[p], t.Rows[r])
			}
		} else if !errors.Is(err, fs.ErrNotExist) {
			return nil, fmt.Errorf("reading the checkpoint: %w", err)
		}
	}
	var todo []int
	for _, p := range mine {
		if _, ok := done[p]; !ok {
			todo = append(todo, p)
		}
	}
	res.Resumed = len(mine) - len(todo)

	// Every point's scenario is checked before any is computed, so a bad
	// value late in the grid stops the scan at once, not hours later.
	scs := make([]*scenarios.Scenario, len(todo))
	errs := make([]error, len(todo))
	parallel(opt.Workers, len(todo), func(k int) {
		scs[k], errs[k] = s.Scenario(todo[k])
	})
	var bad []string
	for _, err := range errs {
		if err != nil {
			if len(bad) < 5 {
				bad = append(bad, err.Error())
			} else if len(bad) == 5 {
				bad = append(bad, "...")
			}
		}
	}
	if len(bad) > 0 {
		n := 0
		for _, err := range errs {
			if err != nil {
				n++
			}
		}
		return nil, InputError{fmt.Errorf("%d of %d points do not make a valid scenario:\n%s", n, len(todo), strings.Join(bad, "\n"))}
	}

	// The pool. Results arrive in any order; the table is sorted at the end.
	type outcome struct {
		k    int
		rows []parquet.Row
		err  error
	}
	runCtx, cancel := context.WithCancel(ctx)
	defer cancel()
	jobs := make(chan int)
	results := make(chan outcome)
	var active, peak atomic.Int64
	var used sync.Map
	var wg sync.WaitGroup
	for w := 0; w < opt.Workers; w++ {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			for k := range jobs {
				n := active.Add(1)
				for {
					old := peak.Load()
					if n <= old || peak.CompareAndSwap(old, n) {
						break
					}
				}
				used.Store(w, true)
				rows, err := s.computePoint(runCtx, todo[k], scs[k])
				active.Add(-1)
				results <- outcome{k, rows, err}
			}
		}(w)
	}
	go func() {
		defer close(jobs)
		for k := range todo {
			select {
			case jobs <- k:
			case <-runCtx.Done():
				return
			}
		}
	}()
	go func() { wg.Wait(); close(results) }()

	lastWrite := time.Now()
	var failure error
	if opt.Progress != nil {
		opt.Progress(0, len(todo))
	}
	for o := range results {
		p := todo[o.k]
		if o.err != nil {
			switch {
			case errors.Is(o.err, study.ErrInterrupted) || runCtx.Err() != nil:
				continue // not done: a resumed run computes it
			case s.KeepGoing:
				o.rows = s.failedRows(p, scs[o.k], o.err)
				res.Failed++
			default:
				if failure == nil {
					failure = fmt.Errorf("point %d (%s): %w", p, assignment(s.Axes, s.Indices(p)), o.err)
					cancel()
				}
				continue
			}
		}
		done[p] = o.rows
		res.Computed++
		if opt.Progress != nil {
			opt.Progress(res.Computed, len(todo))
		}
		if time.Since(lastWrite) >= opt.CheckpointEvery && res.Computed < len(todo) {
			if err := writeCheckpoint(ckpt, s, done, meta); err != nil {
				cancel()
				return nil, err
			}
			lastWrite = time.Now()
		}
		if opt.AfterPoint != nil {
			opt.AfterPoint(res.Computed)
		}
	}
	used.Range(func(_, _ any) bool { res.Workers++; return true })
	res.PeakConcurrent = int(peak.Load())
	res.Elapsed = time.Since(start)

	if failure != nil || len(done) < len(mine) {
		if err := writeCheckpoint(ckpt, s, done, meta); err != nil {
			return res, err
		}
		if failure != nil {
			return res, fmt.Errorf("%w\n%d points are kept in %s and are not computed again with --resume; --keep-going records a failing point and goes on", failure, len(done), ckpt)
		}
		return res, fmt.Errorf("%w: %d of %d points done (kept in %s); rerun with --resume to compute the other %d",
			study.ErrInterrupted, len(done), len(mine), ckpt, len(mine)-len(done))
	}

	rows := sortedRows(done)
	res.Rows = len(rows)
	if err := writeTable(opt.Out, s.layout.schema, rows, meta, true); err != nil {
		return res, err
	}
	if err := os.Remove(ckpt); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return res, err
	}
	res.Elapsed = time.Since(start)
	return res, nil
}

func writeCheckpoint(path string, s *Spec, done map[int][]parquet.Row, meta map[string]string) error {
	return writeTable(path, s.layout.schema, sortedRows(done), meta, true)
}

// sortedRows lists the rows by point index; within a point they keep the
// scenario's body order.
func sortedRows(done map[int][]parquet.Row) []parquet.Row {
	points := make([]int, 0, len(done))
	for p := range done {
		points = append(points, p)
	}
	sort.Ints(points)
	var rows []parquet.Row
	for _, p := range points {
		rows = append(rows, done[p]...)
	}
	return rows
}

// parallel calls f(0..n-1) on up to workers goroutines.
func parallel(workers, n int, f func(k int)) {
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := 0; w < min(workers, n); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				k := int(next.Add(1) - 1)
				if k >= n {
					return
				}
				f(k)
			}
		}()
	}
	wg.Wait()
}
