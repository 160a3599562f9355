package reference

import (
	"math"
	"testing"

	"mgorbit/kernels/vec"
)

// yukawa is the Yukawa correction beyond Newton (PHYSICS.md, kernel 2):
// dPhi = -(mu/r) alpha e^(-r/lambda), a_r = -(mu/r^2) alpha (1 + r/lambda) e^(-r/lambda).
func yukawa(alpha, lambda float64) Correction {
	return func(mu, r float64) (ar, phi float64) {
		x := r / lambda
		k := alpha * math.Exp(-x)
		return -(mu / (r * r)) * k * (1 + x), -(mu / r) * k
	}
}

// goldsteinYukawa is the near-circular Yukawa advance per orbit
// 2 pi [(1 - eps)^(-1/2) - 1], eps = alpha u^2 e^-u / (1 + alpha (1+u) e^-u),
// u = r/lambda (PHYSICS.md; Goldstein, Classical Mechanics, stability of
// circular orbits), written without cancelling against 1.
func goldsteinYukawa(alpha, lambda, r float64) (advance, eps float64) {
	u := r / lambda
	eps = alpha * u * u * math.Exp(-u) / (1 + alpha*(1+u)*math.Exp(-u))
	s := math.Sqrt(1 - eps)
	return 2 * math.Pi * eps / (s * (1 + s)), eps
}

// stateAt is the Kepler-ellipse state at true anomaly f (pericentre on +x).
func stateAt(mu, a, e, f float64) (vec.V, vec.V) {
	p := a * (1 - e*e)
	r := p / (1 + e*math.Cos(f))
	vk := math.Sqrt(mu / p)
	c, s := math.Cos(f), math.Sin(f)
	x := vec.V{r * c, r * s, 0}
	v := vec.V{vk*e*s*c - vk*(1+e*c)*s, vk*e*s*s + vk*(1+e*c)*c, 0}
	return x, v
}

func TestNewtonIsKepler(t *testing.T) {
	mu := 3.986004418e14 // any mu: Earth's GM (memory)
	for _, e := range []float64{0.3, 0.9} {
		a := 7e6
		ex, err := FromApsides(mu, a*(1-e), a*(1+e), nil)
		if err != nil {
			t.Fatal(err)
		}
		// Newton's orbits close (Bertrand): no advance at all.
		if ex.AdvancePerOrbit != 0 {
			t.Errorf("e=%g: Newtonian advance %g, want 0", e, ex.AdvancePerOrbit)
		}
		// Kepler's third law.
		want := 2 * math.Pi * math.Sqrt(a*a*a/mu)
		if rel := math.Abs(ex.RadialPeriod/want - 1); rel > 1e-14 {
			t.Errorf("e=%g: radial period off Kepler's law by %.1e", e, rel)
		}
		// Vis-viva: E = -mu/(2a), h^2 = mu a (1 - e^2).
		if rel := math.Abs(ex.Energy/(-mu/(2*a)) - 1); rel > 1e-14 {
			t.Errorf("e=%g: energy off vis-viva by %.1e", e, rel)
		}
		if rel := math.Abs(ex.AngMom/math.Sqrt(mu*a*(1-e*e)) - 1); rel > 1e-14 {
			t.Errorf("e=%g: angular momentum off by %.1e", e, rel)
		}

		// From a state part way round the ellipse, the roots are the apsides
		// a(1 -+ e) of the conic.
		x, v := stateAt(mu, a, e, 2.0)
		st, err := FromState(mu, x, v, nil)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(st.RMin/(a*(1-e))-1) > 1e-13 || math.Abs(st.RMax/(a*(1+e))-1) > 1e-13 {
			t.Errorf("e=%g: apsides from state %.15g %.15g, want %.15g %.15g", e, st.RMin, st.RMax, a*(1-e), a*(1+e))
		}
	}
}

// An inverse-square potential dPhi = -k/r^2 keeps the orbit exactly
// solvable (Goldstein, Classical Mechanics, the 1/r^2 correction problem):
// with u = 1/r and D(u) = dPhi(1/u) = -k u^2 the orbit equation
// d2u/dphi2 + u = (mu - dD/du)/h^2 becomes d2u/dphi2 + u (1 - 2k/h^2) = mu/h^2,
// so u = mu/(h^2 - 2k) + A cos(phi sqrt(1 - 2k/h^2)):
// apsidal angle pi/sqrt(1 - 2k/h^2) exactly. Its radial motion is Kepler's
// with h^2 -> h^2 - 2k (the effective potential is -mu/r + (h^2 - 2k)/(2r^2)),
// so P_r = 2 pi sqrt(a^3/mu), a = -mu/(2E) = (rmin + rmax)/2.
func TestInverseSquarePotential(t *testing.T) {
	mu := 1.0
	for _, k := range []float64{1e-10, 1e-4, 0.05} {
		corr := func(mu, r float64) (float64, float64) { return -2 * k / (r * r * r), -k / (r * r) }
		x, v := vec.V{1, 0, 0}, vec.V{0.3, 0.9, 0}
		ex, err := FromState(mu, x, v, corr)
		if err != nil {
			t.Fatal(err)
		}
		h := x.Cross(v).Norm()
		s := math.Sqrt(1 - 2*k/(h*h))
		want := 2 * math.Pi * (2 * k / (h * h)) / (s * (1 + s)) // 2 pi/s - 2 pi, no cancellation
		if rel := math.Abs(ex.AdvancePerOrbit/want - 1); rel > 1e-10 {
			t.Errorf("k=%g: advance %.15e, closed form %.15e (rel %.1e)", k, ex.AdvancePerOrbit, want, rel)
		}
		energy := v.Dot(v)/2 - mu/x.Norm() - k/x.Dot(x)
		a := -mu / (2 * energy)
		wantP := 2 * math.Pi * math.Sqrt(a*a*a/mu)
		if rel := math.Abs(ex.RadialPeriod/wantP - 1); rel > 1e-12 {
			t.Errorf("k=%g: radial period %.15e, Kepler %.15e (rel %.1e)", k, ex.RadialPeriod, wantP, rel)
		}
		t.Logf("k=%g: e=%.4f advance %.6e rad, rel err %.1e, P_r rel err %.1e (%d nodes, tol %.1e)", k, ex.Eccentricity,
			ex.AdvancePerOrbit, ex.AdvancePerOrbit/want-1, ex.RadialPeriod/wantP-1, ex.Nodes, ex.Tolerance)
	}
}

func TestYukawaNearCircular(t *testing.T) {
	mu, r0 := 1.0, 1.0
	for _, lambda := range []float64{0.5, 1, 3} {
		for _, alpha := range []float64{1e-9, 1e-3, 0.1} {
			want, eps := goldsteinYukawa(alpha, lambda, r0)

			// The limit itself (rmin = rmax): the formula up to the
			// five-point derivative of r^2 a_r (~1e-12).
			c, err := FromApsides(mu, r0, r0, yukawa(alpha, lambda))
			if err != nil {
				t.Fatal(err)
			}
			if c.Path != PathNearCircular {
				t.Errorf("circular orbit took path %q", c.Path)
			}
			if rel := math.Abs(c.AdvancePerOrbit/want - 1); rel > 1e-10 {
				t.Errorf("lambda=%g alpha=%g circular: advance %.12e, Goldstein %.12e (rel %.1e)", lambda, alpha, c.AdvancePerOrbit, want, rel)
			}
			// Circular Yukawa periods (PHYSICS.md, Observables):
			// P_phi/P_K = (1 + A)^(-1/2), A = alpha (1+u) e^-u; P_r = P_phi/sqrt(1 - eps).
			u := r0 / lambda
			pk := 2 * math.Pi * math.Sqrt(r0*r0*r0/mu)
			pphi := pk / math.Sqrt(1+alpha*(1+u)*math.Exp(-u))
			t.Logf("lambda=%g alpha=%g circular: rel err advance %.1e, P_phi %.1e, P_r %.1e", lambda, alpha,
				c.AdvancePerOrbit/want-1, c.AzimuthalPeriod/pphi-1, c.RadialPeriod/(pphi/math.Sqrt(1-eps))-1)
			if rel := math.Abs(c.AzimuthalPeriod/pphi - 1); rel > 1e-14 {
				t.Errorf("lambda=%g alpha=%g: P_phi off by %.1e", lambda, alpha, rel)
			}
			if rel := math.Abs(c.RadialPeriod/(pphi/math.Sqrt(1-eps)) - 1); rel > 1e-12 {
				t.Errorf("lambda=%g alpha=%g: P_r off by %.1e", lambda, alpha, rel)
			}

			// The same from a state at the circular speed sqrt(r F):
			// near-double roots, so the limit path.
			ar, _ := yukawa(alpha, lambda)(mu, r0)
			st, err := FromState(mu, vec.V{0, r0, 0}, vec.V{-math.Sqrt(r0 * (mu/(r0*r0) - ar)), 0, 0}, yukawa(alpha, lambda))
			if err != nil {
				t.Fatal(err)
			}
			if rel := math.Abs(st.AdvancePerOrbit/want - 1); st.Path != PathNearCircular || rel > 1e-10 {
				t.Errorf("lambda=%g alpha=%g circular state: path %s, advance %.12e, Goldstein %.12e (rel %.1e)",
					lambda, alpha, st.Path, st.AdvancePerOrbit, want, rel)
			}

			// The exact quadrature at small e approaches the same limit with
			// an O(e^2) relative error; tolerance 3(e^2 + eps) per the
			// Goldstein expansion (common practice: a margin of 3 on the
			// leading neglected term).
			var prevRel float64
			for _, e := range []float64{0.02, 0.01} {
				ex, err := FromApsides(mu, r0*(1-e), r0*(1+e), yukawa(alpha, lambda))
				if err != nil {
					t.Fatal(err)
				}
				rel := math.Abs(ex.AdvancePerOrbit/want - 1)
				if rel > 3*(e*e+eps) {
					t.Errorf("lambda=%g alpha=%g e=%g: exact %.10e, Goldstein %.10e (rel %.1e)", lambda, alpha, e, ex.AdvancePerOrbit, want, rel)
				}
				if prevRel != 0 {
					t.Logf("lambda=%g alpha=%g: rel diff %.3e at e=%g, ratio to e=0.02: %.3f (e^2 scaling: 0.25)", lambda, alpha, rel, e, rel/prevRel)
				}
				prevRel = rel
			}
		}
	}
}

// yukawaPerturbation is the Yukawa correction as an acceleration vector.
func yukawaPerturbation(mu float64, corr Correction) Perturbation {
	return func(x, _ vec.V) vec.V {
		r := x.Norm()
		ar, _ := corr(mu, r)
		return x.Scale(ar / r)
	}
}

// At small alpha the exact advance and Gauss's first-order average must
// agree to O(alpha) relative: the first-order perturbation result (Gauss's
// planetary equations; Adkins & McDonnell, Phys. Rev. D 75, 082001 (2007))
// is the alpha -> 0 limit of the exact one. Two alphas show the difference
// shrinking in proportion (first order), not merely being small.
func TestYukawaExactMatchesGauss(t *testing.T) {
	mu, a, lambda := 1.0, 1.0, 0.8
	for _, e := range []float64{0.1, 0.3, 0.6, 0.9} {
		var prev float64
		for _, alpha := range []float64{1e-4, 1e-5} {
			corr := yukawa(alpha, lambda)
			ex, err := FromApsides(mu, a*(1-e), a*(1+e), corr)
			if err != nil {
				t.Fatal(err)
			}
			g, err := GaussAverage(mu, a, e, yukawaPerturbation(mu, corr))
			if err != nil {
				t.Fatal(err)
			}
			rel := math.Abs(ex.AdvancePerOrbit/g.Advance - 1)
			t.Logf("e=%g alpha=%g: exact %.12e (%d nodes), Gauss %.12e (%d nodes), rel diff %.2e = %.2f alpha",
				e, alpha, ex.AdvancePerOrbit, ex.Nodes, g.Advance, g.Nodes, rel, rel/alpha)
			// O(alpha): the coefficient is O(1) for lambda ~ a (common
			// practice: a margin of 10 on the leading neglected order).
			if rel > 10*alpha {
				t.Errorf("e=%g alpha=%g: exact %.10e vs Gauss %.10e, rel %.1e > 10 alpha", e, alpha, ex.AdvancePerOrbit, g.Advance, rel)
			}
			if prev != 0 {
				// alpha down by 10: the difference must fall by 10 (first order), within 20%.
				if ratio := prev / rel; ratio < 8 || ratio > 12 {
					t.Errorf("e=%g: difference fell by %.2f for alpha down 10x, want ~10 (first order)", e, ratio)
				}
			}
			prev = rel
		}
	}
}

// FromState finds the same orbit as FromApsides: the state's energy and
// angular momentum (conserved) must be those the apsides imply.
func TestFromStateConservesEnergyAndAngularMomentum(t *testing.T) {
	mu := 1.0
	corr := yukawa(0.05, 0.7)
	for _, tc := range []struct{ x, v vec.V }{
		{vec.V{1, 0, 0}, vec.V{0.2, 1.1, 0}},
		{vec.V{0.3, -0.8, 0.2}, vec.V{0.5, 0.4, -0.6}}, // inclined
		{vec.V{1, 0, 0}, vec.V{0, 1.3, 0}},             // starting at pericentre
		{vec.V{1, 0, 0}, vec.V{0, 0.8, 0}},             // starting at apocentre
	} {
		ex, err := FromState(mu, tc.x, tc.v, corr)
		if err != nil {
			t.Fatal(err)
		}
		r := tc.x.Norm()
		_, phi := corr(mu, r)
		energy := tc.v.Dot(tc.v)/2 - mu/r + phi
		h := tc.x.Cross(tc.v).Norm()
		if rel := math.Abs(ex.Energy/energy - 1); rel > 1e-12 {
			t.Errorf("x=%v v=%v: energy %.15g from apsides, %.15g from state", tc.x, tc.v, ex.Energy, energy)
		}
		if rel := math.Abs(ex.AngMom/h - 1); rel > 1e-12 {
			t.Errorf("x=%v v=%v: h %.15g from apsides, %.15g from state", tc.x, tc.v, ex.AngMom, h)
		}
		if r < ex.RMin*(1-1e-14) || r > ex.RMax*(1+1e-14) {
			t.Errorf("x=%v: r=%g outside the apsides [%g, %g]", tc.x, r, ex.RMin, ex.RMax)
		}
	}
}

func TestErrors(t *testing.T) {
	mu := 1.0
	corr := yukawa(0.01, 1)
	if _, err := FromState(mu, vec.V{1, 0, 0}, vec.V{0, 1.5, 0}, corr); err == nil {
		t.Error("unbound state (v above escape speed sqrt(2 mu/r)) accepted")
	}
	if _, err := FromState(mu, vec.V{1, 0, 0}, vec.V{0.5, 0, 0}, corr); err == nil {
		t.Error("radial orbit accepted")
	}
	if _, err := FromApsides(mu, 2, 1, corr); err == nil {
		t.Error("rmin > rmax accepted")
	}
	if _, err := FromApsides(mu, 0, 1, corr); err == nil {
		t.Error("rmin = 0 accepted")
	}
	// A 1/r^2 potential stronger than the centrifugal barrier (2k > h^2)
	// has no pericentre: the orbit falls in (the closed form above).
	fall := func(mu, r float64) (float64, float64) { return -2 * 0.6 / (r * r * r), -0.6 / (r * r) }
	if _, err := FromState(mu, vec.V{1, 0, 0}, vec.V{0, 1, 0}, fall); err == nil {
		t.Error("orbit falling to the centre accepted")
	}
	// Apsides no orbit can have: a repulsive correction stronger than
	// Newton makes h^2 < 0.
	repel := func(mu, r float64) (float64, float64) { return 2 * mu / (r * r), 2 * mu / r }
	if _, err := FromApsides(mu, 1, 2, repel); err == nil {
		t.Error("impossible apsides accepted")
	}
}
