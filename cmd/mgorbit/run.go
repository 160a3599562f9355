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
	var out string
	var asJSON, quiet, force, keepGoing bool
	cmd := &cobra.Command{
		Use:   "run [SCENARIO]",
		Short: "Integrate a scenario and write summary.parquet and trajectory.parquet",
		Long: `Integrate a scenario file (TOML) or a built-in scenario and write
DIR/summary.parquet (one row per orbiting body) and DIR/trajectory.parquet
(one row per body per output time). Without SCENARIO the built-in default
runs. Each result carries an integration-error estimate from a second run at
half the step, the anomaly against the stack without its corrections, and a
semi-analytic reference where one applies.`,
		Example: `  mgorbit run                          # the built-in default scenario
  mgorbit run aster-gr --out results   # a built-in by name
  mgorbit run my-system.toml --json    # summary as JSON on stdout`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			arg := ""
			if len(args) == 1 {
				arg = args[0]
			}
			sc, err := loadScenario(arg)
			if err != nil {
				return err
			}
			sumPath := filepath.Join(out, "summary.parquet")
			trajPath := filepath.Join(out, "trajectory.parquet")
			if !force {
				for _, p := range []string{sumPath, trajPath} {
					if _, err := os.Stat(p); err == nil {
						return inputError{fmt.Errorf("%s exists; pass --force to replace it, or choose another --out", p)}
					}
				}
			}
			opt := study.Options{KeepGoing: keepGoing}
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
				return err
			}
			if err := os.MkdirAll(out, 0o755); err != nil {
				return err
			}
			meta := report.Metadata(st)
			rows := report.Summaries(st)
			if err := table.Write(sumPath, rows, meta, force); err != nil {
				return err
			}
			if err := table.Write(trajPath, report.Trajectory(st), meta, force); err != nil {
				return err
			}
			stdout := cmd.OutOrStdout()
			switch {
			case asJSON:
				enc := json.NewEncoder(stdout)
				enc.SetIndent("", "  ")
				return enc.Encode(rows)
			case !quiet:
				report.Text(stdout, st)
				fmt.Fprintf(stdout, "\nwrote %s and %s\n", sumPath, trajPath)
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
	f.StringVar(&out, "out", "mgorbit-out", "directory for summary.parquet and trajectory.parquet")
	f.BoolVar(&asJSON, "json", false, "print the summary as JSON on stdout instead of the table")
	f.BoolVar(&quiet, "quiet", false, "no progress bar and no table")
	f.BoolVar(&force, "force", false, "replace existing output files")
	f.BoolVar(&keepGoing, "keep-going", false, "on an energy or angular-momentum tolerance breach, finish the run and warn instead of stopping")
	return cmd
}

var _ io.Writer
