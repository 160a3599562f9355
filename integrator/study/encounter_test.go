package study

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"mgorbit/integrator/kepler"
	"mgorbit/kernels"
	"mgorbit/scenarios"
)

// probeAt is a test body on the Kepler orbit (a, e) about a centre of
// mu = 1 and radius radius, starting at mean anomaly m0 (pericentre on +x).
func probeAt(t *testing.T, a, e, m0, radius float64, method string, stepsPerOrbit, orbits float64) *scenarios.Scenario {
	t.Helper()
	x, v, err := kepler.ToState(1, kepler.Elements{A: a, E: e, M: m0})
	if err != nil {
		t.Fatal(err)
	}
	return &scenarios.Scenario{Name: "probe", Source: "test", Stack: kernels.MustStack(kernels.Newton{}),
		Bodies: []scenarios.Body{{Name: "centre", GM: 1, Radius: radius}, {Name: "probe", Test: true, Primary: "centre", X: x, V: v}},
		Integrator: scenarios.IntegratorSpec{Method: method, StepsPerOrbit: stepsPerOrbit, Orbits: orbits,
			EnergyTolerance: 1e-2, AngularMomentumTolerance: 1e-2, Tolerance: 1e-12}}
}

// keplerTime is the time from mean anomaly m0 to eccentric anomaly E on
// the way in (E in (pi, 2 pi)), by Kepler's equation M = E - e sin E
// (Murray & Dermott, Solar System Dynamics, eq. 2.52), mean motion 1/a^1.5.
func keplerTime(a, e, m0, E float64) float64 {
	return (E - e*math.Sin(E) - m0) * math.Pow(a, 1.5)
}

// TestCollisionAtContact: a probe falling from apocentre on an orbit whose
// pericentre lies inside the centre's radius is stopped at the first step
// with r <= R, no later than one step after the contact time Kepler's
// equation gives (r = a(1 - e cos E) = R).
func TestCollisionAtContact(t *testing.T) {
	const a, e, R, spo = 1.0, 0.9, 0.2, 2000.3
	_, err := Run(context.Background(), probeAt(t, a, e, math.Pi, R, "yoshida6", spo, 3), Options{})
	var col *CollisionError
	if !errors.As(err, &col) {
		t.Fatalf("got %v, want a collision", err)
	}
	E := 2*math.Pi - math.Acos((1-R/a)/e)
	tc := keplerTime(a, e, math.Pi, E)
	h := 2 * math.Pi / spo
	t.Logf("%v; Kepler contact at t = %.6f, step %.4g", err, tc, h)
	if col.A != "centre" || col.B != "probe" || col.AtPericentre {
		t.Errorf("collision of %s and %s (at pericentre %v), want centre and probe at a step", col.A, col.B, col.AtPericentre)
	}
	if col.T < tc-1e-6 || col.T > tc+h+1e-6 {
		t.Errorf("collision seen at t = %.6f, want within one step after the contact at %.6f", col.T, tc)
	}
	if col.Distance > R || col.RadiusSum != R {
		t.Errorf("distance %.6g, radius sum %.6g: want distance <= %g", col.Distance, col.RadiusSum, R)
	}
}

// TestGrazingCollisionAtPericentre: the pericentre (r_p = a(1 - e) = 0.1)
// lies a millionth inside the centre's radius, so no step lands inside;
// the refined pericentre passage finds the contact at the time Kepler's
// equation gives for E = 2 pi.
func TestGrazingCollisionAtPericentre(t *testing.T) {
	const a, e, spo = 1.0, 0.9, 4000.3
	rp := a * (1 - e)
	_, err := Run(context.Background(), probeAt(t, a, e, math.Pi, rp*(1+1e-6), "yoshida6", spo, 3), Options{})
	var col *CollisionError
	if !errors.As(err, &col) {
		t.Fatalf("got %v, want a collision", err)
	}
	tp := keplerTime(a, e, math.Pi, 2*math.Pi)
	t.Logf("%v; Kepler pericentre at t = %.9f", err, tp)
	if !col.AtPericentre || !strings.HasPrefix(err.Error(), "main run:") {
		t.Fatalf("contact found at a step, or not by the main run (%v): the grazing case is not exercised", err)
	}
	// the refined pericentre is good to the sixth-order step's error
	if math.Abs(col.T-tp) > 1e-6 || math.Abs(col.Distance/rp-1) > 1e-7 {
		t.Errorf("pericentre contact at t = %.9f, r = %.12g; Kepler: t = %.9f, r_p = %g", col.T, col.Distance, tp, rp)
	}
}

// TestUnresolvedEncounter: on an e = 0.99 orbit at 300 steps per orbit the
// pericentre passage time r_p/v_p is 1/27 of a step, so the fixed step
// cannot follow the plunge; even with KeepGoing the run stops with an
// accuracy error (exit 3)
// where the encounter time scale r/v (vis-viva: v^2 = mu (2/r - 1/a))
// first drops below two steps. At 20 steps per r_p/v_p the same orbit runs
// without the alarm.
func TestUnresolvedEncounter(t *testing.T) {
	const a, e, spo = 1.0, 0.99, 300.3
	sc := probeAt(t, a, e, math.Pi, 0, "leapfrog", spo, 3)
	// The energy guard stops such a run first; with KeepGoing it goes on,
	// but an encounter still stops it.
	_, err := Run(context.Background(), sc, Options{KeepGoing: true})
	var enc *EncounterError
	var acc *AccuracyError
	if !errors.As(err, &enc) || !errors.As(err, &acc) {
		t.Fatalf("got %v, want an encounter error that is an accuracy error", err)
	}
	t.Log(err)
	h := 2 * math.Pi / spo
	// r_crit solves r/v = r^1.5/sqrt(2 - r) = ResolveSteps h (r/v is the
	// smaller scale for r < 2a); bisection on the monotonic function
	lo, hi := 1e-6, 1.0
	for k := 0; k < 200; k++ {
		mid := 0.5 * (lo + hi)
		if math.Pow(mid, 1.5)/math.Sqrt(2-mid) < ResolveSteps*h {
			lo = mid
		} else {
			hi = mid
		}
	}
	rc := lo
	vFire := math.Sqrt(2/enc.Separation - 1)
	if enc.Separation > rc || enc.Separation < rc-1.01*vFire*h {
		t.Errorf("alarm at r = %.5g, want within one step (v h = %.3g) inside vis-viva's r_crit = %.5g", enc.Separation, vFire*h, rc)
	}

	// resolved: 20 steps per r_p/v_p = (P/2 pi)(1-e)^1.5/(1+e)^0.5
	fine := 20 * 2 * math.Pi * math.Sqrt(1+e) / math.Pow(1-e, 1.5)
	if _, err := Run(context.Background(), probeAt(t, a, e, math.Pi, 0, "yoshida6", fine+0.3, 3), Options{}); err != nil {
		t.Errorf("at %.0f steps per orbit: %v", fine, err)
	}
}

// TestRingHasNoEncounterAlarm: the built-in binary with a ring of test
// particles (bodies near a massive companion, perturbed orbits) runs
// without a collision or encounter alarm.
func TestRingHasNoEncounterAlarm(t *testing.T) {
	if _, err := Run(context.Background(), builtin(t, "corvel-ring"), Options{}); err != nil {
		t.Fatal(err)
	}
}
