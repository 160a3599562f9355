// Command mgorbit integrates invented planetary systems and binaries under
// modified-gravity force kernels and writes perihelion-precession and
// period-shift summaries to Parquet. Run `mgorbit --help`.
package main

import (
	"context"
	"errors"
	"fmt"
	"os"
	"os/signal"
	"syscall"

	"github.com/spf13/cobra"

	"mgorbit/cmd/mgorbit/internal/report"
	"mgorbit/integrator/study"
	"mgorbit/scenarios"
)

// Exit codes, documented in the README.
const (
	exitOK          = 0
	exitFailure     = 1
	exitBadInput    = 2
	exitAccuracy    = 3
	exitInterrupted = 4
	exitCollision   = 5
)

// inputError marks a problem with what the user gave (scenario, flags).
type inputError struct{ err error }

func (e inputError) Error() string { return e.err.Error() }
func (e inputError) Unwrap() error { return e.err }

func main() {
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	sigs := make(chan os.Signal, 1)
	signal.Notify(sigs, os.Interrupt, syscall.SIGTERM)
	go func() {
		s := <-sigs
		// A second signal takes the default action: stop at once.
		signal.Stop(sigs)
		fmt.Fprintf(os.Stderr, "\nmgorbit: %v: stopping after the current step (a run saves a checkpoint); signal again to stop at once\n", s)
		cancel()
	}()
	root := newRoot()
	err := root.ExecuteContext(ctx)
	os.Exit(exitCode(err))
}

func exitCode(err error) int {
	if err == nil {
		return exitOK
	}
	fmt.Fprintln(os.Stderr, "mgorbit:", err)
	var acc *study.AccuracyError
	var col *study.CollisionError
	var in inputError
	switch {
	case errors.As(err, &col):
		return exitCollision
	case errors.As(err, &acc):
		return exitAccuracy
	case errors.Is(err, study.ErrInterrupted):
		return exitInterrupted
	case errors.As(err, &in):
		return exitBadInput
	}
	return exitFailure
}

func newRoot() *cobra.Command {
	root := &cobra.Command{
		Use:   "mgorbit",
		Short: "Orbits under modified gravity: precession, period shifts, Parquet tables",
		Long: `mgorbit integrates invented planetary systems and binaries under stackable
force kernels (Newton, general relativity at 1PN, and alternative-gravity
corrections) and reports each orbit's perihelion precession and period shifts,
with integration-error estimates and semi-analytic references, as Parquet
tables for pandas, Polars or DuckDB.

It is a research tool for model studies, not for spacecraft navigation or
ephemeris production.`,
		SilenceUsage:  true,
		SilenceErrors: true,
		Version:       report.Version,
	}
	root.AddCommand(newRunCmd(), newScenariosCmd(), newKernelsCmd(), newScanCmd(), newPlotCmd(), newMergeCmd(), newDeflectionCmd(), newBoundsCmd())
	return root
}

// loadScenario reads a scenario file, or a built-in by name when no file
// of that name exists ("builtin:NAME" always means the built-in).
func loadScenario(arg string) (*scenarios.Scenario, error) {
	if arg == "" {
		arg = "builtin:" + scenarios.DefaultName
	}
	var sc *scenarios.Scenario
	var err error
	if name, ok := cutPrefix(arg, "builtin:"); ok {
		sc, err = scenarios.Builtin(name)
	} else if _, statErr := os.Stat(arg); statErr == nil {
		sc, err = scenarios.Load(arg)
	} else if contains(scenarios.BuiltinNames(), arg) {
		sc, err = scenarios.Builtin(arg)
	} else {
		return nil, inputError{fmt.Errorf("%s: no such file, and no built-in scenario of that name (built-ins: %v)", arg, scenarios.BuiltinNames())}
	}
	if err != nil {
		return nil, inputError{err}
	}
	return sc, nil
}

func cutPrefix(s, p string) (string, bool) {
	if len(s) >= len(p) && s[:len(p)] == p {
		return s[len(p):], true
	}
	return s, false
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
