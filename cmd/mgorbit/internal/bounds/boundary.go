package bounds

import (
	"fmt"
	"math"
	"sort"
	"strconv"

	"mgorbit/cmd/mgorbit/internal/scan"
)

// Crossing is one place along an axis where a verdict changes between
// neighbouring grid points.
type Crossing struct {
	// Line holds the grid index of every axis (the along axis's entry is
	// that of the lower bracketing point).
	Line []int
	// Across is the value of the across axis on this line (NaN without one).
	Across float64
	// At is the boundary on the along axis, in its plot column's unit, by
	// linear interpolation of the deciding statistic between Lo and Hi, the
	// bracketing grid values; InterpErr is its difference from a
	// three-point quadratic interpolation (NaN with only two points).
	At, InterpErr, Lo, Hi float64
	// Bound is the bound that decides (ChiSquareName for the combined test).
	Bound string
	// AllowedBelow is set when the allowed side lies at the lower values.
	AllowedBelow bool
}

// Boundaries are the crossings of a judged table along one axis.
type Boundaries struct {
	Along, Across             int // axis indices (Across -1: none)
	AlongColumn, AcrossColumn string
	AlongPath, AcrossPath     string
	Overall                   []Crossing
	Names                     []string // bounds, then ChiSquareName if judged by it
	PerBound                  map[string][]Crossing
	Rule                      Rule

	// For ExcludedAt (2-axis scans): the lines by increasing across value,
	// each sorted along, and the statistics.
	lines [][]*gridPoint
	stats []statistic
}

// statistic is what decides one bound's verdict at a point: excluded where
// it passes level (measurement: the pull passing ±k; limit: the distance
// beyond the limit less z err passing 0; chi-square: its square root
// passing the threshold's).
type statistic struct {
	name     string
	stat     int // column
	excluded int // column (-1: derive from the statistic)
	errCol   int
	kind     Kind
	level    float64 // k, 0, or sqrt(threshold)
	z        float64
}

type gridPoint struct {
	idx     []int
	along   float64
	across  float64
	allowed tri
	s       []float64 // per statistic; NaN unknown
	ex      []tri
}

// Boundary finds where the verdicts of a judged table change along axis
// along (an axis index), on every line of fixed values of the other axes;
// across (-1 for none) names the axis whose value labels the lines.
func Boundary(t *scan.Table, along, across int) (*Boundaries, error) {
	n, _ := strconv.Atoi(t.Meta[MetaCount])
	if n == 0 {
		return nil, fmt.Errorf("the table carries no bound columns: apply a bounds file first")
	}
	axes, _ := strconv.Atoi(t.Meta["mgorbit.scan.axes"])
	if along < 0 || along >= axes || across >= axes || across == along {
		return nil, fmt.Errorf("axes %d and %d: the scan has %d", along, across, axes)
	}
	axisMeta := func(k int, key string) string { return t.Meta[fmt.Sprintf("mgorbit.scan.axis.%d.%s", k, key)] }
	if axisMeta(along, "dimension") == "words" {
		return nil, fmt.Errorf("axis %s has words, not numbers: no boundary along it", axisMeta(along, "path"))
	}
	bd := &Boundaries{Along: along, Across: across, AlongColumn: axisMeta(along, "column_plot"), AlongPath: axisMeta(along, "path"),
		Rule: Rule(t.Meta[MetaRule]), PerBound: map[string][]Crossing{}}
	if across >= 0 {
		bd.AcrossColumn, bd.AcrossPath = axisMeta(across, "column_plot"), axisMeta(across, "path")
	}
	var stats []statistic
	for k := 0; k < n; k++ {
		p := fmt.Sprintf("%s%d.", MetaPrefix, k)
		s := statistic{name: t.Meta[p+"name"], kind: Kind(t.Meta[p+"kind"]), stat: t.Column(t.Meta[p+"statistic_column"]),
			excluded: t.Column(t.Meta[p+"excluded_column"]), errCol: -1}
		if s.stat < 0 || s.excluded < 0 {
			return nil, fmt.Errorf("bound %s: the table lacks its columns", s.name)
		}
		if s.kind == Measurement {
			s.level, _ = strconv.ParseFloat(t.Meta[p+"k"], 64)
		} else {
			s.z, _ = strconv.ParseFloat(t.Meta[p+"z"], 64)
			if e := t.Meta[p+"error_column"]; e != "" {
				s.errCol = t.Column(e)
			}
		}
		stats = append(stats, s)
		bd.Names = append(bd.Names, s.name)
	}
	if c := t.Column(ChiSquareColumn); c >= 0 && bd.Rule == ChiSquare {
		thr, _ := strconv.ParseFloat(t.Meta[MetaPrefix+"chi_square_threshold"], 64)
		stats = append(stats, statistic{name: ChiSquareName, stat: c, excluded: -1, errCol: -1, level: math.Sqrt(thr)})
		bd.Names = append(bd.Names, ChiSquareName)
	}

	idxCols := make([]int, axes)
	for k := range idxCols {
		if idxCols[k] = t.Column(axisMeta(k, "column_index")); idxCols[k] < 0 {
			return nil, fmt.Errorf("the table has no index column for axis %d", k)
		}
	}
	alongCol, acrossCol := t.Column(bd.AlongColumn), -1
	if across >= 0 {
		acrossCol = t.Column(bd.AcrossColumn)
	}
	ca := t.Column(AllowedColumn)
	seen := map[int]bool{}
	lines := map[string][]*gridPoint{}
	var keys []string
	for r := range t.Rows {
		p := t.Point(r)
		if seen[p] {
			continue
		}
		seen[p] = true
		g := &gridPoint{idx: make([]int, axes), along: t.Float(r, alongCol), across: math.NaN(), allowed: triText(t.String(r, ca))}
		for k := range idxCols {
			g.idx[k] = int(t.Float(r, idxCols[k]))
		}
		if acrossCol >= 0 {
			g.across = t.Float(r, acrossCol)
		}
		for _, s := range stats {
			v := t.Float(r, s.stat)
			if s.kind == Limit && s.errCol >= 0 {
				if e := t.Float(r, s.errCol); !math.IsNaN(e) {
					v -= s.z * math.Abs(e)
				}
			}
			var e tri
			switch {
			case s.name == ChiSquareName:
				v = math.Sqrt(v)
				e = triText(t.String(r, t.Column(ChiSquareAllowed)))
				if e != unknown {
					e = triOf(e == no)
				}
			default:
				e = triText(t.String(r, s.excluded))
			}
			g.s, g.ex = append(g.s, v), append(g.ex, e)
		}
		key := ""
		for k, i := range g.idx {
			if k != along {
				key += strconv.Itoa(i) + ","
			}
		}
		if _, ok := lines[key]; !ok {
			keys = append(keys, key)
		}
		lines[key] = append(lines[key], g)
	}
	// Lines in grid order (the keys hold the other axes' indices).
	sort.Slice(keys, func(a, b int) bool {
		ia, ib := lines[keys[a]][0].idx, lines[keys[b]][0].idx
		for k := range ia {
			if k != along && ia[k] != ib[k] {
				return ia[k] < ib[k]
			}
		}
		return false
	})
	if axes == 2 && across >= 0 {
		bd.stats = stats
		for _, key := range keys {
			bd.lines = append(bd.lines, lines[key])
		}
		// ExcludedAt counts lines in increasing across value.
		sort.SliceStable(bd.lines, func(a, b int) bool { return bd.lines[a][0].across < bd.lines[b][0].across })
	}
	for _, key := range keys {
		line := lines[key]
		sort.Slice(line, func(a, b int) bool { return line[a].idx[along] < line[b].idx[along] })
		for i := 0; i+1 < len(line); i++ {
			a, b := line[i], line[i+1]
			for k, s := range stats {
				if a.ex[k] == unknown || b.ex[k] == unknown || a.ex[k] == b.ex[k] {
					continue
				}
				c := crossing(line, i, k, s, along)
				bd.PerBound[s.name] = append(bd.PerBound[s.name], c)
			}
			if a.allowed == unknown || b.allowed == unknown || a.allowed == b.allowed {
				continue
			}
			// The deciding bound is the first one met walking from the
			// allowed point towards the excluded one.
			okEnd, exEnd := a, b
			if b.allowed == yes {
				okEnd, exEnd = b, a
			}
			var best *Crossing
			for k, s := range stats {
				if bd.Rule == ChiSquare && s.kind == Measurement || bd.Rule != ChiSquare && s.name == ChiSquareName {
					continue
				}
				if exEnd.ex[k] != yes || okEnd.ex[k] != no {
					continue
				}
				c := crossing(line, i, k, s, along)
				if best == nil || math.Abs(c.At-okEnd.along) < math.Abs(best.At-okEnd.along) {
					best = &c
				}
			}
			if best != nil {
				bd.Overall = append(bd.Overall, *best)
			}
		}
	}
	return bd, nil
}

// crossing interpolates statistic k between line[i] and line[i+1].
func crossing(line []*gridPoint, i, k int, s statistic, along int) Crossing {
	a, b := line[i], line[i+1]
	level := s.level
	if s.kind == Measurement {
		ex := a
		if b.ex[k] == yes {
			ex = b
		}
		if ex.s[k] < 0 {
			level = -level
		}
	}
	c := Crossing{Line: append([]int(nil), a.idx...), Across: a.across, Lo: a.along, Hi: b.along, Bound: s.name,
		AllowedBelow: a.ex[k] == no, InterpErr: math.NaN()}
	c.At = a.along + (level-a.s[k])*(b.along-a.along)/(b.s[k]-a.s[k])
	// The third point: the nearer neighbour outside the bracket.
	var third *gridPoint
	if i > 0 {
		third = line[i-1]
	}
	if i+2 < len(line) && (third == nil || math.Abs(line[i+2].along-c.At) < math.Abs(third.along-c.At)) {
		third = line[i+2]
	}
	if third != nil && !math.IsNaN(third.s[k]) {
		if q, ok := quadraticRoot(a.along, a.s[k], b.along, b.s[k], third.along, third.s[k], level, c.At); ok {
			c.InterpErr = math.Abs(q - c.At)
		}
	}
	return c
}

// quadraticRoot solves p(x) = level for the parabola through three points,
// taking the root nearest guess; ok is false when there is none.
func quadraticRoot(x0, y0, x1, y1, x2, y2, level, guess float64) (float64, bool) {
	// Newton's divided differences: p(x) = y0 + d1 (x - x0) + d2 (x - x0)(x - x1).
	d1 := (y1 - y0) / (x1 - x0)
	d2 := ((y2-y1)/(x2-x1) - d1) / (x2 - x0)
	// In u = x - x0: d2 u^2 + (d1 - d2 (x1 - x0)) u + (y0 - level) = 0.
	qa, qb, qc := d2, d1-d2*(x1-x0), y0-level
	if qa == 0 || math.Abs(qa*(x1-x0)) < 1e-14*math.Abs(qb) {
		if qb == 0 {
			return 0, false
		}
		return x0 - qc/qb, true
	}
	disc := qb*qb - 4*qa*qc
	if disc < 0 {
		return 0, false
	}
	// The cancellation-free pair of roots.
	q := -0.5 * (qb + math.Copysign(math.Sqrt(disc), qb))
	r1, r2 := x0+q/qa, x0+qc/q
	if math.Abs(r2-guess) < math.Abs(r1-guess) {
		r1 = r2
	}
	return r1, true
}

func triText(s string) tri {
	switch s {
	case "true":
		return yes
	case "false":
		return no
	}
	return unknown
}

// ExcludedAt interpolates the verdict between grid points of a 2-axis
// scan: i is a fractional index among the across axis's values in
// increasing order (interpolated linearly in it), along a value of the
// along axis (interpolated linearly in the
// value, as the crossings are). It returns the names that exclude there,
// in excluded_by's order, and whether every statistic needed is known.
// Outside the grid the nearest edge holds.
func (b *Boundaries) ExcludedAt(i, along float64) ([]string, bool) {
	if len(b.lines) == 0 {
		return nil, false
	}
	i = math.Max(0, math.Min(i, float64(len(b.lines)-1)))
	i0 := int(math.Floor(i))
	fi := i - float64(i0)
	i1 := min(i0+1, len(b.lines)-1)
	var names []string
	known := true
	chi := false
	for k, s := range b.stats {
		if b.Rule == ChiSquare && s.kind == Measurement || b.Rule != ChiSquare && s.name == ChiSquareName {
			continue
		}
		v := alongValue(b.lines[i0], k, along)
		if fi > 0 {
			v = (1-fi)*v + fi*alongValue(b.lines[i1], k, along)
		}
		if math.IsNaN(v) {
			known = false
			continue
		}
		excluded := v > s.level
		if s.kind == Measurement {
			excluded = math.Abs(v) > s.level
		}
		switch {
		case !excluded:
		case s.name == ChiSquareName:
			chi = true
		default:
			names = append(names, s.name)
		}
	}
	if chi {
		names = append([]string{ChiSquareName}, names...)
	}
	return names, known
}

// alongValue interpolates statistic k of a sorted line at an along value.
func alongValue(line []*gridPoint, k int, x float64) float64 {
	n := len(line)
	if n == 1 || x <= line[0].along {
		return line[0].s[k]
	}
	if x >= line[n-1].along {
		return line[n-1].s[k]
	}
	j := sort.Search(n, func(j int) bool { return line[j].along >= x }) - 1
	a, c := line[j], line[j+1]
	return a.s[k] + (x-a.along)*(c.s[k]-a.s[k])/(c.along-a.along)
}
