package kernels

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"gonum.org/v1/gonum/interp"

	"mgorbit/kernels/vec"
)

// Tabulated is a central correction read from a table of distance r and the
// fractional force delta(r) (or the fractional potential psi(r)):
//
//	a_r = -(mu/r^2) delta(r)            (column force_ratio)
//	Phi = -(mu/r) psi(r)                (column potential_ratio)
//
// so a user can study a model without writing Go. The file is CSV or
// Parquet (see ReadTable for the format). The table is interpolated in
// u = 1/r by a piecewise cubic fitted with gonum's interp: "spline" (the
// not-a-knot cubic spline, error O(h^4)), "monotone" (Fritsch-Butland: no
// overshoot between rows, for kinked or noisy tables) or "akima". In u the
// potential is the integral of the force fraction, dPhi/du = -mu delta(u),
// so for a force table it is integrated exactly, piece by piece, from the
// cubic's values and slopes at the rows; for a potential table the force is
// the exact derivative delta = psi + u dpsi/du of the interpolant. Force and
// potential therefore always agree (a_r = -dPhi/dr to rounding).
//
// Outside the table the kernel does what the outside parameter says:
//
//   - "refuse" (default): the force and potential are NaN, so a run that
//     leaves the table stops at the energy guard instead of extrapolating.
//     Domain reports the table's range; scenario validation should check the
//     orbit against it before the run (DomainError).
//   - "hold": the fractional force keeps its value at the nearer end of the
//     table (the force stays continuous; beyond r_max it is then a change of
//     Newton's constant, and the potential is zero at infinity).
//   - "newton": the correction is zero outside, allowed only when the
//     table's fractional force is zero at both ends (within 1e-6 of its
//     largest value), so the force does not jump.
//
// The same profile delta(r) applies about every massive source; mu is the
// Newtonian G M the fraction refers to. For a force table with outside =
// "refuse" or "newton" the potential is zero at r_max.
type Tabulated struct {
	path, interpolation, outside string
	tab                          *Table

	u, y, d []float64 // knots in u = 1/r (increasing), values, slopes dy/du
	cum     []float64 // force tables: Int_{u_0}^{u_k} delta du
	// fractional force and P = -Phi/mu at the ends u_0 (r_max) and u_n (r_min)
	deltaFar, deltaNear float64
	pFar, pNear         float64
}

// Outside policies.
const (
	OutsideRefuse = "refuse"
	OutsideHold   = "hold"
	OutsideNewton = "newton"
)

// tabulatedZeroEnd: with outside = "newton" the end values must be this
// small relative to the table's largest |delta|.
const tabulatedZeroEnd = 1e-6

func init() {
	Register(tabulatedInfo(), newTabulated)
}

func tabulatedInfo() Info {
	return Info{
		Name: "tabulated",
		Role: Correction,
		Summary: "correction read from a CSV or Parquet table of r and the fractional force a_corr/(-mu/r^2) " +
			"(or potential), interpolated by a cubic in 1/r",
		Mu: "the Newtonian G M the table's fractions refer to: a_r = -(mu/r^2)(1 + delta(r)) in total",
		Params: []Param{
			{Name: "file", Kind: Text, Unit: "path", Required: true,
				Doc: "CSV or Parquet table with columns r_m (or r_au) and force_ratio (or potential_ratio)"},
			{Name: "interpolation", Kind: Choice, Choices: []string{"spline", "monotone", "akima"}, DefaultChoice: "spline",
				Doc: "spline: not-a-knot cubic (O(h^4)); monotone: Fritsch-Butland (no overshoot); akima"},
			{Name: "outside", Kind: Choice, Choices: []string{OutsideRefuse, OutsideHold, OutsideNewton}, DefaultChoice: OutsideRefuse,
				Doc: "beyond the table: refuse (NaN, the run stops), hold (the end fraction continues), newton (zero; ends must be zero)"},
		},
	}
}

func newTabulated(v Values) (Kernel, error) {
	path := v.Str["file"]
	tab, err := ReadTable(path)
	if err != nil {
		return nil, fmt.Errorf("kernel tabulated: %w", err)
	}
	return NewTabulated(tab, path, v.Str["interpolation"], v.Str["outside"])
}

// NewTabulated builds the kernel from a table already read; path is only
// recorded. Empty interpolation and outside take the defaults.
func NewTabulated(tab *Table, path, interpolation, outside string) (*Tabulated, error) {
	if interpolation == "" {
		interpolation = "spline"
	}
	if outside == "" {
		outside = OutsideRefuse
	}
	t := &Tabulated{path: path, interpolation: interpolation, outside: outside, tab: tab}
	n := len(tab.R)
	t.u, t.y = make([]float64, n), make([]float64, n)
	for i := range n { // u = 1/r increases as r decreases
		t.u[n-1-i] = 1 / tab.R[i]
		t.y[n-1-i] = tab.Value[i]
	}
	for i := 1; i < n; i++ {
		if !(t.u[i] > t.u[i-1]) {
			return nil, fmt.Errorf("kernel tabulated: %s: rows %d and %d have r too close to tell apart in 1/r", tab.Source, n-i, n-i+1)
		}
	}
	var fit interface {
		Fit(xs, ys []float64) error
		PredictDerivative(x float64) float64
	}
	switch interpolation {
	case "spline":
		fit = &interp.NotAKnotCubic{}
	case "monotone":
		fit = &interp.FritschButland{}
	case "akima":
		fit = &interp.AkimaSpline{}
	default:
		return nil, fmt.Errorf("kernel tabulated: interpolation %q is not one of spline, monotone, akima", interpolation)
	}
	// Fit in w = u/u_max, in (0, 1]: in SI, u ~ 1e-11 m^-1 would give the
	// spline's equations entries of wildly different size, which gonum's
	// condition estimate rejects as singular.
	scale := t.u[n-1]
	w := make([]float64, n)
	for i, u := range t.u {
		w[i] = u / scale
	}
	if err := fit.Fit(w, t.y); err != nil {
		return nil, fmt.Errorf("kernel tabulated: %s: %s fit failed: %v", tab.Source, interpolation, err)
	}
	t.d = make([]float64, n)
	for i := range t.u {
		t.d[i] = fit.PredictDerivative(w[i]) / scale
		if math.IsNaN(t.d[i]) || math.IsInf(t.d[i], 0) {
			return nil, fmt.Errorf("kernel tabulated: %s: the %s fit has no finite slope at r = %g", tab.Source, interpolation, 1/t.u[i])
		}
	}

	last := n - 1
	if tab.Potential {
		t.deltaFar = t.y[0] + t.u[0]*t.d[0]
		t.deltaNear = t.y[last] + t.u[last]*t.d[last]
		t.pFar, t.pNear = t.u[0]*t.y[0], t.u[last]*t.y[last]
	} else {
		t.cum = make([]float64, n)
		for k := 0; k < last; k++ {
			h := t.u[k+1] - t.u[k]
			// Int of the cubic Hermite piece: h (y0 + y1)/2 + h^2 (d0 - d1)/12
			t.cum[k+1] = t.cum[k] + h*(t.y[k]+t.y[k+1])/2 + h*h*(t.d[k]-t.d[k+1])/12
		}
		t.deltaFar, t.deltaNear = t.y[0], t.y[last]
		if outside == OutsideHold {
			t.pFar = t.deltaFar * t.u[0] // the held fraction out to infinity: Phi(inf) = 0
		}
		t.pNear = t.pFar + t.cum[last]
	}

	switch outside {
	case OutsideRefuse, OutsideHold:
	case OutsideNewton:
		largest := 0.0
		for i := range t.u {
			largest = math.Max(largest, math.Abs(t.fractionAt(i)))
		}
		for _, end := range []struct {
			name  string
			delta float64
		}{{"r_max", t.deltaFar}, {"r_min", t.deltaNear}} {
			if math.Abs(end.delta) > tabulatedZeroEnd*largest {
				return nil, fmt.Errorf("kernel tabulated: %s: the fractional force at %s is %g, not zero: outside = %q would make the force jump there; "+
					"use outside = %q or extend the table to where the correction vanishes", tab.Source, end.name, end.delta, OutsideNewton, OutsideHold)
			}
		}
	default:
		return nil, fmt.Errorf("kernel tabulated: outside %q is not one of refuse, hold, newton", outside)
	}
	return t, nil
}

// fractionAt is the fractional force at knot i.
func (t *Tabulated) fractionAt(i int) float64 {
	if t.tab.Potential {
		return t.y[i] + t.u[i]*t.d[i]
	}
	return t.y[i]
}

// Info implements Kernel.
func (*Tabulated) Info() Info { return tabulatedInfo() }

// Values implements Kernel.
func (t *Tabulated) Values() Values {
	return Values{Num: map[string]float64{},
		Str: map[string]string{"file": t.path, "interpolation": t.interpolation, "outside": t.outside}}
}

// Table returns the table as read (shared: do not modify).
func (t *Tabulated) Table() *Table { return t.tab }

// Domain returns the distances where the kernel is defined: the table's
// range with outside = "refuse", else everywhere (0, +Inf).
func (t *Tabulated) Domain() (rmin, rmax float64) {
	if t.outside == OutsideRefuse {
		return t.tab.R[0], t.tab.R[len(t.tab.R)-1]
	}
	return 0, math.Inf(1)
}

// Fraction returns the fractional force delta and P = -Phi/mu at u = 1/r.
func (t *Tabulated) Fraction(u float64) (delta, p float64) {
	n := len(t.u)
	switch {
	case u < t.u[0]:
		return t.outsideAt(u, t.u[0], t.deltaFar, t.pFar)
	case u > t.u[n-1]:
		return t.outsideAt(u, t.u[n-1], t.deltaNear, t.pNear)
	}
	k := sort.SearchFloat64s(t.u, u) - 1 // u[k] < u <= u[k+1]
	if k < 0 {
		k = 0
	}
	if k > n-2 {
		k = n - 2
	}
	h := t.u[k+1] - t.u[k]
	s := (u - t.u[k]) / h
	y0, y1, d0, d1 := t.y[k], t.y[k+1], t.d[k]*h, t.d[k+1]*h
	s2 := s * s
	s3 := s2 * s
	val := (2*s3-3*s2+1)*y0 + (s3-2*s2+s)*d0 + (-2*s3+3*s2)*y1 + (s3-s2)*d1
	if t.tab.Potential {
		der := ((6*s2-6*s)*(y0-y1) + (3*s2-4*s+1)*d0 + (3*s2-2*s)*d1) / h
		return val + u*der, u * val
	}
	s4 := s2 * s2
	integral := h * ((s4/2-s3+s)*y0 + (s4/4-2*s3/3+s2/2)*d0 + (-s4/2+s3)*y1 + (s4/4-s3/3)*d1)
	return val, t.pFar + t.cum[k] + integral
}

func (t *Tabulated) outsideAt(u, uEnd, deltaEnd, pEnd float64) (delta, p float64) {
	switch t.outside {
	case OutsideHold:
		return deltaEnd, pEnd + deltaEnd*(u-uEnd)
	case OutsideNewton:
		return 0, pEnd
	}
	return math.NaN(), math.NaN()
}

// Radial implements Central.
func (t *Tabulated) Radial(mu, r float64) (ar, phi float64) {
	if r == 0 && t.outside != OutsideRefuse {
		return 0, 0 // no direction at the centre
	}
	u := 1 / r
	delta, p := t.Fraction(u)
	return -mu * u * u * delta, -mu * p
}

// Accel implements Kernel.
func (t *Tabulated) Accel(mu float64, x, _ vec.V) vec.V {
	r := x.Norm()
	if r == 0 && t.outside != OutsideRefuse {
		return vec.V{}
	}
	ar, _ := t.Radial(mu, r)
	return x.Scale(ar / r)
}

// Energy implements Kernel.
func (t *Tabulated) Energy(mu float64, x, _ vec.V) float64 {
	_, phi := t.Radial(mu, x.Norm())
	return phi
}

// Bounded is implemented by kernels defined only on a range of distances.
type Bounded interface {
	Domain() (rmin, rmax float64)
}

// DomainError reports the first term of the stack whose domain does not
// cover distances from rmin to rmax (an orbit's pericentre and apocentre,
// for instance), or nil.
func DomainError(s *Stack, rmin, rmax float64) error {
	terms := append([]Kernel{s.Base}, s.Corrections...)
	var bad []string
	for _, k := range terms {
		b, ok := k.(Bounded)
		if !ok {
			continue
		}
		lo, hi := b.Domain()
		if rmin < lo || rmax > hi {
			bad = append(bad, fmt.Sprintf("kernel %s is defined for r in [%g, %g] m, the orbit spans [%g, %g] m",
				k.Info().Name, lo, hi, rmin, rmax))
		}
	}
	if len(bad) == 0 {
		return nil
	}
	return fmt.Errorf("%s (extend the table, or set outside = %q)", strings.Join(bad, "; "), OutsideHold)
}
