package main

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
	"gonum.org/v1/plot/plotter"

	"mgorbit/cmd/mgorbit/internal/bounds"
	"mgorbit/cmd/mgorbit/internal/plot"
	"mgorbit/cmd/mgorbit/internal/scan"
	"mgorbit/cmd/mgorbit/internal/table"
	"mgorbit/scenarios/units"
)

// boundsFlags judge a scan against a bounds file (scan and bounds apply).
type boundsFlags struct {
	file, deflectionAt, deflectionSource string
}

func addBoundsFlags(f *pflag.FlagSet, b *boundsFlags) {
	f.StringVar(&b.file, "bounds", "", "bounds file (TOML): mark every grid point allowed or excluded (columns allowed, excluded_by, bound_NAME_pull) and shade the excluded region of the plot")
	f.StringVar(&b.deflectionAt, "deflection-at", "", `add light-deflection columns (gamma_deflection_minus_1, ...) at this impact parameter, e.g. "1.6 Rsun" (default: where a gamma bound states it was measured)`)
	f.StringVar(&b.deflectionSource, "deflection-source", "", "body the light passes for the deflection columns (default: the first massive one)")
}

// judge is a loaded bounds file and deflection request.
type judge struct {
	set             *bounds.Set // nil: deflection columns only
	impact          float64
	impactText      string
	source          string
	explicitDeflect bool
	sourceFromFlag  bool
}

// load reads the bounds file and the deflection flags; nil when neither
// was given.
func (b boundsFlags) load() (*judge, error) {
	if b.file == "" && b.deflectionAt == "" {
		if b.deflectionSource != "" {
			return nil, inputError{fmt.Errorf("--deflection-source needs --deflection-at or a bounds file")}
		}
		return nil, nil
	}
	j := &judge{source: b.deflectionSource, sourceFromFlag: b.deflectionSource != ""}
	if b.file != "" {
		set, err := bounds.Load(b.file)
		if err != nil {
			return nil, inputError{err}
		}
		j.set = set
	}
	if b.deflectionAt != "" {
		x, err := units.ParseAs(b.deflectionAt, units.Length)
		if err == nil && !(x > 0) {
			err = fmt.Errorf("must be a positive length")
		}
		if err != nil {
			return nil, inputError{fmt.Errorf("--deflection-at %q: %v", b.deflectionAt, err)}
		}
		j.impact, j.impactText, j.explicitDeflect = x, strings.TrimSpace(b.deflectionAt), true
	}
	return j, nil
}

// splitRefusal explains why a shard cannot be judged.
const splitRefusal = "--bounds and --deflection-at judge the whole table: merge the shards first (mgorbit merge DIR), then run mgorbit bounds apply DIR/scan.parquet --bounds FILE"

// judgeScan adds the deflection and verdict columns to the finished table
// at path, in place, and writes the boundary table beside it (the scan's
// plot then shows the verdicts).
func (j *judge) judgeScan(w io.Writer, path string, spec *scan.Spec) error {
	if j == nil {
		return nil
	}
	t, err := scan.ReadTable(path)
	if err != nil {
		return err
	}
	ap, err := j.run(w, t, spec, path, true, "rewrote")
	if err != nil {
		return err
	}
	if ap != nil {
		if err := writeBoundary(w, ap, strings.TrimSuffix(path, ".parquet")+".boundary.parquet"); err != nil {
			return err
		}
	}
	return nil
}

// run computes what the judge asks on t and writes the result to out.
func (j *judge) run(w io.Writer, t *scan.Table, spec *scan.Spec, out string, force bool, verb string) (*bounds.Applied, error) {
	impact, text, source := j.impact, j.impactText, j.source
	var reason string
	if !j.explicitDeflect && j.set != nil {
		need, ok, err := bounds.NeedsDeflection(t, j.set)
		if err != nil {
			return nil, inputError{err}
		}
		if ok && need.Missing {
			impact, text, reason = need.Impact, need.ImpactText, "as the bounds state"
			if !j.sourceFromFlag {
				source = need.Source
			}
		}
	}
	if impact > 0 {
		if spec == nil {
			var err error
			if spec, err = bounds.SpecFromTable(t); err != nil {
				return nil, inputError{err}
			}
		}
		var err error
		if t, err = bounds.AddDeflection(t, spec, source, impact, text); err != nil {
			return nil, inputError{err}
		}
		if reason != "" {
			reason = " (" + reason + ")"
		}
		fmt.Fprintf(w, "added light-deflection columns at b = %s past %s%s\n", text, t.Meta[bounds.MetaSource], reason)
	}
	var ap *bounds.Applied
	if j.set != nil {
		var err error
		if ap, err = bounds.Apply(t, j.set); err != nil {
			return nil, inputError{err}
		}
		t = ap.Table
	}
	if err := scan.WriteTable(out, t, force); err != nil {
		return nil, inputError{err}
	}
	if ap != nil {
		writeJudgement(w, ap)
	}
	fmt.Fprintf(w, "%s %s\n", verb, out)
	return ap, nil
}

func writeJudgement(w io.Writer, ap *bounds.Applied) {
	n := len(ap.Used)
	fmt.Fprintf(w, "judged %d points against %d bound%s of %s (%s):\n", ap.Points, n, plural(n), ap.Set.File, ap.RuleText())
	for _, u := range ap.Used {
		fmt.Fprintf(w, "  %s: %s; excludes %d point%s\n", u.Name, u.Describe(), u.Excluded, plural(u.Excluded))
		if u.Note != "" {
			fmt.Fprintf(w, "      %s\n", u.Note)
		}
		if u.ErrorColumn != "" {
			fmt.Fprintf(w, "      its integration error %s is added to sigma in quadrature\n", u.ErrorColumn)
		}
	}
	for _, s := range ap.Skipped {
		fmt.Fprintf(w, "  skipped %s\n", s)
	}
	if ap.Measurements > 1 {
		fmt.Fprintf(w, "  combined chi-square of %d measurements: excluded above %.4g at %s (columns bounds_chi_square*)\n",
			ap.Measurements, ap.ChiSquareThreshold, strconv.FormatFloat(ap.Set.Confidence, 'g', -1, 64))
	}
	fmt.Fprintf(w, "  allowed %d, excluded %d", ap.Allowed, ap.Excluded)
	if ap.Undetermined > 0 {
		fmt.Fprintf(w, ", undetermined %d (an observable has no value)", ap.Undetermined)
	}
	fmt.Fprintln(w)
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

// boundaryRow is one row of the boundary table.
type boundaryRow struct {
	AlongAxis   string   `parquet:"along_axis"`
	AcrossAxis  string   `parquet:"across_axis"`
	Across      *float64 `parquet:"across_value,optional"`
	At          float64  `parquet:"boundary_value"`
	InterpErr   *float64 `parquet:"boundary_interpolation_error,optional"`
	Lo          float64  `parquet:"bracket_low"`
	Hi          float64  `parquet:"bracket_high"`
	AllowedSide string   `parquet:"allowed_side"`
	DecidedBy   string   `parquet:"decided_by"`
	Verdict     string   `parquet:"verdict"`
	GridLine    string   `parquet:"grid_line"`
}

// boundaryAxes chooses the axes: along the last numeric axis (alpha in an
// (lambda, alpha) scan), lines labelled by the first other one.
func boundaryAxes(t *scan.Table) (along, across int, ok bool) {
	n, _ := strconv.Atoi(t.Meta["mgorbit.scan.axes"])
	along, across = -1, -1
	for k := n - 1; k >= 0; k-- {
		if t.Meta[fmt.Sprintf("mgorbit.scan.axis.%d.dimension", k)] != "words" {
			along = k
			break
		}
	}
	if along < 0 {
		return 0, 0, false
	}
	for k := 0; k < n; k++ {
		if k != along {
			across = k
			break
		}
	}
	return along, across, true
}

// writeBoundary writes the boundary table and prints its first lines.
func writeBoundary(w io.Writer, ap *bounds.Applied, path string) error {
	along, across, ok := boundaryAxes(ap.Table)
	if !ok {
		return nil
	}
	bd, err := bounds.Boundary(ap.Table, along, across)
	if err != nil {
		return err
	}
	var rows []boundaryRow
	add := func(c bounds.Crossing, verdict string) {
		side := "above"
		if c.AllowedBelow {
			side = "below"
		}
		line := make([]string, len(c.Line))
		for k, i := range c.Line {
			if k == along {
				line[k] = "*"
			} else {
				line[k] = strconv.Itoa(i)
			}
		}
		rows = append(rows, boundaryRow{AlongAxis: bd.AlongPath, AcrossAxis: bd.AcrossPath, Across: table.Nullable(c.Across),
			At: c.At, InterpErr: table.Nullable(c.InterpErr), Lo: c.Lo, Hi: c.Hi, AllowedSide: side, DecidedBy: c.Bound,
			Verdict: verdict, GridLine: strings.Join(line, ",")})
	}
	for _, c := range bd.Overall {
		add(c, "combined")
	}
	for _, name := range bd.Names {
		for _, c := range bd.PerBound[name] {
			add(c, "bound "+name)
		}
	}
	meta := map[string]string{}
	for k, v := range ap.Table.Meta {
		if strings.HasPrefix(k, "mgorbit.scan.") || strings.HasPrefix(k, "mgorbit.scenario.") || strings.HasPrefix(k, bounds.MetaPrefix) || k == "mgorbit.version" {
			meta[k] = v
		}
	}
	meta["mgorbit.boundary.along_column"] = bd.AlongColumn
	meta["mgorbit.boundary.across_column"] = bd.AcrossColumn
	meta["mgorbit.boundary.method"] = "linear interpolation of the deciding statistic (pull, distance beyond a limit, or square root of the chi-square) in the along axis's value between neighbouring grid points; interpolation error: difference from a three-point quadratic"
	if err := table.Write(path, rows, meta, true); err != nil {
		return err
	}
	if len(bd.Overall) == 0 {
		fmt.Fprintf(w, "no boundary along %s: the verdict does not change between neighbouring points\n", bd.AlongPath)
		return nil
	}
	alongLabel := plot.Label(ap.Table, bd.AlongColumn)
	fmt.Fprintf(w, "boundary along %s, %d crossing%s (all in %s):\n", bd.AlongPath, len(bd.Overall), plural(len(bd.Overall)), path)
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', tabwriter.AlignRight)
	head := ""
	if across >= 0 {
		head = plot.Label(ap.Table, bd.AcrossColumn) + "\t"
	}
	fmt.Fprintf(tw, "  %s%s\tallowed\tinterpolation error\tdecided by\t\n", head, alongLabel)
	step := max(1, (len(bd.Overall)+11)/12)
	for i := 0; i < len(bd.Overall); i += step {
		c := bd.Overall[i]
		side := "above"
		if c.AllowedBelow {
			side = "below"
		}
		pre := ""
		if across >= 0 {
			pre = strconv.FormatFloat(c.Across, 'g', 4, 64) + "\t"
		}
		fmt.Fprintf(tw, "  %s%.4g\t%s\t%.2g\t%s\t\n", pre, c.At, side, c.InterpErr, c.Bound)
	}
	_ = tw.Flush()
	if step > 1 {
		fmt.Fprintf(w, "  (every %d%s crossing shown)\n", step, ordinal(step))
	}
	return nil
}

func ordinal(n int) string {
	if n%100 >= 11 && n%100 <= 13 {
		return "th"
	}
	switch n % 10 {
	case 1:
		return "st"
	case 2:
		return "nd"
	case 3:
		return "rd"
	}
	return "th"
}

// isJudged tells whether a table carries verdict columns.
func isJudged(t *scan.Table) bool {
	return t.Meta[bounds.MetaCount] != "" && t.Column(bounds.AllowedColumn) >= 0
}

// drawJudged draws a judged table: the exclusion map of a 2-axis scan, or
// the observable of a 1-axis scan with the excluded part shaded and the
// bounds' lines.
func drawJudged(w io.Writer, t *scan.Table, path, plotY string, lines []float64) error {
	axes, _ := strconv.Atoi(t.Meta["mgorbit.scan.axes"])
	n, _ := strconv.Atoi(t.Meta[bounds.MetaCount])
	var names []string
	for k := 0; k < n; k++ {
		names = append(names, t.Meta[fmt.Sprintf("%s%d.name", bounds.MetaPrefix, k)])
	}
	rule := bounds.Rule(t.Meta[bounds.MetaRule])
	if rule == bounds.ChiSquare {
		names = append(names, bounds.ChiSquareName)
	}
	switch axes {
	case 2:
		along, across, ok := boundaryAxes(t)
		if !ok || across < 0 {
			return fmt.Errorf("no numeric axis to draw the boundary along")
		}
		bd, err := bounds.Boundary(t, along, across)
		if err != nil {
			return err
		}
		m := plot.ExclusionMap{X: bd.AcrossColumn, Y: bd.AlongColumn, Bounds: names,
			Title: fmt.Sprintf("%s: excluded region", t.Meta["mgorbit.scenario.name"])}
		m.Note = boundsNote(t, rule)
		m.Verdict = bd.ExcludedAt
		for _, name := range bd.Names {
			if rule == bounds.ChiSquare && t.Meta[kindKey(t, name)] == string(bounds.Measurement) {
				continue // judged together: the chi-square curve stands for them
			}
			m.Boundaries = append(m.Boundaries, curves(name, bd.PerBound[name], across)...)
		}
		d, err := plot.DrawExclusion(t, m, path)
		if err != nil {
			return err
		}
		fmt.Fprintf(w, "drew %s: %d grid points, %d boundary line%s%s\n", path, d.Points, d.Curves, plural(d.Curves), logNote(d))
		return nil
	case 1:
		fig := plot.Figure{Y: plotY}
		if fig.Y == "" {
			// The observable of the bound that excludes most.
			most := -1
			for k := 0; k < n; k++ {
				p := fmt.Sprintf("%s%d.", bounds.MetaPrefix, k)
				if e, _ := strconv.Atoi(t.Meta[p+"excluded_points"]); e > most {
					most, fig.Y = e, t.Meta[p+"column"]
				}
			}
		}
		fig.Reference = plot.DefaultReference(t, fig.Y)
		for _, b := range lines {
			fig.Bounds = append(fig.Bounds, plot.Bound{Value: b})
		}
		for k := 0; k < n; k++ {
			p := fmt.Sprintf("%s%d.", bounds.MetaPrefix, k)
			if t.Meta[p+"column"] != fig.Y {
				continue
			}
			get := func(key string) float64 {
				x, err := strconv.ParseFloat(t.Meta[p+key], 64)
				if err != nil {
					return math.NaN()
				}
				return x
			}
			name := t.Meta[p+"name"]
			if t.Meta[p+"kind"] == string(bounds.Measurement) {
				v, s, kk := get("value"), get("sigma"), get("k")
				label := fmt.Sprintf("%s ± %.3g sigma", name, kk)
				fig.Bounds = append(fig.Bounds, plot.Bound{Value: v + kk*s, Label: label, Group: name},
					plot.Bound{Value: v - kk*s, Group: name})
			} else {
				for _, key := range []string{"upper", "lower"} {
					if x := get(key); !math.IsNaN(x) {
						fig.Bounds = append(fig.Bounds, plot.Bound{Value: x, Label: name + " " + key})
					}
				}
			}
		}
		fig.LogY = plot.Auto
		for _, b := range fig.Bounds {
			if !(b.Value > 0) {
				fig.LogY = plot.Off // an interval edge at or below zero
			}
		}
		bd, err := bounds.Boundary(t, 0, -1)
		if err != nil {
			return err
		}
		fig.Shade = spans(t, bd)
		d, err := plot.Draw(t, fig, path)
		if err != nil {
			return err
		}
		fmt.Fprintf(w, "drew %s: %s, excluded part shaded%s\n", path, drawnCount(d), logNote(d))
		return nil
	}
	return nil
}

func kindKey(t *scan.Table, name string) string {
	n, _ := strconv.Atoi(t.Meta[bounds.MetaCount])
	for k := 0; k < n; k++ {
		if p := fmt.Sprintf("%s%d.", bounds.MetaPrefix, k); t.Meta[p+"name"] == name {
			return p + "kind"
		}
	}
	return ""
}

// boundsNote is the line under the exclusion map's legend.
func boundsNote(t *scan.Table, rule bounds.Rule) string {
	const lines = "lines: interpolated between grid points\n"
	if rule == bounds.ChiSquare {
		return lines + fmt.Sprintf("combined chi-square at CL %s", t.Meta[bounds.MetaPrefix+"confidence"])
	}
	n, _ := strconv.Atoi(t.Meta[bounds.MetaCount])
	cls := map[string]bool{}
	var list []string
	for k := 0; k < n; k++ {
		cl := t.Meta[fmt.Sprintf("%s%d.confidence", bounds.MetaPrefix, k)]
		if !cls[cl] {
			cls[cl] = true
			list = append(list, cl)
		}
	}
	return lines + "each bound at CL " + strings.Join(list, ", ")
}

// curves chains a bound's crossings into lines: one per allowed side and
// rank on a grid line, joining crossings on neighbouring grid lines of the
// across axis (a gap where the boundary leaves the grid).
func curves(name string, cs []bounds.Crossing, across int) []plot.Curve {
	type key struct {
		below bool
		rank  int
	}
	rank := map[string]int{}
	chains := map[key][]bounds.Crossing{}
	var keys []key
	for _, c := range cs {
		id := fmt.Sprint(c.Line[across], c.AllowedBelow)
		k := key{c.AllowedBelow, rank[id]}
		rank[id]++
		if _, ok := chains[k]; !ok {
			keys = append(keys, k)
		}
		chains[k] = append(chains[k], c)
	}
	var out []plot.Curve
	for _, k := range keys {
		ch := chains[k]
		sort.SliceStable(ch, func(a, b int) bool { return ch[a].Line[across] < ch[b].Line[across] })
		var pts plotter.XYs
		for i, c := range ch {
			if i > 0 && c.Line[across]-ch[i-1].Line[across] != 1 {
				pts = append(pts, plotter.XY{X: math.NaN(), Y: math.NaN()})
			}
			pts = append(pts, plotter.XY{X: c.Across, Y: c.At})
		}
		out = append(out, plot.Curve{Bound: name, Points: pts})
	}
	return out
}

// spans are the excluded intervals of a 1-axis scan, from its crossings.
func spans(t *scan.Table, bd *bounds.Boundaries) []plot.Span {
	cx, ca := t.Column(bd.AlongColumn), t.Column(bounds.AllowedColumn)
	type pt struct {
		x  float64
		ok string
	}
	var pts []pt
	seen := map[int]bool{}
	for r := range t.Rows {
		if p := t.Point(r); !seen[p] {
			seen[p] = true
			pts = append(pts, pt{t.Float(r, cx), t.String(r, ca)})
		}
	}
	sort.Slice(pts, func(a, b int) bool { return pts[a].x < pts[b].x })
	edge := func(lo, hi float64) float64 {
		for _, c := range bd.Overall {
			if c.Lo == lo && c.Hi == hi {
				return c.At
			}
		}
		return (lo + hi) / 2
	}
	var out []plot.Span
	open := false
	var from float64
	for i, p := range pts {
		ex := p.ok == "false"
		switch {
		case ex && !open:
			open, from = true, math.Inf(-1)
			if i > 0 {
				from = edge(pts[i-1].x, p.x)
			}
		case !ex && open:
			open = false
			out = append(out, plot.Span{From: from, To: edge(pts[i-1].x, p.x)})
		}
	}
	if open {
		out = append(out, plot.Span{From: from, To: math.Inf(1)})
	}
	return out
}

func newBoundsCmd() *cobra.Command {
	cmd := &cobra.Command{
		Use:   "bounds",
		Short: "Judge scans against measured values and limits (a bounds file)",
		Long: `A bounds file (TOML) lists observables of a system, each with a measured value
and its 1-sigma uncertainty (value, sigma) or a one-sided limit (upper,
lower), at a confidence level. Applied to a scan table it marks every grid
point allowed or excluded:

  allowed, excluded_by            the verdict and the bounds that exclude
  bound_NAME_pull                 (observable - value)/sigma_eff for a measurement
  bound_NAME_beyond               observable beyond a limit (observable's unit)
  bound_NAME_excluded             each bound's own verdict
  bounds_chi_square...            the measurements' combined chi-square

A measurement excludes a point more than k sigma_eff away, k = Phi^-1((1 + CL)/2)
(1.96 at 0.95), sigma_eff = sqrt(sigma^2 + err^2) with err the scan's
integration-error estimate of the observable where there is one. A limit
excludes beyond it by more than z err, z = Phi^-1(CL). With rule "each"
(the default) a point is excluded if any bound excludes it; with
"chi-square" if the sum of squared pulls exceeds the chi-square quantile of
n degrees of freedom at the [combine] confidence.`,
	}
	cmd.AddCommand(newBoundsApplyCmd(), newBoundsCheckCmd())
	return cmd
}

func newBoundsApplyCmd() *cobra.Command {
	var fl boundsFlags
	var out, plotOut, plotY string
	var force, noPlot bool
	cmd := &cobra.Command{
		Use:   "apply SCAN.parquet... --bounds FILE",
		Short: "Mark every point of an existing scan allowed or excluded, without recomputing it",
		Long: `Apply a bounds file to a scan table (or the part files of one, read as one
table) and write a new table with the verdict columns (atomically; earlier
verdict columns are replaced), the boundary table beside it, and the plot:
for a 2-axis scan the excluded region shaded and its boundary drawn, for a
1-axis scan the observable with the excluded part shaded. Light-deflection
columns, for a gamma bound, are computed from the scenario and grid the
table records (at --deflection-at, or where the bound says it was measured).`,
		Example: `  mgorbit bounds apply mgorbit-scan/scan.parquet --bounds testdata/bounds/example.toml
  mgorbit bounds apply scan.parquet --bounds my.toml --out judged.parquet --deflection-at "1.6 Rsun"`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if fl.file == "" {
				return inputError{fmt.Errorf("give the bounds file: --bounds FILE")}
			}
			j, err := fl.load()
			if err != nil {
				return err
			}
			t, err := readScanFiles(args)
			if err != nil {
				return inputError{err}
			}
			if out == "" {
				out = strings.TrimSuffix(args[0], filepath.Ext(args[0])) + ".bounded.parquet"
			}
			if filepath.Clean(out) == filepath.Clean(args[0]) && !force {
				return inputError{fmt.Errorf("--out %s is the input: pass --force to replace it", out)}
			}
			w := cmd.OutOrStdout()
			ap, err := j.run(w, t, nil, out, force, "wrote")
			if err != nil {
				return err
			}
			if err := writeBoundary(w, ap, strings.TrimSuffix(out, ".parquet")+".boundary.parquet"); err != nil {
				return err
			}
			if noPlot {
				return nil
			}
			if plotOut == "" {
				plotOut = strings.TrimSuffix(out, ".parquet") + ".png"
			}
			if err := drawJudged(w, ap.Table, plotOut, plotY, nil); err != nil {
				return inputError{fmt.Errorf("no plot drawn: %v", err)}
			}
			return nil
		},
	}
	f := cmd.Flags()
	addBoundsFlags(f, &fl)
	f.StringVar(&out, "out", "", "judged table (default: the input's name with .bounded.parquet)")
	f.StringVar(&plotOut, "plot", "", "figure file, .png or .svg (default: the output's name with .png)")
	f.StringVar(&plotY, "plot-y", "", "1-axis scans: column for the y axis (default: the first bound's observable)")
	f.BoolVar(&noPlot, "no-plot", false, "do not draw the figure")
	f.BoolVar(&force, "force", false, "replace an existing output table")
	return cmd
}

func newBoundsCheckCmd() *cobra.Command {
	return &cobra.Command{
		Use:   "check FILE",
		Short: "Check a bounds file and show how each bound judges",
		Args:  cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			set, err := bounds.Load(args[0])
			if err != nil {
				return inputError{err}
			}
			w := cmd.OutOrStdout()
			fmt.Fprintf(w, "%s: %d bound%s, rule %s\n", set.File, len(set.Bounds), plural(len(set.Bounds)), set.Rule)
			meas := 0
			for _, b := range set.Bounds {
				fmt.Fprintf(w, "  %s: %s\n", b.Name, b.Describe())
				if b.Kind == bounds.Measurement {
					meas++
					fmt.Fprintf(w, "    excluded outside [%.6g, %.6g] (k = %.6g, plus any integration error in quadrature)\n",
						b.Value-b.K()*b.Sigma, b.Value+b.K()*b.Sigma, b.K())
				} else {
					fmt.Fprintf(w, "    excluded beyond the limit by more than %.4g times the integration error (one-sided z at CL %g)\n", b.Z(), b.Confidence)
				}
				if b.Note != "" {
					fmt.Fprintf(w, "    note: %s\n", b.Note)
				}
			}
			if meas > 0 {
				fmt.Fprintf(w, "  chi-square of %d measurement%s at CL %g: excluded above %.6g", meas, plural(meas), set.Confidence, bounds.ChiSquareThreshold(meas, set.Confidence))
				if set.Rule != bounds.ChiSquare {
					fmt.Fprint(w, " (computed, not the rule)")
				}
				fmt.Fprintln(w)
			}
			return nil
		},
	}
}
