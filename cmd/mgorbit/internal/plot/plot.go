package plot

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/plotutil"
	"gonum.org/v1/plot/vg"

	"mgorbit/cmd/mgorbit/internal/scan"
)

// Bound is a horizontal line at a value of the y column, such as a
// measured limit on the precession.
type Bound struct {
	Value float64
	Label string
	// Group: bounds with the same non-empty Group (the two edges of one
	// interval) share a colour and the first one's legend entry.
	Group string
}

// Log axis choices.
const (
	Auto = "auto"
	On   = "on"
	Off  = "off"
)

// Figure says what to draw.
type Figure struct {
	X, Y string
	// Group draws one curve per distinct value of this column ("" none).
	Group string
	// Body keeps only this body's rows ("" all; several bodies get a curve each).
	Body string
	// LogX and LogY are Auto, On or Off. Auto: x is logarithmic when it is a
	// swept column with a log grid; y when x is, the y values share a sign
	// and span more than a factor 10.
	LogX, LogY string
	Bounds     []Bound
	// Shade marks x intervals (such as those bounds exclude) under the curves.
	Shade []Span
	// Reference is a column drawn as a dashed line beside each curve, such
	// as the semi-analytic counterpart of an integrated y ("" none).
	Reference string
	Title     string
	// NoErrors leaves out the error bars.
	NoErrors      bool
	Width, Height vg.Length
}

// Drawn reports what was drawn.
type Drawn struct {
	Curves, Points int
	LogX, LogY     bool
	// NegatedY is set when all y values were negative on a log axis, so
	// -y was drawn.
	NegatedY    bool
	ErrorColumn string
}

// Draw renders the figure to path (.png, .svg, .pdf or .eps).
func Draw(t *scan.Table, f Figure, path string) (*Drawn, error) {
	if f.X == "" {
		f.X = DefaultX(t)
	}
	if f.Y == "" {
		f.Y = DefaultY(t)
	}
	cx, cy := t.Column(f.X), t.Column(f.Y)
	if cx < 0 {
		return nil, fmt.Errorf("no column %q (columns: %s)", f.X, strings.Join(t.ColumnNames(), ", "))
	}
	if cy < 0 {
		return nil, fmt.Errorf("no column %q (columns: %s)", f.Y, strings.Join(t.ColumnNames(), ", "))
	}
	cg := -1
	if f.Group != "" {
		if cg = t.Column(f.Group); cg < 0 {
			return nil, fmt.Errorf("no column %q to group by", f.Group)
		}
		values := map[string]bool{}
		for r := range t.Rows {
			values[t.String(r, cg)] = true
		}
		if len(values) < 2 {
			cg, f.Group = -1, "" // one value: nothing to tell apart
		}
	}
	out := &Drawn{}
	ce := -1
	if !f.NoErrors {
		if out.ErrorColumn = ErrorColumn(t, f.Y); out.ErrorColumn != "" {
			ce = t.Column(out.ErrorColumn)
		}
	}
	cb, cerr := t.Column(scan.BodyColumn), t.Column(scan.ErrorColumn)
	bodies := map[string]bool{}
	for r := range t.Rows {
		if cb >= 0 {
			bodies[t.String(r, cb)] = true
		}
	}
	if f.Body != "" && !bodies[f.Body] {
		return nil, fmt.Errorf("no rows for body %q", f.Body)
	}
	perBody := f.Body == "" && len(bodies) > 1

	cref := -1
	if f.Reference != "" {
		if cref = t.Column(f.Reference); cref < 0 {
			return nil, fmt.Errorf("no column %q for the reference curve", f.Reference)
		}
	}
	type point struct{ x, y, e, ref float64 }
	curves := map[string][]point{}
	keys := map[string]curveKey{}
	for r := range t.Rows {
		if cerr >= 0 && t.String(r, cerr) != "" {
			continue
		}
		body := ""
		if cb >= 0 {
			body = t.String(r, cb)
		}
		if f.Body != "" && body != f.Body {
			continue
		}
		x, y := t.Float(r, cx), t.Float(r, cy)
		if math.IsNaN(x) || math.IsNaN(y) || math.IsInf(x, 0) || math.IsInf(y, 0) {
			continue
		}
		e := 0.0
		if ce >= 0 {
			if e = t.Float(r, ce); math.IsNaN(e) {
				e = 0
			}
		}
		k := curveKey{}
		if perBody {
			k.body = body
		}
		if cg >= 0 {
			k.group, k.num = t.String(r, cg), t.Float(r, cg)
		}
		id := k.body + "\x00" + k.group
		keys[id] = k
		ref := math.NaN()
		if cref >= 0 {
			ref = t.Float(r, cref)
		}
		curves[id] = append(curves[id], point{x, y, e, ref})
	}
	if len(curves) == 0 {
		return nil, fmt.Errorf("no finite values of %s against %s to plot", f.Y, f.X)
	}

	var xs, ys []float64
	for _, c := range curves {
		for _, p := range c {
			xs, ys = append(xs, p.x), append(ys, p.y)
			if !math.IsNaN(p.ref) {
				ys = append(ys, p.ref)
			}
		}
	}
	out.LogX = chooseLog(f.LogX, axisKind(t, f.X) == scan.Logarithmic, xs, false)
	out.LogY = chooseLog(f.LogY, out.LogX, ys, true)
	if out.LogX && !allSameSign(xs) {
		return nil, fmt.Errorf("log x axis: %s has values of both signs or zero", f.X)
	}
	if out.LogY {
		if !allSameSign(ys) {
			return nil, fmt.Errorf("log y axis: %s has values of both signs or zero", f.Y)
		}
		out.NegatedY = ys[0] < 0
	}
	sgn := 1.0
	if out.NegatedY {
		sgn = -1
	}

	p := plot.New()
	p.Title.Text = f.Title
	if p.Title.Text == "" {
		p.Title.Text = fmt.Sprintf("%s: %s", t.Meta["mgorbit.scenario.name"], shortName(f.Y))
	}
	p.Title.Padding = vg.Points(8)
	p.X.Label.Text = Label(t, f.X)
	p.Y.Label.Text = Label(t, f.Y)
	if out.NegatedY {
		p.Y.Label.Text = "minus " + p.Y.Label.Text
	}
	p.X.Tick.Marker, p.Y.Tick.Marker = plainTicks{}, plainTicks{}
	if out.LogX {
		p.X.Tick.Marker = decadeTicks{}
	}
	if out.LogY {
		p.Y.Tick.Marker = decadeTicks{}
	}
	// Log axes are drawn as log10 of the values (see decadeTicks).
	tx := func(x float64) float64 {
		if out.LogX {
			return math.Log10(x)
		}
		return x
	}
	ty := func(y float64) float64 {
		if out.LogY {
			return math.Log10(y)
		}
		return y
	}
	addShading(p, f.Shade, tx)
	p.Add(plotter.NewGrid())

	ids := make([]string, 0, len(curves))
	for id := range curves {
		ids = append(ids, id)
	}
	sort.Slice(ids, func(i, j int) bool { return keys[ids[i]].less(keys[ids[j]]) })
	xmin, xmax := math.Inf(1), math.Inf(-1)
	var corner corners
	referenced := false
	for i, id := range ids {
		c := curves[id]
		sort.SliceStable(c, func(a, b int) bool { return c[a].x < c[b].x })
		xy := make(plotter.XYs, len(c))
		errs := make(plotter.YErrors, len(c))
		hasErr := false
		for k, pt := range c {
			y := sgn * pt.y
			xy[k] = plotter.XY{X: tx(pt.x), Y: ty(y)}
			lo, hi := pt.e, pt.e
			if out.LogY {
				// a log axis cannot show a bar below zero: stop it at y/1000
				lo = ty(y) - ty(math.Max(y-pt.e, 1e-3*y))
				hi = ty(y+pt.e) - ty(y)
			}
			errs[k] = struct{ Low, High float64 }{lo, hi}
			if pt.e > 0 {
				hasErr = true
			}
			xmin, xmax = math.Min(xmin, pt.x), math.Max(xmax, pt.x)
		}
		line, dots, err := plotter.NewLinePoints(xy)
		if err != nil {
			return nil, err
		}
		col := plotutil.Color(i)
		line.Color = col
		line.Width = vg.Points(1.2)
		dots.Color = col
		dots.Shape = plotutil.Shape(i)
		dots.Radius = vg.Points(2.5)
		if len(c) > 60 {
			dots.Radius = vg.Points(1) // dense curves: the line carries them
		}
		p.Add(line, dots)
		if hasErr {
			eb, err := plotter.NewYErrorBars(struct {
				plotter.XYs
				plotter.YErrors
			}{xy, errs})
			if err != nil {
				return nil, err
			}
			eb.Color = col
			eb.CapWidth = vg.Points(4)
			p.Add(eb)
		}
		label := keys[id].label(f.Group, t)
		if cref >= 0 {
			var rxy plotter.XYs
			for _, pt := range c {
				if !math.IsNaN(pt.ref) {
					rxy = append(rxy, plotter.XY{X: tx(pt.x), Y: ty(sgn * pt.ref)})
				}
			}
			if len(rxy) > 0 {
				rl, err := plotter.NewLine(rxy)
				if err != nil {
					return nil, err
				}
				rl.Color = col
				rl.Width = vg.Points(1)
				rl.Dashes = []vg.Length{vg.Points(2), vg.Points(2)}
				p.Add(rl)
				// The points are what was computed; the dashes the reference.
				line.LineStyle.Width = 0
				if label != "" {
					p.Legend.Add(label, dots)
				}
				label = ""
				referenced = true
			}
		}
		if label != "" {
			p.Legend.Add(label, line, dots)
		}
		for _, pt := range c {
			corner.add(tx(pt.x), ty(sgn*pt.y))
		}
		out.Points += len(c)
	}
	out.Curves = len(ids)
	if referenced {
		// One key for all curves: points are what was computed, dashes the
		// reference column.
		yName, refName := shortName(f.Y), shortName(f.Reference)
		if f.Reference == "semi_analytic_"+f.Y {
			yName, refName = "integrated", "semi-analytic"
		}
		key, err := plotter.NewScatter(plotter.XYs{{}})
		if err != nil {
			return nil, err
		}
		key.Shape = plotutil.Shape(0)
		key.Radius = vg.Points(2.5)
		dash, err := plotter.NewLine(plotter.XYs{{}, {}})
		if err != nil {
			return nil, err
		}
		dash.Dashes = []vg.Length{vg.Points(2), vg.Points(2)}
		p.Legend.Add(yName+" (points)", key)
		p.Legend.Add(refName+" (dashes)", dash)
	}
	groupColour := map[string]int{}
	for k, b := range f.Bounds {
		v := sgn * b.Value
		if out.LogY && !(v > 0) {
			return nil, fmt.Errorf("bound %g cannot be drawn on the log y axis", b.Value)
		}
		bl, err := plotter.NewLine(plotter.XYs{{X: tx(xmin), Y: ty(v)}, {X: tx(xmax), Y: ty(v)}})
		if err != nil {
			return nil, err
		}
		ci, seen := groupColour[b.Group]
		if !seen {
			ci = len(ids) + k
			if b.Group != "" {
				groupColour[b.Group] = ci
			}
		}
		bl.Color = plotutil.Color(ci)
		bl.Width = vg.Points(1.5)
		bl.Dashes = []vg.Length{vg.Points(6), vg.Points(3)}
		p.Add(bl)
		if seen {
			continue
		}
		label := b.Label
		if label == "" {
			label = "bound " + strconv.FormatFloat(b.Value, 'g', 4, 64)
		}
		p.Legend.Add(label, bl)
	}
	w, h := f.Width, f.Height
	if w == 0 {
		w = 16 * vg.Centimeter
	}
	if h == 0 {
		h = 11 * vg.Centimeter
	}
	pad(&p.X)
	pad(&p.Y)
	p.Legend.Top, p.Legend.Left = corner.emptiest(p)
	if err := p.Save(w, h, path); err != nil {
		return nil, err
	}
	return out, nil
}

// plainTicks are gonum's default ticks labelled in the shortest form
// (250000, not 250000.00).
type plainTicks struct{}

func (plainTicks) Ticks(min, max float64) []plot.Tick {
	ticks := plot.DefaultTicks{}.Ticks(min, max)
	for i := range ticks {
		if ticks[i].Label != "" {
			v := ticks[i].Value
			if math.Abs(v) < 1e-12*math.Max(math.Abs(min), math.Abs(max)) {
				v = 0
			}
			ticks[i].Label = strconv.FormatFloat(v, 'g', 6, 64)
		}
	}
	return ticks
}

// decadeTicks mark a log axis drawn as log10 of the values on a linear
// scale: gonum's own log scale centres the rotated y label at the linear
// midpoint of the range, which leaves a wide gap above the data. Whole
// powers of ten are labelled with their value; a range shorter than a
// decade also gets its 2..9 multiples labelled.
type decadeTicks struct{}

func (decadeTicks) Ticks(min, max float64) []plot.Tick {
	var ticks []plot.Tick
	labelled := 0
	for k := math.Floor(min); k <= math.Ceil(max); k++ {
		for m := 1; m <= 9; m++ {
			v := k + math.Log10(float64(m))
			if v < min-1e-9 || v > max+1e-9 {
				continue
			}
			t := plot.Tick{Value: v}
			if m == 1 {
				t.Label = strconv.FormatFloat(math.Pow(10, k), 'g', -1, 64)
				labelled++
			}
			ticks = append(ticks, t)
		}
	}
	if labelled < 2 {
		for i := range ticks {
			ticks[i].Label = strconv.FormatFloat(math.Pow(10, ticks[i].Value), 'g', 2, 64)
		}
	}
	return ticks
}

// pad widens an axis by 4% on each side so no point sits on the frame.
func pad(a *plot.Axis) {
	d := 0.04 * (a.Max - a.Min)
	if d == 0 {
		d = 0.5 * math.Max(math.Abs(a.Max), 1)
	}
	a.Min -= d
	a.Max += d
}

// corners finds the corner of the data area with the fewest points, for
// the legend.
type corners struct{ xy plotter.XYs }

func (c *corners) add(x, y float64) { c.xy = append(c.xy, plotter.XY{X: x, Y: y}) }

func (c *corners) emptiest(p *plot.Plot) (top, left bool) {
	best := -1
	for _, tl := range [][2]bool{{true, false}, {true, true}, {false, false}, {false, true}} {
		n := 0
		for _, q := range c.xy {
			u := (q.X - p.X.Min) / (p.X.Max - p.X.Min)
			v := (q.Y - p.Y.Min) / (p.Y.Max - p.Y.Min)
			inX := u > 0.55
			if tl[1] {
				inX = u < 0.45
			}
			inY := v > 0.6
			if !tl[0] {
				inY = v < 0.4
			}
			if inX && inY {
				n++
			}
		}
		if best < 0 || n < best {
			best, top, left = n, tl[0], tl[1]
		}
	}
	return top, left
}

type curveKey struct {
	body, group string
	num         float64
}

func (a curveKey) less(b curveKey) bool {
	if a.body != b.body {
		return a.body < b.body
	}
	if !math.IsNaN(a.num) && !math.IsNaN(b.num) && a.num != b.num {
		return a.num < b.num
	}
	return a.group < b.group
}

func (k curveKey) label(group string, t *scan.Table) string {
	var parts []string
	if k.body != "" {
		parts = append(parts, k.body)
	}
	if group != "" {
		name := Label(t, group)
		v := k.group
		if !math.IsNaN(k.num) {
			v = strconv.FormatFloat(k.num, 'g', 4, 64)
		}
		parts = append(parts, name+" = "+v)
	}
	return strings.Join(parts, ", ")
}

func chooseLog(choice string, auto bool, v []float64, isY bool) bool {
	switch choice {
	case On:
		return true
	case Off:
		return false
	}
	if !auto || !allSameSign(v) {
		return false
	}
	if !isY {
		return true
	}
	lo, hi := math.Inf(1), 0.0
	for _, x := range v {
		lo, hi = math.Min(lo, math.Abs(x)), math.Max(hi, math.Abs(x))
	}
	return hi > 10*lo
}

func allSameSign(v []float64) bool {
	if len(v) == 0 {
		return false
	}
	pos := v[0] > 0
	for _, x := range v {
		if x == 0 || (x > 0) != pos {
			return false
		}
	}
	return true
}

// axisKind is the grid kind of the axis a column belongs to ("" if none).
func axisKind(t *scan.Table, col string) string {
	n, _ := strconv.Atoi(t.Meta["mgorbit.scan.axes"])
	for k := 0; k < n; k++ {
		p := fmt.Sprintf("mgorbit.scan.axis.%d.", k)
		for _, c := range []string{"column_si", "column_unit", "column_plot"} {
			if t.Meta[p+c] == col {
				return t.Meta[p+"kind"]
			}
		}
	}
	return ""
}

// DefaultX is the first axis's plot column.
func DefaultX(t *scan.Table) string { return t.Meta["mgorbit.scan.axis.0.column_plot"] }

// DefaultY is the anomaly per century where the stack has one, else the
// precession per century; integrated where the scan integrated, else the
// semi-analytic value.
func DefaultY(t *scan.Table) string {
	cands := []string{"anomaly_arcsec_per_century", "precession_arcsec_per_century",
		"semi_analytic_anomaly_arcsec_per_century", "semi_analytic_precession_arcsec_per_century"}
	for _, c := range cands {
		k := t.Column(c)
		if k < 0 {
			continue
		}
		for r := range t.Rows {
			if !math.IsNaN(t.Float(r, k)) {
				return c
			}
		}
	}
	return cands[1]
}

// ErrorColumn is the integration-error column of y: for NAME_UNIT it is
// NAME_integration_error_UNIT, for NAME it is NAME_integration_error.
func ErrorColumn(t *scan.Table, y string) string {
	const mark = "_integration_error"
	for _, c := range t.ColumnNames() {
		i := strings.Index(c, mark)
		if i < 0 {
			continue
		}
		if c[:i]+c[i+len(mark):] == y {
			return c
		}
	}
	return ""
}

// unit suffixes of column names and how labels show them.
var unitSuffixes = []struct{ suffix, show string }{
	{"_arcsec_per_century", "arcsec/century"},
	{"_rad_per_orbit", "rad/orbit"},
	{"_m3_per_s2", "m³/s²"},
	{"_m_per_s", "m/s"},
	{"_m", "m"},
	{"_s", "s"},
	{"_rad", "rad"},
}

// Label is a column's axis label: a swept path with its unit, or the
// column's name in words with its unit.
func Label(t *scan.Table, col string) string {
	n, _ := strconv.Atoi(t.Meta["mgorbit.scan.axes"])
	for k := 0; k < n; k++ {
		p := fmt.Sprintf("mgorbit.scan.axis.%d.", k)
		path := t.Meta[p+"path"]
		switch col {
		case t.Meta[p+"column_unit"]:
			return fmt.Sprintf("%s (%s)", path, t.Meta[p+"unit"])
		case t.Meta[p+"column_si"]:
			if u := siShown(t.Meta[p+"dimension"]); u != "" {
				return fmt.Sprintf("%s (%s)", path, u)
			}
			return path
		case t.Meta[p+"column_index"]:
			return path + " (grid index)"
		case t.Meta[p+"column_text"]:
			return path
		}
	}
	return shortName(col)
}

func siShown(dim string) string {
	switch dim {
	case "length":
		return "m"
	case "time":
		return "s"
	case "mass":
		return "GM, m³/s²"
	case "speed":
		return "m/s"
	case "energy":
		return "eV"
	case "angle":
		return "rad"
	}
	return ""
}

func shortName(col string) string {
	words := func(s string) string {
		return strings.ReplaceAll(strings.ReplaceAll(s, "semi_analytic", "semi-analytic"), "_", " ")
	}
	for _, u := range unitSuffixes {
		if strings.HasSuffix(col, u.suffix) {
			return words(strings.TrimSuffix(col, u.suffix)) + " (" + u.show + ")"
		}
	}
	return words(col)
}

// DefaultReference is the semi-analytic counterpart of an integrated y
// column when the table has values in it ("" otherwise).
func DefaultReference(t *scan.Table, y string) string {
	const semi = "semi_analytic_"
	if strings.HasPrefix(y, semi) {
		return ""
	}
	c := t.Column(semi + y)
	if c < 0 {
		return ""
	}
	for r := range t.Rows {
		if !math.IsNaN(t.Float(r, c)) {
			return semi + y
		}
	}
	return ""
}
