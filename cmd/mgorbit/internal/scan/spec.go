package scan

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"strconv"
	"strings"

	"mgorbit/cmd/mgorbit/internal/report"
	"mgorbit/scenarios"
	"mgorbit/scenarios/units"
)

// Method says what each point computes.
type Method string

const (
	// Integrate runs the full study (integrations, error estimates,
	// anomaly, and the study's own semi-analytic reference).
	Integrate Method = "integrate"
	// SemiAnalytic computes only the semi-analytic reference: fast, for
	// dense curves.
	SemiAnalytic Method = "semi-analytic"
	// Both integrates and reports the integrated-minus-semi-analytic
	// differences, relative and in units of the error estimate.
	Both Method = "both"
)

// ParseMethod reads a method name ("semi" for short).
func ParseMethod(s string) (Method, error) {
	switch s {
	case "integrate":
		return Integrate, nil
	case "semi", "semi-analytic":
		return SemiAnalytic, nil
	case "both":
		return Both, nil
	}
	return "", fmt.Errorf("unknown method %q (integrate, semi-analytic or both)", s)
}

// Shard is part K of N of a scan (K from 1): the points with index i where
// i mod N = K - 1, so every shard gets a share of every region of the grid.
type Shard struct{ K, N int }

// Whole is the scan unsplit.
var Whole = Shard{1, 1}

// ParseShard reads "K/N".
func ParseShard(s string) (Shard, error) {
	a, b, ok := strings.Cut(s, "/")
	k, err1 := strconv.Atoi(strings.TrimSpace(a))
	n, err2 := strconv.Atoi(strings.TrimSpace(b))
	if !ok || err1 != nil || err2 != nil {
		return Shard{}, fmt.Errorf("shard %q: expected K/N, e.g. 1/4 for the first of four", s)
	}
	sh := Shard{k, n}
	return sh, sh.check()
}

func (s Shard) check() error {
	if s.N < 1 || s.K < 1 || s.K > s.N {
		return fmt.Errorf("shard %d/%d: need 1 <= K <= N", s.K, s.N)
	}
	return nil
}

// Has reports whether the point belongs to the shard.
func (s Shard) Has(point int) bool { return point%s.N == s.K-1 }

func (s Shard) String() string { return fmt.Sprintf("%d/%d", s.K, s.N) }

// Spec is a whole scan: the scenario, the axes and the method.
type Spec struct {
	Base   *scenarios.Scenario
	Axes   []Axis
	Method Method
	// KeepGoing turns a tolerance breach into a warning and a failed point
	// into rows with point_error set, instead of stopping the scan.
	KeepGoing bool

	tmpl   *template
	layout *layout
}

// InputError marks a problem with what the user asked for (sweeps, paths,
// values the scenario rejects), as opposed to a failure while computing.
type InputError struct{ Err error }

func (e InputError) Error() string { return e.Err.Error() }
func (e InputError) Unwrap() error { return e.Err }

// NewSpec checks the axes against the scenario: each path must resolve,
// and the scenario with the first value of every axis must load.
func NewSpec(base *scenarios.Scenario, axes []Axis, method Method, keepGoing bool) (*Spec, error) {
	if len(axes) == 0 {
		return nil, InputError{fmt.Errorf("nothing to scan: give at least one --sweep")}
	}
	seen := map[string]bool{}
	for _, ax := range axes {
		if seen[ax.Path] {
			return nil, InputError{fmt.Errorf("%s is swept twice", ax.Path)}
		}
		seen[ax.Path] = true
	}
	doc, err := decodeDocument(base.Text)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", base.Source, err)
	}
	tmpl, err := newTemplate(doc, axes)
	if err != nil {
		return nil, InputError{err}
	}
	l, err := newLayout(axes)
	if err != nil {
		return nil, InputError{err}
	}
	s := &Spec{Base: base, Axes: axes, Method: method, KeepGoing: keepGoing, tmpl: tmpl, layout: l}
	if _, err := s.Scenario(0); err != nil {
		return nil, InputError{err}
	}
	return s, nil
}

// Points is the number of grid points.
func (s *Spec) Points() int {
	n := 1
	for _, ax := range s.Axes {
		n *= len(ax.Values)
	}
	return n
}

// Indices returns each axis's value index at a point; the last axis runs
// fastest, so point order is the grid in reading order.
func (s *Spec) Indices(point int) []int {
	idx := make([]int, len(s.Axes))
	for k := len(s.Axes) - 1; k >= 0; k-- {
		n := len(s.Axes[k].Values)
		idx[k] = point % n
		point /= n
	}
	return idx
}

// Scenario builds and checks one point's scenario.
func (s *Spec) Scenario(point int) (*scenarios.Scenario, error) {
	return pointScenario(s.Base.Source, s.tmpl, s.Axes, s.Indices(point), point)
}

// Hash identifies the scan's content: the scenario text, the grids and the
// method, but not the worker count or the shard. Checkpoints and part files
// of different scans never mix.
func (s *Spec) Hash() string {
	type axis struct {
		Path, Kind, Spec string
		Values           []string
	}
	v := struct {
		Version, Scenario string
		Method            Method
		Axes              []axis
	}{Version: report.Version, Scenario: s.Base.Hash, Method: s.Method}
	for _, ax := range s.Axes {
		a := axis{Path: ax.Path, Kind: ax.Kind, Spec: ax.Spec}
		for _, val := range ax.Values {
			a.Values = append(a.Values, val.Text)
		}
		v.Axes = append(v.Axes, a)
	}
	b, _ := json.Marshal(v)
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:])
}

// Metadata keys that differ between equivalent runs.
const (
	MetaWorkers = "mgorbit.scan.workers"
	MetaShard   = "mgorbit.scan.shard"
	MetaHash    = "mgorbit.scan.spec_sha256"
)

// Metadata is what a scan table records about how it was made.
func (s *Spec) Metadata(workers int, shard Shard) map[string]string {
	sc := s.Base
	m := map[string]string{
		"mgorbit.version":         report.Version,
		"mgorbit.scenario.name":   sc.Name,
		"mgorbit.scenario.source": sc.Source,
		"mgorbit.scenario.sha256": sc.Hash,
		"mgorbit.scenario.toml":   sc.Text,
		"mgorbit.kernel_stack":    sc.Stack.String(),
		"mgorbit.integrator":      sc.Integrator.Method,
		"mgorbit.constants": fmt.Sprintf("au=%v m; GM_sun=%v m^3/s^2 (IAU 2015 B3); c=%v m/s; G=%v (CODATA 2018)",
			units.AU, units.GMSun, units.C, units.G),
		MetaHash:                  s.Hash(),
		"mgorbit.scan.method":     string(s.Method),
		"mgorbit.scan.points":     strconv.Itoa(s.Points()),
		"mgorbit.scan.axes":       strconv.Itoa(len(s.Axes)),
		"mgorbit.scan.keep_going": strconv.FormatBool(s.KeepGoing),
		MetaWorkers:               strconv.Itoa(workers),
		MetaShard:                 shard.String(),
	}
	for k, ax := range s.Axes {
		p := fmt.Sprintf("mgorbit.scan.axis.%d.", k)
		m[p+"path"] = ax.Path
		m[p+"kind"] = ax.Kind
		m[p+"spec"] = ax.Spec
		m[p+"count"] = strconv.Itoa(len(ax.Values))
		m[p+"unit"] = ax.Unit
		m[p+"dimension"] = ax.Dim.String()
		if !ax.Numeric {
			m[p+"dimension"] = "words"
		}
		m[p+"column_index"] = ax.IndexColumn()
		m[p+"column_text"] = ax.TextColumn()
		m[p+"column_si"] = ax.SIColumn()
		m[p+"column_unit"] = ax.UnitColumn()
		m[p+"column_plot"] = ax.PlotColumn()
	}
	return m
}
