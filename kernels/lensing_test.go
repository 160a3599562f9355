package kernels

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/diff/fd"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// Every kernel's metric split is self-consistent: the derivatives are those
// of the potentials (gonum finite differences, A&S 25.3.6 five-point rule),
// Light is Phi + Psi, Phi is the orbits' potential, and the split follows
// what the kernel exchanges (PHYSICS.md, light deflection): Psi = Phi for
// general relativity and tensor terms, Psi = -Phi for scalars, total
// Psi = total Phi/2 for massive spin-2 fields.
func TestMetricSplitConsistent(t *testing.T) {
	mk := func(name string, num map[string]float64, str map[string]string) Kernel {
		k, err := New(name, Values{Num: num, Str: str})
		if err != nil {
			t.Fatal(err)
		}
		return k
	}
	const mu, scale = units.GMSun, 1e11
	cases := []struct {
		k     Kernel
		split string
	}{
		{Newton{}, "gr"}, {GR1PN{}, "gr"}, {EIH{}, "gr"},
		{mk("yukawa", map[string]float64{"alpha": 0.4, "lambda": scale}, nil), "scalar"},
		{mk("yukawa", map[string]float64{"alpha": 0.4, "lambda": scale}, map[string]string{"exchange": "tensor"}), "tensor"},
		{mk("massive-graviton", map[string]float64{"lambda": scale}, nil), "massive-replacing"},
		{mk("massive-graviton", map[string]float64{"lambda": scale}, map[string]string{"normalisation": "static"}), "massive-replacing"},
		{mk("crossover", map[string]float64{"r_c": scale}, map[string]string{"modes": "spin2"}), "massive-replacing"},
		{mk("crossover", map[string]float64{"r_c": scale}, nil), "scalar"},
		{mk("tower", map[string]float64{"sites": 6, "circumference": scale}, map[string]string{"modes": "spin2"}), "massive-added"},
		{mk("tower", map[string]float64{"sites": 6, "circumference": scale}, nil), "scalar"},
		{mk("vainshtein", map[string]float64{"r_v": scale}, nil), "scalar"},
	}
	for _, c := range cases {
		l := c.k.(Lensing)
		name := c.k.Info().Name + " (" + l.Carrier() + ")"
		for _, r := range []float64{0.05 * scale, 0.7 * scale, 3 * scale} {
			m := l.Metric(mu, r)
			h := &fd.Settings{Formula: fivePoint, Step: 1e-3 * r}
			dphi := fd.Derivative(func(x float64) float64 { return l.Metric(mu, x).Phi }, r, h)
			dpsi := fd.Derivative(func(x float64) float64 { return l.Metric(mu, x).Psi }, r, h)
			dlight := fd.Derivative(func(x float64) float64 { return l.Metric(mu, x).Light }, r, h)
			n := mu / (r * r) // Newton's slope: the scale of every term
			for _, d := range []struct {
				what      string
				got, want float64
			}{{"dPhi/dr", m.DPhiDr, dphi}, {"dPsi/dr", m.DPsiDr, dpsi}, {"dLight/dr", m.DLightDr, dlight}} {
				if math.Abs(d.got-d.want) > 1e-9*n {
					t.Errorf("%s, r = %g: %s %.12g, finite difference %.12g", name, r, d.what, d.got, d.want)
				}
			}
			if math.Abs(m.Light-(m.Phi+m.Psi)) > 1e-14*mu/r {
				t.Errorf("%s, r = %g: Light %.16g, Phi + Psi %.16g", name, r, m.Light, m.Phi+m.Psi)
			}
			if cc, ok := c.k.(Central); ok {
				if _, phi := cc.Radial(mu, r); phi != m.Phi {
					t.Errorf("%s, r = %g: Phi %.16g is not the orbits' potential %.16g", name, r, m.Phi, phi)
				}
			}
			nPhi := -mu / r
			var psiWant float64
			switch c.split {
			case "gr":
				psiWant = nPhi
			case "tensor":
				psiWant = m.Phi
			case "scalar":
				psiWant = -m.Phi
			case "massive-added":
				psiWant = m.Phi / 2
			case "massive-replacing":
				psiWant = (nPhi+m.Phi)/2 - nPhi
			}
			if math.Abs(m.Psi-psiWant) > 1e-15*mu/r {
				t.Errorf("%s, r = %g: Psi %.16g, the %s split gives %.16g", name, r, m.Psi, c.split, psiWant)
			}
		}
	}
}

// The stack refuses a light computation naming the terms without a split.
func TestStackLensingReady(t *testing.T) {
	st := MustStack(GR1PN{}, noSplit{})
	if err := st.LensingReady(); err == nil {
		t.Error("a correction without a metric split passed LensingReady")
	}
	if _, _, err := st.Metric(1, 1); err == nil {
		t.Error("Metric accepted a correction without a split")
	}
	if err := MustStack(Newton{}).LensingReady(); err != nil {
		t.Errorf("newton: %v", err)
	}
}

// noSplit is a correction that does not declare a split.
type noSplit struct{}

func (noSplit) Info() Info                           { return Info{Name: "no-split", Role: Correction} }
func (noSplit) Values() Values                       { return Values{} }
func (noSplit) Accel(float64, vec.V, vec.V) vec.V    { return vec.V{} }
func (noSplit) Energy(float64, vec.V, vec.V) float64 { return 0 }
