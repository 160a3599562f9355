package main

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"time"

	"mgorbit/cmd/mgorbit/internal/atomicfile"
	"mgorbit/cmd/mgorbit/internal/report"
	"mgorbit/integrator/study"
	"mgorbit/scenarios"
)

// checkpointName is the checkpoint file in the output directory.
const checkpointName = "run.checkpoint"

// checkpointRun is a run's checkpoint settings and where the file goes.
type checkpointRun struct {
	path    string
	cp      *study.Checkpointing
	resumed bool
}

// parseEvery reads --checkpoint-every: a whole number of steps, or a
// wall-clock interval such as "10m".
func parseEvery(s string) (steps int64, wall time.Duration, err error) {
	if s == "" {
		return 0, 0, nil
	}
	if n, err := strconv.ParseInt(s, 10, 64); err == nil {
		if n <= 0 {
			return 0, 0, fmt.Errorf("--checkpoint-every %s: the number of steps must be positive", s)
		}
		return n, 0, nil
	}
	d, err := time.ParseDuration(s)
	if err != nil || d <= 0 {
		return 0, 0, fmt.Errorf("--checkpoint-every %q: give a positive whole number of steps (e.g. 100000) or a wall-clock interval (e.g. 30s, 10m, 1h)", s)
	}
	return 0, d, nil
}

// prepareRun loads the scenario (from the checkpoint when resuming without
// one named) and sets up checkpointing into out. Every run can be resumed
// after an interruption; --checkpoint-every adds periodic saves that also
// survive a crash or a SIGKILL.
func prepareRun(arg, out string, force, resume bool, every string) (*scenarios.Scenario, *checkpointRun, error) {
	steps, wall, err := parseEvery(every)
	if err != nil {
		return nil, nil, inputError{err}
	}
	ck := &checkpointRun{path: filepath.Join(out, checkpointName)}
	ck.cp = &study.Checkpointing{EverySteps: steps, EveryWall: wall, Build: buildID(),
		Save: func(c *study.Checkpoint) error { return atomicfile.Write(ck.path, true, c.Encode) }}

	var sc *scenarios.Scenario
	if resume {
		saved, err := readCheckpoint(ck.path)
		if err != nil {
			return nil, nil, inputError{err}
		}
		ck.cp.Resume, ck.resumed = saved, true
		if arg == "" {
			sc, err = scenarios.Parse(saved.Source, []byte(saved.Text))
			if err != nil {
				return nil, nil, inputError{fmt.Errorf("the scenario stored in %s no longer loads: %w", ck.path, err)}
			}
		}
	} else if _, err := os.Stat(ck.path); err == nil {
		if !force {
			return nil, nil, inputError{fmt.Errorf("%s exists: an earlier run into %s stopped before it finished; pass --resume to continue it, or --force to start afresh", ck.path, out)}
		}
		if err := os.Remove(ck.path); err != nil {
			return nil, nil, err
		}
	}
	if sc == nil {
		if sc, err = loadScenario(arg); err != nil {
			return nil, nil, err
		}
	}
	if err := os.MkdirAll(out, 0o755); err != nil {
		return nil, nil, err
	}
	return sc, ck, nil
}

func readCheckpoint(path string) (*study.Checkpoint, error) {
	f, err := os.Open(path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, fmt.Errorf("%s does not exist: there is nothing to resume (a run leaves it when interrupted, or with --checkpoint-every)", path)
	}
	if err != nil {
		return nil, err
	}
	defer f.Close()
	c, err := study.DecodeCheckpoint(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return c, nil
}

// explain turns a failed run's error into what the user should read: how
// to resume an interrupted one, and that a mismatched checkpoint is bad
// input.
// flags are the flags the resumed run must repeat.
func (ck *checkpointRun) explain(err error, arg, out string, flags ...string) error {
	var ie *study.InterruptedError
	switch {
	case errors.As(err, &ie) && ie.Saved:
		again := "mgorbit run"
		if arg != "" {
			again += " " + quoteArg(arg)
		}
		again += " --out " + quoteArg(out) + " --resume"
		for _, f := range flags {
			again += " " + quoteArg(f)
		}
		return fmt.Errorf("%w in %s; continue with: %s", err, ck.path, again)
	case errors.Is(err, study.ErrCheckpointMismatch):
		return inputError{fmt.Errorf("%s: %w", ck.path, err)}
	}
	var acc *study.AccuracyError
	if errors.As(err, &acc) {
		if _, statErr := os.Stat(ck.path); statErr == nil {
			return fmt.Errorf("%w (%s holds the state before the breach: --resume --keep-going finishes the run with the breach marked)", err, ck.path)
		}
	}
	return err
}

// done removes the checkpoint once the outputs are in place and reports
// how much was computed.
func (ck *checkpointRun) done(w io.Writer, quiet bool) error {
	if err := os.Remove(ck.path); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	// a kill during a save leaves its temporary file behind
	stale, _ := filepath.Glob(filepath.Join(filepath.Dir(ck.path), "."+checkpointName+".tmp-*"))
	for _, f := range stale {
		os.Remove(f)
	}
	if ck.resumed || !quiet {
		msg := fmt.Sprintf("mgorbit: %d steps computed", ck.cp.StepsComputed)
		if ck.resumed {
			msg += fmt.Sprintf(", %d taken over from the checkpoint", ck.cp.StepsResumed)
		}
		switch n := ck.cp.Saved; {
		case n == 1:
			msg += "; 1 checkpoint saved on the way"
		case n > 1:
			msg += fmt.Sprintf("; %d checkpoints saved on the way", n)
		}
		fmt.Fprintln(w, msg)
	}
	return nil
}

// buildID names this program for checkpoints: version, toolchain and the
// executable's SHA-256 (Go builds are reproducible, so the same source and
// toolchain give the same digest; another build may compute other bits).
func buildID() string {
	id := "mgorbit " + report.Version + " " + runtime.Version()
	exe, err := os.Executable()
	if err != nil {
		return id
	}
	f, err := os.Open(exe)
	if err != nil {
		return id
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return id
	}
	return id + " sha256:" + hex.EncodeToString(h.Sum(nil))[:16]
}

func quoteArg(s string) string {
	if s != "" && !strings.ContainsAny(s, " \t'\"\\$`") {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
