package main

import (
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/mattn/go-isatty"
	"github.com/schollz/progressbar/v3"
	"github.com/spf13/cobra"

	"mgorbit/cmd/mgorbit/internal/report"
	"mgorbit/cmd/mgorbit/internal/table"
	"mgorbit/integrator/study"
)

func newRunCmd() *cobra.Command {
	var out, checkpointEvery string
	var asJSON, quiet, force, keepGoing, resume bool
	cmd := &cobra.Command{
		Use:   "run [SCENARIO]",
		Short: "Integrate a scenario and write summary, trajectory and terms tables (Parquet)",
		Long: `Integrate a scenario file (TOML) or a built-in scenario and write
DIR/summary.parquet (one row per orbiting body), DIR/trajectory.parquet
(one row per body per output time) and DIR/terms.parquet (each body's
precession split by stacked term, first order). Without SCENARIO the built-in default
runs. Each result carries an integration-error estimate from a second run at
half the step, the anomaly against the stack without its corrections, and a
semi-analytic reference where one applies.

Integrators (the scenario's [integrator] method): leapfrog, yoshida4,
yoshida6, wisdom-holman, wisdom-holman-4, wisdom-holman-6, logh-leapfrog,
logh-yoshida4, rk45. Without a method the scenario gets wisdom-holman-4 where
one mass dominates and the stack is position-only, else yoshida6.

SIGINT or SIGTERM stops the run after the current step and saves
DIR/run.checkpoint; --resume continues it, and the outputs are byte for byte
those of an uninterrupted run. --checkpoint-every saves it periodically too,
so that a crash or SIGKILL loses little. Exit codes: 0 success, 1 failure,
2 bad input, 3 accuracy lost (tolerance breach or unresolved close
encounter), 4 interrupted (checkpoint saved), 5 collision.`,
		Example: `  mgorbit run                          # the built-in default scenario
  mgorbit run aster-gr --out results   # a built-in by name
  mgorbit run my-system.toml --json    # summary as JSON on stdout
  mgorbit run long.toml --out r --checkpoint-every 10m
  mgorbit run --out r --resume         # after an interruption or a crash`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			arg := ""
			if len(args) == 1 {
				arg = args[0]
			}
			sc, ck, err := prepareRun(arg, out, force, resume, checkpointEvery)
			if err != nil {
				return err
			}
			sumPath := filepath.Join(out, "summary.parquet")
			trajPath := filepath.Join(out, "trajectory.parquet")
			termsPath := filepath.Join(out, "terms.parquet")
			if !force {
				for _, p := range []string{sumPath, trajPath, termsPath} {
					if _, err := os.Stat(p); err == nil {
						return inputError{fmt.Errorf("%s exists; pass --force to replace it, or choose another --out", p)}
					}
				}
			}
			opt := study.Options{KeepGoing: keepGoing, Checkpoint: ck.cp}
			var bar *progressbar.ProgressBar
			if !quiet && isatty.IsTerminal(os.Stderr.Fd()) {
				bar = progressbar.NewOptions64(-1,
					progressbar.OptionSetWriter(os.Stderr),
					progressbar.OptionSetDescription("integrating "+sc.Name),
					progressbar.OptionShowCount(),
					progressbar.OptionSetItsString("steps"),
					progressbar.OptionShowIts(),
					progressbar.OptionSetPredictTime(true),
					progressbar.OptionThrottle(100e6),
					progressbar.OptionClearOnFinish())
				opt.Progress = func(done, total int64) {
					if bar.GetMax64() != total {
						bar.ChangeMax64(total)
					}
					_ = bar.Set64(done)
				}
			}
			st, err := study.Run(cmd.Context(), sc, opt)
			if bar != nil {
				_ = bar.Finish()
			}
			if err != nil {
				var again []string
				if keepGoing {
					again = append(again, "--keep-going")
				}
				if checkpointEvery != "" {
					again = append(again, "--checkpoint-every", checkpointEvery)
				}
				return ck.explain(err, arg, out, again...)
			}
			meta := report.Metadata(st)
			rows := report.Summaries(st)
			if err := table.Write(sumPath, rows, meta, force); err != nil {
				return err
			}
			if err := table.Write(trajPath, report.Trajectory(st), meta, force); err != nil {
				return err
			}
			if err := table.Write(termsPath, report.Terms(st), meta, force); err != nil {
				return err
			}
			stdout := cmd.OutOrStdout()
			switch {
			case asJSON:
				enc := json.NewEncoder(stdout)
				enc.SetIndent("", "  ")
				if err := enc.Encode(rows); err != nil {
					return err
				}
			case !quiet:
				report.Text(stdout, st)
				fmt.Fprintf(stdout, "\nwrote %s, %s and %s\n", sumPath, trajPath, termsPath)
			}
			// after the summary, so its steps-computed line comes last
			if err := ck.done(cmd.ErrOrStderr(), quiet || asJSON); err != nil {
				return err
			}
			for _, w := range st.Warnings {
				if quiet || asJSON {
					fmt.Fprintln(os.Stderr, "WARNING:", w)
				}
			}
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&out, "out", "mgorbit-out", "directory for summary.parquet, trajectory.parquet and terms.parquet")
	f.BoolVar(&asJSON, "json", false, "print the summary as JSON on stdout instead of the table")
	f.BoolVar(&quiet, "quiet", false, "no progress bar and no table")
	f.BoolVar(&force, "force", false, "replace existing output files")
	f.BoolVar(&keepGoing, "keep-going", false, "on an energy or angular-momentum tolerance breach, finish the run, warn and mark the rows (accuracy_tolerance_exceeded) instead of stopping")
	f.StringVar(&checkpointEvery, "checkpoint-every", "", "also save DIR/"+checkpointName+" every N steps of the main integration (e.g. 100000) or every wall-clock interval (e.g. 10m); an interrupted run always saves one")
	f.BoolVar(&resume, "resume", false, "continue the run saved in DIR/"+checkpointName+" (SCENARIO may be omitted); the result is bit-identical to an uninterrupted run")
	return cmd
}

var _ io.Writer
