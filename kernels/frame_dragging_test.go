package kernels

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

func ltNew(t *testing.T, num map[string]float64) *LenseThirring {
	t.Helper()
	k, err := New("lense-thirring", Values{Num: num})
	if err != nil {
		t.Fatal(err)
	}
	return k.(*LenseThirring)
}

// The acceleration against the IERS Conventions (2010) form, eq. 10.12 at
// gamma = 1 (memory): (2 G/(c^2 r^3)) [(3/r^2) (r x v)(r.J) + v x J], with a
// tilted axis; and it does no work (a.v = 0), so Energy adds nothing.
func TestLenseThirringFormula(t *testing.T) {
	const c2 = units.C * units.C
	gj := 3.9e23 // about Earth's G J (J ~ 5.86e33 kg m^2/s; memory)
	k := ltNew(t, map[string]float64{"angular_momentum": gj, "axis_tilt": 0.4, "axis_azimuth": 1.3})
	s := spinAxis(0.4, 1.3)
	j := s.Scale(gj)
	for _, c := range []struct{ x, v vec.V }{
		{vec.V{1.2e7, 0, 0}, vec.V{0, 5.7e3, 0}},
		{vec.V{3e6, -5e6, 4e6}, vec.V{2e3, 4e3, -6e3}},
	} {
		r := c.x.Norm()
		want := c.x.Cross(c.v).Scale(3 * c.x.Dot(j) / (r * r)).Add(c.v.Cross(j)).Scale(2 / (c2 * r * r * r))
		got := k.Accel(3.986004e14, c.x, c.v)
		if d := got.Sub(want).Norm() / want.Norm(); d > 1e-15 {
			t.Errorf("x=%v: %v, IERS form %v (rel %.1e)", c.x, got, want, d)
		}
		if w := got.Dot(c.v) / (got.Norm() * c.v.Norm()); math.Abs(w) > 1e-15 {
			t.Errorf("x=%v: a.v/(|a||v|) = %.2e, want 0 (no work)", c.x, w)
		}
		if e := k.Energy(3.986004e14, c.x, c.v); e != 0 {
			t.Errorf("energy term %g, want 0", e)
		}
	}
	if a := k.Accel(1, vec.V{}, vec.V{1, 0, 0}); a != (vec.V{}) {
		t.Errorf("at the centre %v, want zero", a)
	}
}

// spin chi and angular_momentum J describe the same body when
// G J = chi (G M)^2 / c (chi = c J/(G M^2)); a J in kg m^2/s parses to G J.
func TestLenseThirringSpinForms(t *testing.T) {
	mu := units.GMSun
	chi := 0.3
	bySpin := ltNew(t, map[string]float64{"spin": chi})
	gj, err := units.ParseAs("1 kg*m^2/s", SpinAngularMomentum)
	if err != nil {
		t.Fatal(err)
	}
	if gj != units.G {
		t.Errorf("1 kg*m^2/s = %g m^5 s^-3, want G = %g (masses are held as G M)", gj, units.G)
	}
	// J = chi G M^2 / c in kg m^2/s, written out and parsed
	mass := mu / units.G
	jSI := chi * units.G * mass * mass / units.C
	parsed, err := units.ParseAs(strconv.FormatFloat(jSI, 'g', -1, 64)+" kg*m^2/s", SpinAngularMomentum)
	if err != nil {
		t.Fatal(err)
	}
	byJ := ltNew(t, map[string]float64{"angular_momentum": parsed})
	if r := bySpin.GJ(mu) / byJ.GJ(mu); math.Abs(r-1) > 1e-14 {
		t.Errorf("G J from spin %g, from J %g", bySpin.GJ(mu), byJ.GJ(mu))
	}
	x, v := vec.V{1e9, 2e8, -3e8}, vec.V{-1e4, 8e4, 2e4}
	a1, a2 := bySpin.Accel(mu, x, v), byJ.Accel(mu, x, v)
	if d := a1.Sub(a2).Norm() / a1.Norm(); d > 1e-14 {
		t.Errorf("accelerations differ by %.1e", d)
	}
	// spin follows each source's mu: half the mass, a quarter of G J
	if r := bySpin.GJ(mu/2) / bySpin.GJ(mu); math.Abs(r-0.25) > 1e-15 {
		t.Errorf("G J(mu/2)/G J(mu) = %g, want 1/4", r)
	}
	if v := bySpin.Values(); v.Num["spin"] != chi {
		t.Errorf("Values %v, want spin %g", v.Num, chi)
	}
}

func TestLenseThirringParameters(t *testing.T) {
	for _, c := range []struct {
		num  map[string]float64
		want string
	}{
		{map[string]float64{}, "spin is missing"},
		{map[string]float64{"spin": 1, "angular_momentum": 1}, "not both"},
		{map[string]float64{"spin": -1}, "out of range"},
	} {
		if _, err := New("lense-thirring", Values{Num: c.num}); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("New(lense-thirring, %v): %v, want an error containing %q", c.num, err, c.want)
		}
	}
	k := ltNew(t, map[string]float64{"spin": 0.5})
	if info := k.Info(); !info.VelocityDependent || info.Role != Correction {
		t.Errorf("lense-thirring must be a velocity-dependent correction: %+v", info)
	}
}
