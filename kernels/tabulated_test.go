package kernels

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go"
	"gonum.org/v1/gonum/diff/fd"

	"mgorbit/integrator/reference"
	"mgorbit/scenarios/units"
)

// tabWriteCSV writes a table file with the given header names and rows.
func tabWriteCSV(t *testing.T, rName, vName string, r, v []float64) string {
	t.Helper()
	var b strings.Builder
	fmt.Fprintf(&b, "# written by a test\n%s,%s\n", rName, vName)
	for i := range r {
		fmt.Fprintf(&b, "%s,%s\n", strconv.FormatFloat(r[i], 'g', -1, 64), strconv.FormatFloat(v[i], 'g', -1, 64))
	}
	path := filepath.Join(t.TempDir(), "table.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func tabNew(t *testing.T, path, interpolation, outside string) *Tabulated {
	t.Helper()
	str := map[string]string{"file": path}
	if interpolation != "" {
		str["interpolation"] = interpolation
	}
	if outside != "" {
		str["outside"] = outside
	}
	k, err := New("tabulated", Values{Str: str})
	if err != nil {
		t.Fatal(err)
	}
	return k.(*Tabulated)
}

// tabLogGrid is n distances log-spaced from lo to hi.
func tabLogGrid(lo, hi float64, n int) []float64 {
	r := make([]float64, n)
	for i := range r {
		r[i] = lo * math.Pow(hi/lo, float64(i)/float64(n-1))
	}
	r[n-1] = hi
	return r
}

// yukawaFractions are the Yukawa correction's fractional force and
// potential (PHYSICS.md kernel 2): delta = alpha (1 + r/lambda) e^(-r/lambda),
// psi = alpha e^(-r/lambda).
func yukawaFractions(alpha, lambda, r float64) (delta, psi float64) {
	e := alpha * math.Exp(-r/lambda)
	return e * (1 + r/lambda), e
}

// fourthDerivative is the five-point central difference for f””
// (A&S 25.3.24: [f(-2h) - 4 f(-h) + 6 f(0) - 4 f(h) + f(2h)]/h^4).
var fourthDerivative = fd.Formula{
	Stencil:    []fd.Point{{Loc: -2, Coeff: 1}, {Loc: -1, Coeff: -4}, {Loc: 0, Coeff: 6}, {Loc: 1, Coeff: -4}, {Loc: 2, Coeff: 1}},
	Derivative: 4,
	Step:       1e-2,
}

// A table sampled from the Yukawa law reproduces the Yukawa precession to
// the interpolation's accuracy. To first order the advance is
// (1/e) Int_0^2pi delta(r(f)) cos f df (Gauss's equation with
// R = -(mu/r^2) delta), so an interpolation error |d delta| <= eps on the
// orbit moves it by at most (4/e) eps: the bound checked, with eps the
// error measured on the orbit's range. The error itself must fall as h^4
// for the cubic spline's values (Hall & Meyer, J. Approx. Theory 16, 105
// (1976): |f - s| <= (5/384) h^4 max|f””| for the complete spline;
// memory), as h^3 for its derivative (the potential table's force, delta =
// psi + u dpsi/du), and lie below the Hall-Meyer estimate in the table's
// interior.
func TestTabulatedReproducesYukawa(t *testing.T) {
	const mu, a, e, alpha, lambda = 1.0, 1.0, 0.3, 1e-4, 1.0
	rp, ra := a*(1-e), a*(1+e)
	yk, err := New("yukawa", Values{Num: map[string]float64{"alpha": alpha, "lambda": lambda}})
	if err != nil {
		t.Fatal(err)
	}
	want, err := reference.FromApsides(mu, rp, ra, yk.(Central).Radial)
	if err != nil {
		t.Fatal(err)
	}
	for _, column := range []string{ColumnForceRatio, ColumnPotentialRatio} {
		var prevErr float64
		for _, n := range []int{21, 41, 81} {
			r := tabLogGrid(0.5, 2, n)
			v := make([]float64, n)
			for i, ri := range r {
				d, p := yukawaFractions(alpha, lambda, ri)
				v[i] = d
				if column == ColumnPotentialRatio {
					v[i] = p
				}
			}
			tab := tabNew(t, tabWriteCSV(t, ColumnRMetres, column, r, v), "spline", "")
			// interpolation error of the fractional force on the orbit
			var sup float64
			for i := 0; i <= 4000; i++ {
				ri := rp + (ra-rp)*float64(i)/4000
				got, _ := tab.Fraction(1 / ri)
				d, _ := yukawaFractions(alpha, lambda, ri)
				sup = math.Max(sup, math.Abs(got-d))
			}
			// Hall-Meyer estimate on the pieces covering the orbit, in u = 1/r
			var hMax, f4 float64
			for i := 1; i < n; i++ {
				if r[i] >= rp && r[i-1] <= ra {
					hMax = math.Max(hMax, 1/r[i-1]-1/r[i])
				}
			}
			for i := 0; i <= 200; i++ {
				u := 1/ra + (1/rp-1/ra)*float64(i)/200
				f4 = math.Max(f4, math.Abs(fd.Derivative(func(u float64) float64 {
					d, p := yukawaFractions(alpha, lambda, 1/u)
					if column == ColumnPotentialRatio {
						return p
					}
					return d
				}, u, &fd.Settings{Formula: fourthDerivative})))
			}
			hallMeyer := 5.0 / 384 * math.Pow(hMax, 4) * f4

			got, err := reference.FromApsides(mu, rp, ra, tab.Radial)
			if err != nil {
				t.Fatal(err)
			}
			diff := math.Abs(got.AdvancePerOrbit - want.AdvancePerOrbit)
			t.Logf("%s, %d rows: sup |d delta| on the orbit %.2e (Hall-Meyer estimate for the values %.2e); advance %.12e vs Yukawa %.12e: rel %.1e, bound (4/e) sup = %.1e rel",
				column, n, sup, hallMeyer, got.AdvancePerOrbit, want.AdvancePerOrbit, diff/want.AdvancePerOrbit,
				4/e*sup/math.Abs(want.AdvancePerOrbit))
			if diff > 4/e*sup*(1+10*alpha)+1e-12*math.Abs(want.AdvancePerOrbit) {
				t.Errorf("%s, %d rows: advance off the Yukawa one by %.2e, more than the first-order bound (4/e) %.2e", column, n, diff, sup)
			}
			if column == ColumnForceRatio && sup > hallMeyer {
				t.Errorf("%d rows: interpolation error %.2e above the Hall-Meyer estimate %.2e", n, sup, hallMeyer)
			}
			if prevErr != 0 {
				order := math.Log2(prevErr / sup)
				wantOrder := 4.0
				if column == ColumnPotentialRatio {
					wantOrder = 3 // the force is the spline's derivative
				}
				t.Logf("%s: error order %.2f between %d and %d rows (want %g)", column, order, (n+1)/2, n, wantOrder)
				if math.Abs(order-wantOrder) > 0.5 {
					t.Errorf("%s: interpolation error falls with order %.2f, want %g", column, order, wantOrder)
				}
			}
			prevErr = sup
		}
	}
}

// Force and potential agree, a_r = -dPhi/dr (finite differences of the
// kernel's potential), inside pieces and across rows, for both table kinds
// and every interpolation.
func TestTabulatedForceIsMinusSlope(t *testing.T) {
	r := tabLogGrid(1e10, 1e12, 15)
	for _, column := range []string{ColumnForceRatio, ColumnPotentialRatio} {
		v := make([]float64, len(r))
		for i, ri := range r {
			v[i] = 0.3 * math.Sin(math.Log(ri)) // any smooth profile
		}
		path := tabWriteCSV(t, ColumnRMetres, column, r, v)
		for _, method := range []string{"spline", "monotone", "akima"} {
			tab := tabNew(t, path, method, "")
			points := []float64{1.3e10, 2.2e11, 9.1e11}
			// At a row the potential is C2 for a force table (the integral
			// of a C1 cubic) and for the C2 spline, so a central difference
			// across the row still converges at its full order. A C1 fit of
			// a potential table has a jump of Phi'' there, which a central
			// difference turns into an O(step) error: check only that the
			// force is continuous across the row.
			if column == ColumnForceRatio || method == "spline" {
				points = append(points, r[5], r[11]*(1+1e-9))
			} else {
				for _, row := range []float64{r[5], r[11]} {
					below, _ := tab.Radial(units.GMSun, row*(1-1e-12))
					above, _ := tab.Radial(units.GMSun, row*(1+1e-12))
					if math.Abs(below-above) > 1e-9*math.Abs(below) {
						t.Errorf("%s %s: a_r jumps from %.12e to %.12e across the row at r = %g", column, method, below, above, row)
					}
				}
			}
			for _, ri := range points {
				ar, _ := tab.Radial(units.GMSun, ri)
				slope := ykwPotentialSlope(tab, units.GMSun, ri, 1e-1*ri) // step 1e-4 r
				if math.Abs(ar-slope) > 1e-8*math.Abs(units.GMSun/(ri*ri)*0.3) {
					t.Errorf("%s %s r = %g: a_r %.12e, -dPhi/dr %.12e", column, method, ri, ar, slope)
				}
			}
		}
	}
}

// The three outside policies at and beyond both ends of the table.
func TestTabulatedOutside(t *testing.T) {
	r := []float64{1, 2, 3, 4, 5, 6}
	v := []float64{0.5, 0.4, 0.3, 0.25, 0.2, 0.1}
	path := tabWriteCSV(t, ColumnRMetres, ColumnForceRatio, r, v)
	const mu = 2.0

	refuse := tabNew(t, path, "", "")
	if lo, hi := refuse.Domain(); lo != 1 || hi != 6 {
		t.Errorf("refuse: domain [%g, %g], want [1, 6]", lo, hi)
	}
	for _, x := range []float64{0.999, 6.001, 0} {
		if ar, phi := refuse.Radial(mu, x); !math.IsNaN(ar) || !math.IsNaN(phi) {
			t.Errorf("refuse at r = %g: %g, %g; want NaN", x, ar, phi)
		}
	}
	if ar, _ := refuse.Radial(mu, 6); math.Abs(ar/(-mu/36*0.1)-1) > 1e-15 {
		t.Errorf("refuse at the last row: a_r %g, want the row's %g", ar, -mu/36*0.1)
	}

	hold := tabNew(t, path, "", OutsideHold)
	if lo, hi := hold.Domain(); lo != 0 || !math.IsInf(hi, 1) {
		t.Errorf("hold: domain [%g, %g], want everywhere", lo, hi)
	}
	for _, end := range []struct{ r, delta float64 }{{1, 0.5}, {6, 0.1}} {
		in, pin := hold.Radial(mu, end.r)
		out, pout := hold.Radial(mu, end.r*(1+1e-12))
		if end.r == 1 {
			out, pout = hold.Radial(mu, end.r*(1-1e-12))
		}
		if math.Abs(out-in) > 1e-10*math.Abs(in) || math.Abs(pout-pin) > 1e-10*math.Abs(pin) {
			t.Errorf("hold at r = %g: force %g -> %g, potential %g -> %g across the end", end.r, in, out, pin, pout)
		}
		far := end.r * 3
		if end.r == 1 {
			far = end.r / 3
		}
		if ar, _ := hold.Radial(mu, far); math.Abs(ar/(-mu/(far*far)*end.delta)-1) > 1e-14 {
			t.Errorf("hold at r = %g: fraction %g, want the end's %g", far, ar/(-mu/(far*far)), end.delta)
		}
	}
	// beyond r_max the held fraction is a change of Newton's constant, and
	// the potential is zero at infinity: Phi = -mu 0.1/r out there
	if _, phi := hold.Radial(mu, 100); math.Abs(phi/(-mu*0.1/100)-1) > 1e-14 {
		t.Errorf("hold: Phi(100) = %g, want %g", phi, -mu*0.1/100)
	}

	if _, err := New("tabulated", Values{Str: map[string]string{"file": path, "outside": OutsideNewton}}); err == nil ||
		!strings.Contains(err.Error(), "not zero") {
		t.Errorf("newton outside with non-zero ends: %v", err)
	}
	zeroEnds := tabWriteCSV(t, ColumnRMetres, ColumnForceRatio, r, []float64{0, 0.4, 0.3, 0.25, 0.2, 0})
	nt := tabNew(t, zeroEnds, "", OutsideNewton)
	if ar, phi := nt.Radial(mu, 10); ar != 0 || phi != 0 {
		t.Errorf("newton beyond r_max: %g, %g; want 0, 0 (Phi is zero from r_max out)", ar, phi)
	}
	_, pin := nt.Radial(mu, 1)
	if ar, phi := nt.Radial(mu, 0.5); ar != 0 || phi != pin {
		t.Errorf("newton inside r_min: %g, %g; want 0 and the constant %g", ar, phi, pin)
	}
}

func TestTabulatedFileErrors(t *testing.T) {
	dir := t.TempDir()
	cases := []struct{ text, want string }{
		{"", "empty table"},
		{"r,force_ratio\n1,0\n2,0\n3,0\n4,0\n", "distance column"},
		{"r_m,delta\n1,0\n2,0\n3,0\n4,0\n", "value column"},
		{"r_m,force_ratio\n1,0\n2,0\n3,0\n", "at least 4"},
		{"r_m,force_ratio\n1,0\n3,0\n2,0\n4,0\n", "does not increase"},
		{"r_m,force_ratio\n1,0\n2,0\n2,0\n4,0\n", "does not increase"},
		{"r_m,force_ratio\n-1,0\n2,0\n3,0\n4,0\n", "positive"},
		{"r_m,force_ratio\n1,0\n2,NaN\n3,0\n4,0\n", "not finite"},
		{"r_m,force_ratio\n1,0\n2,x\n3,0\n4,0\n", "line 3"},
		{"r_m,force_ratio\n1,0,5\n2,0\n3,0\n4,0\n", "wrong number of fields"},
	}
	for i, c := range cases {
		path := filepath.Join(dir, fmt.Sprintf("t%d.csv", i))
		if err := os.WriteFile(path, []byte(c.text), 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := New("tabulated", Values{Str: map[string]string{"file": path}})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("table %q: error %v, want one containing %q", c.text, err, c.want)
		}
	}
	for _, c := range []struct {
		str  map[string]string
		want string
	}{
		{map[string]string{}, "file is required"},
		{map[string]string{"file": "  "}, "non-empty"},
		{map[string]string{"file": filepath.Join(dir, "missing.csv")}, "reading the table"},
		{map[string]string{"file": "x", "outside": "extrapolate"}, "not allowed"},
	} {
		if _, err := New("tabulated", Values{Str: c.str}); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("New(tabulated, %v): %v, want an error containing %q", c.str, err, c.want)
		}
	}
	if _, err := New("tabulated", Values{Num: map[string]float64{"file": 1}}); err == nil {
		t.Error("a number for the file parameter accepted")
	}
}

// A Parquet table (written with parquet-go, an extra column, r in au)
// gives the same kernel as the CSV of the same rows; its digest is kept.
func TestTabulatedParquet(t *testing.T) {
	type row struct {
		R     float64 `parquet:"r_au"`
		Note  string  `parquet:"note"`
		Ratio float32 `parquet:"potential_ratio"`
	}
	r := tabLogGrid(0.3, 3, 12)
	rows := make([]row, len(r))
	vals := make([]float64, len(r))
	for i, ri := range r {
		rows[i] = row{R: ri, Note: "x", Ratio: float32(1e-3 / (1 + ri*ri))}
		vals[i] = float64(rows[i].Ratio)
	}
	path := filepath.Join(t.TempDir(), "table.parquet")
	if err := parquet.WriteFile(path, rows); err != nil {
		t.Fatal(err)
	}
	pq := tabNew(t, path, "", "")
	rm := make([]float64, len(r))
	for i := range r {
		rm[i] = r[i] * units.AU
	}
	csvTab := tabNew(t, tabWriteCSV(t, ColumnRMetres, ColumnPotentialRatio, rm, vals), "", "")
	for _, x := range []float64{0.31, 1, 2.9} {
		a1, p1 := pq.Radial(units.GMSun, x*units.AU)
		a2, p2 := csvTab.Radial(units.GMSun, x*units.AU)
		if math.Abs(a1/a2-1) > 1e-12 || math.Abs(p1/p2-1) > 1e-12 {
			t.Errorf("r = %g au: Parquet (%g, %g), CSV (%g, %g)", x, a1, p1, a2, p2)
		}
	}
	if !pq.Table().Potential || len(pq.Table().SHA256) != 64 {
		t.Errorf("table: potential %v, digest %q", pq.Table().Potential, pq.Table().SHA256)
	}

	type badRow struct {
		R float64 `parquet:"r_m"`
		V float64 `parquet:"value"`
	}
	bad := filepath.Join(t.TempDir(), "bad.parquet")
	if err := parquet.WriteFile(bad, []badRow{{1, 0}, {2, 0}, {3, 0}, {4, 0}}); err != nil {
		t.Fatal(err)
	}
	if _, err := New("tabulated", Values{Str: map[string]string{"file": bad}}); err == nil || !strings.Contains(err.Error(), "no value column") {
		t.Errorf("Parquet without a value column: %v", err)
	}
}

// The sample table of testdata/tables holds the invented model its README
// and comment lines describe, and the spline between its rows follows it.
func TestTabulatedSampleTable(t *testing.T) {
	tab := tabNew(t, filepath.Join("..", "testdata", "tables", "soft-step.csv"), "", OutsideHold)
	model := func(r float64) float64 { // README: k = 1e-6, r_t = 10 au, w = 0.3
		return 1e-6 / 2 * (1 + math.Tanh(math.Log(r/(10*units.AU))/0.3))
	}
	tb := tab.Table()
	if len(tb.R) != 81 || tb.R[0] != units.AU || tb.R[80] != 100*units.AU {
		t.Fatalf("sample table: %d rows from %g to %g m, want 81 from 1 au to 100 au", len(tb.R), tb.R[0], tb.R[len(tb.R)-1])
	}
	for i, r := range tb.R {
		if math.Abs(tb.Value[i]-model(r)) > 1e-21 {
			t.Errorf("row %d: %g, model %g", i+1, tb.Value[i], model(r))
		}
	}
	var sup float64
	for i := 1; i < len(tb.R); i++ {
		mid := math.Sqrt(tb.R[i-1] * tb.R[i])
		d, _ := tab.Fraction(1 / mid)
		sup = math.Max(sup, math.Abs(d-model(mid)))
	}
	// the Hall-Meyer estimate (5/384) h^4 max|f''''| in u = 1/r, with the
	// largest spacing and fourth derivative over the table
	var hMax, f4 float64
	for i := 1; i < len(tb.R); i++ {
		h := 1/tb.R[i-1] - 1/tb.R[i]
		hMax = math.Max(hMax, h)
		for j := range 8 {
			u := 1/tb.R[i] + h*float64(j)/8
			st := fourthDerivative
			st.Step = h / 4
			f4 = math.Max(f4, math.Abs(fd.Derivative(func(u float64) float64 { return model(1 / u) }, u, &fd.Settings{Formula: st})))
		}
	}
	hallMeyer := 5.0 / 384 * math.Pow(hMax, 4) * f4
	t.Logf("sample table: largest interpolation error between rows %.2e (of k = 1e-6), Hall-Meyer estimate %.2e", sup, hallMeyer)
	if sup > hallMeyer {
		t.Errorf("interpolation error %.2e between rows above the Hall-Meyer estimate %.2e", sup, hallMeyer)
	}
	if d, _ := tab.Fraction(1 / (1e3 * units.AU)); math.Abs(d/1e-6-1) > 1e-6 {
		t.Errorf("held far-field fraction %g, want k = 1e-6", d)
	}
}

func TestTabulatedDomainError(t *testing.T) {
	r := []float64{1, 2, 3, 4, 5}
	tab := tabNew(t, tabWriteCSV(t, ColumnRMetres, ColumnForceRatio, r, []float64{1, 2, 3, 4, 5}), "", "")
	st := MustStack(Newton{}, tab)
	if err := DomainError(st, 1.5, 4.5); err != nil {
		t.Errorf("orbit inside the table: %v", err)
	}
	if err := DomainError(st, 0.5, 4.5); err == nil || !strings.Contains(err.Error(), "tabulated") {
		t.Errorf("orbit below the table: %v", err)
	}
	if err := DomainError(MustStack(Newton{}), 0.1, 1e9); err != nil {
		t.Errorf("no bounded terms: %v", err)
	}
}
