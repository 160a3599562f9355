package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"time"

	"github.com/mattn/go-isatty"
	"github.com/schollz/progressbar/v3"
	"github.com/spf13/cobra"

	"mgorbit/cmd/mgorbit/internal/plot"
	"mgorbit/cmd/mgorbit/internal/scan"
	"mgorbit/scenarios"
)

// scanFlags are the scan command's settings.
type scanFlags struct {
	sweeps                    []string
	method, out, shard, emit  string
	workers                   int
	checkpointEvery           time.Duration
	resume, force, keepGoing  bool
	quiet, noPlot             bool
	bounds                    []float64
	plotY                     string
	slurmTasks, slurmCPUs     int
	slurmTime, slurmPartition string
	slurmExtra                []string
	judge                     boundsFlags
}

func newScanCmd() *cobra.Command {
	var fl scanFlags
	cmd := &cobra.Command{
		Use:   "scan [SCENARIO] --sweep PATH=GRID [--sweep ...]",
		Short: "Sweep scenario or kernel parameters over a grid and write scan.parquet",
		Long: `Run a scenario at every point of a parameter grid and write DIR/scan.parquet:
one row per grid point and orbiting body, the swept values as columns (SI, the
unit written, and the text), every observable of the summary with its error
estimates and conservation errors, and the scan's settings in the metadata.

A sweep is PATH=GRID. PATH is body.NAME.KEY (mass, a, e, i, ...),
kernel.NAME.KEY (any kernel parameter; kernel.N.KEY for the N-th [[kernel]])
or integrator.KEY. GRID is lin:START:STOP:N, log:START:STOP:N or
list:V1,V2,... Several sweeps make a full grid (the last varies fastest).
Each point's scenario is checked exactly like a file you wrote, before any
point is computed.

--method both (default) integrates every point (with the h/2 error estimate
and the anomaly against the reference stack) and reports integrated minus
semi-analytic; integrate leaves out the differences; semi-analytic skips the
integration (fast, for dense curves).

Points go to --workers at once; the table does not depend on the worker count.
--shard K/N computes every N-th point (from point K-1) into
DIR/scan.part-K-of-N.parquet; inside a Slurm array job the shard comes from
SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_COUNT. --emit-slurm FILE writes an
sbatch array script for the scan instead of running it; mgorbit merge joins
the parts. Interrupted scans keep their finished points: rerun with --resume.

With one swept axis (or two, the second with at most 12 values) the scan
also draws DIR/scan.png; mgorbit plot redraws from the table.

--bounds FILE judges every point against measured values and limits (see
mgorbit bounds): the table gets the columns allowed, excluded_by and
bound_NAME_pull, DIR/scan.boundary.parquet the boundary along the last axis,
and scan.png shades the excluded region (two axes: a map of it).
--deflection-at B adds light-deflection columns (gamma_deflection_minus_1)
at impact parameter B; a gamma bound that states where it was measured
adds them by itself.`,
		Example: `  mgorbit scan yukawa.toml --sweep 'kernel.yukawa.lambda=log:0.1 au:100 au:40' --method semi
  mgorbit scan --sweep 'body.Tiber.e=lin:0.05:0.6:12' --sweep 'body.Aster.mass=list:0.5 Msun,1 Msun'
  mgorbit scan my.toml --sweep 'kernel.vainshtein.r_c=log:1e17 m:1e20 m:7' --shard 2/4
  mgorbit scan testdata/bounds/tiber-yukawa.toml --sweep 'kernel.yukawa.lambda=log:0.001 au:10000 au:57' --sweep 'kernel.yukawa.alpha=log:1e-12:1e-2:61' --method semi --bounds testdata/bounds/example.toml
  mgorbit scan my.toml --sweep ... --emit-slurm scan.sbatch --slurm-tasks 16 && sbatch scan.sbatch`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			arg := ""
			if len(args) == 1 {
				arg = args[0]
			}
			return runScan(cmd, arg, fl)
		},
	}
	f := cmd.Flags()
	f.StringArrayVar(&fl.sweeps, "sweep", nil, "PATH=GRID, repeatable: e.g. 'kernel.yukawa.lambda=log:0.1 au:100 au:40', 'body.Tiber.e=lin:0:0.9:10', 'body.Aster.mass=list:0.5 Msun,1 Msun'")
	f.StringVar(&fl.method, "method", "both", "integrate, semi-analytic (semi), or both (integrate and report the differences)")
	f.StringVar(&fl.out, "out", "mgorbit-scan", "directory for scan.parquet (or the shard's part file), its checkpoint and scan.png")
	f.IntVar(&fl.workers, "workers", runtime.NumCPU(), "points computed at once (default: the number of cores)")
	f.StringVar(&fl.shard, "shard", "", "compute only shard K/N (K from 1), e.g. 1/4; default: from Slurm's array variables, else the whole scan")
	f.DurationVar(&fl.checkpointEvery, "checkpoint-every", scan.DefaultCheckpointEvery, "shortest time between checkpoint writes (what an interruption can lose at most)")
	f.BoolVar(&fl.resume, "resume", false, "keep the points of an interrupted run (its checkpoint) and compute only the others")
	f.BoolVar(&fl.force, "force", false, "replace an existing table")
	f.BoolVar(&fl.keepGoing, "keep-going", false, "record failing points (point_error) and tolerance breaches (warnings) instead of stopping")
	f.BoolVar(&fl.quiet, "quiet", false, "no progress and no summary")
	f.BoolVar(&fl.noPlot, "no-plot", false, "do not draw scan.png")
	f.StringVar(&fl.plotY, "plot-y", "", "column for the y axis of scan.png (default: anomaly, else precession, per century)")
	f.Float64SliceVar(&fl.bounds, "bound", nil, "horizontal bound line(s) on scan.png, in the y column's unit")
	addBoundsFlags(f, &fl.judge)
	f.StringVar(&fl.emit, "emit-slurm", "", "write an sbatch job-array script for this scan to FILE and exit")
	f.IntVar(&fl.slurmTasks, "slurm-tasks", 4, "with --emit-slurm: array tasks (shards)")
	f.IntVar(&fl.slurmCPUs, "slurm-cpus", 1, "with --emit-slurm: CPUs per task (its worker count)")
	f.StringVar(&fl.slurmTime, "slurm-time", "", "with --emit-slurm: time limit per task, e.g. 2:00:00")
	f.StringVar(&fl.slurmPartition, "slurm-partition", "", "with --emit-slurm: partition")
	f.StringArrayVar(&fl.slurmExtra, "slurm-option", nil, "with --emit-slurm: extra #SBATCH option, repeatable, e.g. --mem=2G")
	return cmd
}

func runScan(cmd *cobra.Command, arg string, fl scanFlags) error {
	sc, err := loadScenario(arg)
	if err != nil {
		return err
	}
	axes, err := scan.ParseSweeps(fl.sweeps)
	if err != nil {
		return inputError{err}
	}
	method, err := scan.ParseMethod(fl.method)
	if err != nil {
		return inputError{err}
	}
	spec, err := scan.NewSpec(sc, axes, method, fl.keepGoing)
	if err != nil {
		return asInput(err)
	}
	// The bounds file is checked before any point is computed.
	judge, err := fl.judge.load()
	if err != nil {
		return err
	}
	if judge != nil && (fl.emit != "" || fl.shard != "" || os.Getenv("SLURM_ARRAY_TASK_ID") != "") {
		return inputError{fmt.Errorf(splitRefusal)}
	}
	table := filepath.Join(fl.out, "scan.parquet")
	stdout := cmd.OutOrStdout()
	if fl.emit != "" {
		return emitSlurm(stdout, arg, sc, table, fl)
	}

	shard := scan.Whole
	if fl.shard != "" {
		if shard, err = scan.ParseShard(fl.shard); err != nil {
			return inputError{err}
		}
	} else if sh, ok, err := scan.ShardFromEnv(os.Getenv); err != nil {
		return inputError{err}
	} else if ok {
		shard = sh
	}
	out := table
	if shard != scan.Whole {
		out = scan.PartPath(table, shard)
	}
	if err := os.MkdirAll(fl.out, 0o755); err != nil {
		return err
	}
	if fl.checkpointEvery <= 0 {
		return inputError{fmt.Errorf("--checkpoint-every must be positive")}
	}
	opt := scan.Options{Out: out, Workers: fl.workers, Shard: shard, Resume: fl.resume, Force: fl.force,
		CheckpointEvery: fl.checkpointEvery}
	var bar *progressbar.ProgressBar
	switch {
	case fl.quiet:
	case isatty.IsTerminal(os.Stderr.Fd()):
		desc := "scan " + sc.Name
		if shard != scan.Whole {
			desc += ", shard " + shard.String()
		}
		opt.Progress = func(done, total int) {
			if bar == nil {
				bar = progressbar.NewOptions(total,
					progressbar.OptionSetWriter(os.Stderr),
					progressbar.OptionSetDescription(desc),
					progressbar.OptionShowCount(),
					progressbar.OptionSetItsString("points"),
					progressbar.OptionShowIts(),
					progressbar.OptionSetPredictTime(true),
					progressbar.OptionThrottle(100*time.Millisecond),
					progressbar.OptionClearOnFinish())
			}
			_ = bar.Set(done)
		}
	case os.Getenv("SLURM_JOB_ID") != "":
		// a batch job's log: a line every 10 s is how one watches it
		opt.Progress = scan.ProgressLines(os.Stderr, "mgorbit scan: ", 10*time.Second)
	}
	// otherwise (piped, redirected) stay quiet
	res, err := scan.Run(cmd.Context(), spec, opt)
	if bar != nil {
		_ = bar.Finish()
	}
	if err != nil {
		return asInput(err)
	}
	if fl.quiet && !res.AlreadyComplete {
		return judge.judgeScan(io.Discard, out, spec)
	}
	if fl.quiet {
		return nil
	}
	if res.AlreadyComplete {
		fmt.Fprintf(stdout, "%s already holds this scan (%d rows); nothing to compute\n", out, res.Rows)
		return nil
	}
	fmt.Fprintf(stdout, "wrote %s: %d rows, %d points", out, res.Rows, res.Points)
	if shard != scan.Whole {
		fmt.Fprintf(stdout, " (shard %s of a %d-point grid)", shard, spec.Points())
	}
	fmt.Fprintln(stdout)
	fmt.Fprintf(stdout, "computed %d points in %s with %d workers", res.Computed, res.Elapsed.Round(time.Millisecond), fl.workers)
	if res.Resumed > 0 {
		fmt.Fprintf(stdout, " (%d taken from the checkpoint)", res.Resumed)
	}
	fmt.Fprintln(stdout)
	if res.Failed > 0 {
		fmt.Fprintf(stdout, "WARNING: %d points failed; their rows have point_error set\n", res.Failed)
	}
	if err := judge.judgeScan(stdout, out, spec); err != nil {
		return err
	}
	if shard == scan.Whole && !fl.noPlot {
		if err := defaultPlot(stdout, out, fl); err != nil {
			fmt.Fprintf(os.Stderr, "mgorbit scan: no plot drawn: %v\n", err)
		}
	}
	return nil
}

// defaultPlot draws scan.png beside the table: the first axis as x, the
// second (if any, with few values) as groups.
func defaultPlot(w io.Writer, table string, fl scanFlags) error {
	t, err := scan.ReadTable(table)
	if err != nil {
		return err
	}
	if isJudged(t) {
		return drawJudged(w, t, filepath.Join(filepath.Dir(table), "scan.png"), fl.plotY, fl.bounds)
	}
	fig := plot.Figure{Y: fl.plotY}
	if fig.Y == "" {
		fig.Y = plot.DefaultY(t)
	}
	fig.Reference = plot.DefaultReference(t, fig.Y)
	for _, b := range fl.bounds {
		fig.Bounds = append(fig.Bounds, plot.Bound{Value: b})
	}
	switch t.Meta["mgorbit.scan.axes"] {
	case "1":
	case "2":
		if n, _ := strconv.Atoi(t.Meta["mgorbit.scan.axis.1.count"]); n > 12 {
			return nil
		}
		fig.Group = t.Meta["mgorbit.scan.axis.1.column_plot"]
	default:
		return nil
	}
	path := filepath.Join(filepath.Dir(table), "scan.png")
	d, err := plot.Draw(t, fig, path)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "drew %s: %s%s\n", path, drawnCount(d), logNote(d))
	return nil
}

func logNote(d *plot.Drawn) string {
	var parts []string
	if d.LogX {
		parts = append(parts, "log x")
	}
	if d.LogY {
		parts = append(parts, "log y")
	}
	if d.NegatedY {
		parts = append(parts, "y negated for the log axis")
	}
	if d.ErrorColumn != "" {
		parts = append(parts, "error bars "+d.ErrorColumn)
	}
	if len(parts) == 0 {
		return ""
	}
	return " (" + strings.Join(parts, ", ") + ")"
}

func asInput(err error) error {
	var in scan.InputError
	if errors.As(err, &in) {
		return inputError{err}
	}
	return err
}

// emitSlurm writes the array script: the same binary and flags, each task
// taking its shard from the array variables.
func emitSlurm(w io.Writer, arg string, sc *scenarios.Scenario, table string, fl scanFlags) error {
	exe, err := os.Executable()
	if err != nil {
		return err
	}
	if real, err := filepath.EvalSymlinks(exe); err == nil {
		exe = real
	}
	scenarioArg := "builtin:" + strings.TrimPrefix(sc.Source, "builtin:")
	if !strings.HasPrefix(sc.Source, "builtin:") {
		if scenarioArg, err = filepath.Abs(sc.Source); err != nil {
			return err
		}
	}
	absTable, err := filepath.Abs(table)
	if err != nil {
		return err
	}
	args := []string{scenarioArg}
	for _, s := range fl.sweeps {
		args = append(args, "--sweep", s)
	}
	args = append(args, "--method", fl.method, "--out", filepath.Dir(absTable))
	if fl.keepGoing {
		args = append(args, "--keep-going")
	}
	if fl.slurmTasks < 1 {
		return inputError{fmt.Errorf("--slurm-tasks must be at least 1")}
	}
	if err := os.MkdirAll(filepath.Dir(absTable), 0o755); err != nil {
		return err
	}
	job := scan.SlurmJob{Executable: exe, Args: args, Tasks: fl.slurmTasks, CPUs: fl.slurmCPUs,
		Time: fl.slurmTime, Partition: fl.slurmPartition, Extra: fl.slurmExtra, Out: absTable, Script: fl.emit}
	var b strings.Builder
	if err := scan.EmitSlurm(&b, job); err != nil {
		return inputError{err}
	}
	if err := writeScript(fl.emit, b.String(), fl.force); err != nil {
		return err
	}
	fmt.Fprintf(w, "wrote %s: a job array of %d tasks over %s\n", fl.emit, fl.slurmTasks, filepath.Dir(absTable))
	fmt.Fprintf(w, "submit:  sbatch %s\nthen:    %s merge %s\n", fl.emit, exe, filepath.Dir(absTable))
	return nil
}

func writeScript(path, text string, force bool) error {
	if !force {
		if _, err := os.Stat(path); err == nil {
			return inputError{fmt.Errorf("%s exists; pass --force to replace it", path)}
		}
	}
	return os.WriteFile(path, []byte(text), 0o755)
}

func drawnCount(d *plot.Drawn) string {
	curves := "curves"
	if d.Curves == 1 {
		curves = "curve"
	}
	return fmt.Sprintf("%d %s, %d points", d.Curves, curves, d.Points)
}
