package plot

import (
	"fmt"
	"image"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"mgorbit/cmd/mgorbit/internal/scan"
)

// Span is an x interval to shade in a Figure (data units; -Inf and +Inf
// reach the frame), such as the part of a 1-axis scan that bounds exclude.
type Span struct{ From, To float64 }

// Columns of a judged table that the exclusion map reads (package bounds
// writes them).
const (
	allowedColumn    = "allowed"
	excludedByColumn = "excluded_by"
)

// Curve is a boundary line of an exclusion map, in data units; a NaN point
// breaks it.
type Curve struct {
	// Bound names the bound it belongs to (its colour is the bound's).
	Bound  string
	Points plotter.XYs
}

// ExclusionMap says what DrawExclusion draws: the grid of a 2-axis scan,
// each cell shaded by the bounds that exclude it, and the boundaries.
type ExclusionMap struct {
	// X and Y are the columns of the two swept axes.
	X, Y string
	// Bounds are the bound names in order; they choose the colours.
	Bounds     []string
	Boundaries []Curve
	// Verdict, if set, interpolates the verdict between grid points: i is
	// a fractional index into X's sorted values, y a value of Y. It returns
	// the names that exclude there and whether that is known. The map is
	// then shaded pixel by pixel; without it, cell by cell.
	Verdict func(i, y float64) (excludedBy []string, known bool)
	Title   string
	// Note is a line under the legend (e.g. the combination rule).
	Note          string
	Width, Height vg.Length
}

// Exclusion colours: the Okabe-Ito palette (distinguishable with the
// common colour-vision deficiencies), lines in full, cells as tints.
var boundColours = []color.RGBA{
	{213, 94, 0, 255}, {0, 114, 178, 255}, {0, 158, 115, 255},
	{204, 121, 167, 255}, {230, 159, 0, 255}, {86, 180, 233, 255},
}

func boundColour(k int) color.RGBA {
	if k < 0 {
		return color.RGBA{40, 40, 40, 255}
	}
	return boundColours[k%len(boundColours)]
}

// tint mixes c with white, f the share of c.
func tint(c color.RGBA, f float64) color.RGBA {
	mix := func(v uint8) uint8 { return uint8(math.Round(f*float64(v) + (1-f)*255)) }
	return color.RGBA{mix(c.R), mix(c.G), mix(c.B), 255}
}

// setColour is the fill of cells excluded by exactly this set of bounds:
// one bound's tint, or for several the mean of their colours, darker.
func setColour(names []string, index map[string]int) color.RGBA {
	var r, g, b float64
	for _, n := range names {
		c := boundColour(lookup(index, n))
		r, g, b = r+float64(c.R), g+float64(c.G), b+float64(c.B)
	}
	n := float64(len(names))
	mean := color.RGBA{uint8(r / n), uint8(g / n), uint8(b / n), 255}
	if len(names) == 1 {
		return tint(mean, 0.38)
	}
	return tint(mean, 0.62)
}

func lookup(index map[string]int, name string) int {
	if k, ok := index[name]; ok {
		return k
	}
	return -1
}

var undeterminedColour = color.RGBA{225, 225, 225, 255}

// DrawExclusion renders the exclusion map of a judged 2-axis scan to path.
func DrawExclusion(t *scan.Table, m ExclusionMap, path string) (*Drawn, error) {
	cx, cy := t.Column(m.X), t.Column(m.Y)
	ca, cb := t.Column(allowedColumn), t.Column(excludedByColumn)
	switch {
	case cx < 0:
		return nil, fmt.Errorf("no column %q", m.X)
	case cy < 0:
		return nil, fmt.Errorf("no column %q", m.Y)
	case ca < 0 || cb < 0:
		return nil, fmt.Errorf("the table carries no verdicts (allowed, excluded_by): apply a bounds file first")
	}
	out := &Drawn{}
	type cellKey struct{ x, y float64 }
	cells := map[cellKey]string{} // excluded_by, "" allowed, "?" undetermined
	seen := map[int]bool{}
	var xs, ys []float64
	for r := range t.Rows {
		p := t.Point(r)
		if seen[p] {
			continue
		}
		seen[p] = true
		x, y := t.Float(r, cx), t.Float(r, cy)
		if math.IsNaN(x) || math.IsNaN(y) {
			continue
		}
		v := t.String(r, cb)
		if a := t.String(r, ca); a != "true" && a != "false" {
			v = "?"
		}
		cells[cellKey{x, y}] = v
		xs, ys = append(xs, x), append(ys, y)
	}
	if len(cells) == 0 {
		return nil, fmt.Errorf("no grid points with values of %s and %s", m.X, m.Y)
	}
	out.Points = len(cells)
	out.LogX = axisKind(t, m.X) == scan.Logarithmic && allSameSign(xs) && xs[0] > 0
	out.LogY = axisKind(t, m.Y) == scan.Logarithmic && allSameSign(ys) && ys[0] > 0
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
	gx, gy := distinct(xs, tx), distinct(ys, ty)
	ex, ey := cellEdges(gx), cellEdges(gy)

	index := map[string]int{}
	for k, n := range m.Bounds {
		index[n] = k
	}
	fills := &cellFill{}
	used := map[string]bool{}
	for k, v := range cells {
		i, j := sort.SearchFloat64s(gx, tx(k.x)), sort.SearchFloat64s(gy, ty(k.y))
		var c color.Color
		switch v {
		case "":
			continue
		case "?":
			c = undeterminedColour
		default:
			c = setColour(strings.Split(v, ","), index)
		}
		used[v] = true
		fills.cells = append(fills.cells, filledCell{ex[i], ex[i+1], ey[j], ey[j+1], c})
	}
	fills.xmin, fills.xmax, fills.ymin, fills.ymax = ex[0], ex[len(ex)-1], ey[0], ey[len(ey)-1]
	var shade plot.Plotter = fills
	if m.Verdict != nil {
		r := &rasterFill{cellFill: fills, gx: gx, index: index, verdict: m.Verdict}
		r.y = func(Y float64) float64 {
			if out.LogY {
				return math.Pow(10, Y)
			}
			return Y
		}
		shade = r
	}

	p := plot.New()
	p.Title.Text = m.Title
	p.Title.Padding = vg.Points(8)
	p.X.Label.Text, p.Y.Label.Text = Label(t, m.X), Label(t, m.Y)
	p.X.Tick.Marker, p.Y.Tick.Marker = plainTicks{}, plainTicks{}
	if out.LogX {
		p.X.Tick.Marker = decadeTicks{}
	}
	if out.LogY {
		p.Y.Tick.Marker = decadeTicks{}
	}
	p.Add(shade)
	grid := plotter.NewGrid()
	grid.Vertical.Color, grid.Horizontal.Color = color.Gray{200}, color.Gray{200}
	p.Add(grid)

	fillLeg, lineLeg := plot.NewLegend(), plot.NewLegend()
	for _, l := range []*plot.Legend{&fillLeg, &lineLeg} {
		l.Left, l.Top = true, true
		l.ThumbnailWidth = vg.Points(18)
	}
	fillLeg.Add("allowed", fillThumb{color.White, true})
	sty := fillLeg.TextStyle
	fillRows, lineRows := 1, 0
	// Single bounds first, then their overlaps.
	var sets []string
	for v := range used {
		if v != "?" {
			sets = append(sets, v)
		}
	}
	sort.Slice(sets, func(a, b int) bool {
		na, nb := strings.Count(sets[a], ","), strings.Count(sets[b], ",")
		if na != nb {
			return na < nb
		}
		return firstIndex(sets[a], index) < firstIndex(sets[b], index)
	})
	fillWidth := sty.Width("allowed")
	for _, v := range sets {
		names := strings.Split(v, ",")
		text := "excluded by " + strings.Join(names, " and ")
		var th plot.Thumbnailer = fillThumb{setColour(names, index), false}
		if m.Verdict != nil && len(names) > 1 {
			th = stripeThumb{stripeColours(names, index)}
		}
		fillLeg.Add(text, th)
		fillWidth = max(fillWidth, sty.Width(text))
		fillRows++
	}
	if used["?"] {
		fillLeg.Add("undetermined (an observable has no value)", fillThumb{undeterminedColour, false})
		fillRows++
	}
	drawnLine := map[string]bool{}
	for _, c := range m.Boundaries {
		var seg plotter.XYs
		flush := func() error {
			if len(seg) < 1 {
				return nil
			}
			l, err := plotter.NewLine(seg)
			if err != nil {
				return err
			}
			l.Color = boundColour(lookup(index, c.Bound))
			l.Width = vg.Points(1.6)
			p.Add(l)
			if len(seg) == 1 {
				// A boundary met on one grid line only: a mark, not a line.
				s, err := plotter.NewScatter(seg)
				if err != nil {
					return err
				}
				s.Color, s.Radius, s.Shape = l.Color, vg.Points(2.5), draw.CircleGlyph{}
				p.Add(s)
			}
			if !drawnLine[c.Bound] {
				drawnLine[c.Bound] = true
				lineLeg.Add("boundary: "+c.Bound, l)
				lineRows++
			}
			out.Curves++
			seg = nil
			return nil
		}
		for _, q := range c.Points {
			if math.IsNaN(q.X) || math.IsNaN(q.Y) {
				if err := flush(); err != nil {
					return nil, err
				}
				continue
			}
			seg = append(seg, plotter.XY{X: tx(q.X), Y: ty(q.Y)})
		}
		if err := flush(); err != nil {
			return nil, err
		}
	}
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = fills.xmin, fills.xmax, fills.ymin, fills.ymax

	w, h := m.Width, m.Height
	if w == 0 {
		w = 18 * vg.Centimeter
	}
	if m.Note != "" {
		for _, line := range strings.Split(m.Note, "\n") {
			lineLeg.Add(line)
			lineRows++
		}
	}
	rowH := sty.Height("Ag") * 1.25
	legendH := vg.Length(max(fillRows, lineRows))*rowH + vg.Points(10)
	if h == 0 {
		h = 11*vg.Centimeter + legendH
	}
	format := strings.TrimPrefix(strings.ToLower(filepath.Ext(path)), ".")
	cw, err := draw.NewFormattedCanvas(w, h, format)
	if err != nil {
		return nil, fmt.Errorf("%s: %v (use .png or .svg)", path, err)
	}
	dc := draw.New(cw)
	// The legend takes a strip below the plot, so it hides no part of the map.
	p.Draw(draw.Crop(dc, 0, -vg.Points(14), legendH, 0))
	strip := draw.Crop(dc, vg.Points(12), 0, 0, -(h - legendH))
	fillLeg.Draw(draw.Crop(strip, 0, 0, 0, -vg.Points(4)))
	// The second column starts after the first's longest text.
	col2 := max(w/2-vg.Points(12), fillLeg.ThumbnailWidth+fillWidth+vg.Points(24))
	lineLeg.Draw(draw.Crop(strip, col2, 0, 0, -vg.Points(4)))
	f, err := os.Create(path)
	if err != nil {
		return nil, err
	}
	if _, err := cw.WriteTo(f); err != nil {
		f.Close()
		return nil, err
	}
	return out, f.Close()
}

func firstIndex(set string, index map[string]int) int {
	n, _, _ := strings.Cut(set, ",")
	if k, ok := index[n]; ok {
		return k
	}
	return len(index)
}

// distinct returns the sorted distinct transformed values.
func distinct(v []float64, tr func(float64) float64) []float64 {
	var out []float64
	seen := map[float64]bool{}
	for _, x := range v {
		if y := tr(x); !seen[y] {
			seen[y] = true
			out = append(out, y)
		}
	}
	sort.Float64s(out)
	return out
}

// cellEdges puts a cell's edges half-way to its neighbours (half a spacing
// beyond the outer values).
func cellEdges(g []float64) []float64 {
	if len(g) == 1 {
		return []float64{g[0] - 0.5, g[0] + 0.5}
	}
	e := make([]float64, len(g)+1)
	for i := 1; i < len(g); i++ {
		e[i] = (g[i-1] + g[i]) / 2
	}
	e[0] = g[0] - (g[1]-g[0])/2
	e[len(g)] = g[len(g)-1] + (g[len(g)-1]-g[len(g)-2])/2
	return e
}

type filledCell struct {
	x0, x1, y0, y1 float64
	c              color.Color
}

// cellFill draws the shaded cells; its data range is the grid's extent.
type cellFill struct {
	cells                  []filledCell
	xmin, xmax, ymin, ymax float64
}

func (f *cellFill) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	// A quarter point of overlap hides the seams anti-aliasing leaves.
	o := vg.Points(0.25)
	for _, q := range f.cells {
		x0, x1, y0, y1 := trX(q.x0)-o, trX(q.x1)+o, trY(q.y0)-o, trY(q.y1)+o
		c.FillPolygon(q.c, c.ClipPolygonXY([]vg.Point{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}}))
	}
}

func (f *cellFill) DataRange() (xmin, xmax, ymin, ymax float64) {
	return f.xmin, f.xmax, f.ymin, f.ymax
}

// fillThumb is a legend swatch.
type fillThumb struct {
	c       color.Color
	outline bool
}

func (t fillThumb) Thumbnail(c *draw.Canvas) {
	pts := []vg.Point{{X: c.Min.X, Y: c.Min.Y}, {X: c.Max.X, Y: c.Min.Y}, {X: c.Max.X, Y: c.Max.Y}, {X: c.Min.X, Y: c.Max.Y}}
	c.FillPolygon(t.c, pts)
	if t.outline {
		c.StrokeLines(draw.LineStyle{Color: color.Gray{120}, Width: vg.Points(0.5)}, append(pts, pts[0]))
	}
}

// xBand shades an x interval over the whole height of the data area.
type xBand struct {
	from, to float64
	c        color.Color
}

func (b xBand) Plot(c draw.Canvas, p *plot.Plot) {
	trX, _ := p.Transforms(&c)
	x0, x1 := c.Min.X, c.Max.X
	if !math.IsInf(b.from, -1) {
		x0 = max(x0, trX(b.from))
	}
	if !math.IsInf(b.to, 1) {
		x1 = min(x1, trX(b.to))
	}
	if x1 <= x0 {
		return
	}
	c.FillPolygon(b.c, []vg.Point{{X: x0, Y: c.Min.Y}, {X: x1, Y: c.Min.Y}, {X: x1, Y: c.Max.Y}, {X: x0, Y: c.Max.Y}})
}

// addShading puts the excluded spans under everything else drawn (call it
// first), with tx the x axis's transform.
func addShading(p *plot.Plot, spans []Span, tx func(float64) float64) {
	if len(spans) == 0 {
		return
	}
	c := tint(boundColours[0], 0.3)
	for _, s := range spans {
		from, to := s.From, s.To
		if !math.IsInf(from, 0) {
			from = tx(from)
		}
		if !math.IsInf(to, 0) {
			to = tx(to)
		}
		p.Add(xBand{from, to, c})
	}
	p.Legend.Add("excluded", fillThumb{c, false})
}

// rasterFill shades the map pixel by pixel from an interpolated verdict.
type rasterFill struct {
	*cellFill
	gx      []float64 // X's sorted distinct values, in the plotted coordinate
	y       func(Y float64) float64
	index   map[string]int
	verdict func(i, y float64) ([]string, bool)
}

func (r *rasterFill) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	x0, x1 := max(c.Min.X, trX(r.xmin)), min(c.Max.X, trX(r.xmax))
	y0, y1 := max(c.Min.Y, trY(r.ymin)), min(c.Max.Y, trY(r.ymax))
	// Two pixels per point: finer than the PNG's own resolution.
	nx, ny := int((x1-x0)/vg.Points(0.5)), int((y1-y0)/vg.Points(0.5))
	if nx < 1 || ny < 1 {
		return
	}
	img := image.NewRGBA(image.Rect(0, 0, nx, ny))
	cache := map[string][]color.Color{}
	for px := 0; px < nx; px++ {
		X := p.X.Min + (float64(x0-c.Min.X)+(float64(px)+0.5)*float64(x1-x0)/float64(nx))/float64(c.Max.X-c.Min.X)*(p.X.Max-p.X.Min)
		i := fractionalIndex(r.gx, X)
		for py := 0; py < ny; py++ {
			Y := p.Y.Min + (float64(y0-c.Min.Y)+(float64(py)+0.5)*float64(y1-y0)/float64(ny))/float64(c.Max.Y-c.Min.Y)*(p.Y.Max-p.Y.Min)
			names, known := r.verdict(i, r.y(Y))
			var col color.Color = color.White
			switch {
			case !known:
				col = undeterminedColour
			case len(names) > 0:
				key := strings.Join(names, ",")
				cols := cache[key]
				if cols == nil {
					cols = stripeColours(names, r.index)
					cache[key] = cols
				}
				col = cols[stripe(px, ny-1-py, len(cols))]
			}
			img.Set(px, ny-1-py, col)
		}
	}
	c.DrawImage(vg.Rectangle{Min: vg.Point{X: x0, Y: y0}, Max: vg.Point{X: x1, Y: y1}}, img)
}

// fractionalIndex places x among sorted values g: k + f for g[k] + f (g[k+1] - g[k]).
func fractionalIndex(g []float64, x float64) float64 {
	n := len(g)
	if n == 1 || x <= g[0] {
		return 0
	}
	if x >= g[n-1] {
		return float64(n - 1)
	}
	k := sort.SearchFloat64s(g, x) - 1
	return float64(k) + (x-g[k])/(g[k+1]-g[k])
}

// Overlaps are striped in the tints of the bounds that overlap: 45 degree
// bands of stripeWidth pixels each.
const stripeWidth = 7

func stripe(px, py, n int) int { return ((px + py) / stripeWidth) % n }

func stripeColours(names []string, index map[string]int) []color.Color {
	out := make([]color.Color, len(names))
	for k, n := range names {
		out[k] = setColour([]string{n}, index)
	}
	return out
}

// stripeThumb is the legend swatch of an overlap.
type stripeThumb struct{ cols []color.Color }

func (t stripeThumb) Thumbnail(c *draw.Canvas) {
	w, h := int(c.Max.X-c.Min.X)*2, int(c.Max.Y-c.Min.Y)*2
	if w < 1 || h < 1 {
		return
	}
	img := image.NewRGBA(image.Rect(0, 0, w, h))
	for x := 0; x < w; x++ {
		for y := 0; y < h; y++ {
			img.Set(x, y, t.cols[stripe(x, y, len(t.cols))])
		}
	}
	c.DrawImage(c.Rectangle, img)
}
