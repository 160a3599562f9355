package kernels_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/stat"

	"mgorbit/integrator"
	"mgorbit/integrator/kepler"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// The non-central kernels (j2, lense-thirring) are checked by the secular
// rates of the node Omega and the argument of pericentre omega that the
// literature gives for them, in two independent ways: Gauss's planetary
// equations averaged over the unperturbed ellipse, and integrated orbits.
// In the integrations the rates are slopes of osculating elements against
// time over a whole number of orbits: the elements oscillate within an
// orbit, but for a secular rate those short-period terms average out (a
// residual of order their amplitude over the time span), which is why
// osculating elements are acceptable here though not for the precession
// of a modified central force (PHYSICS.md, Observables).

// orbitAxes are the perifocal unit vectors P (to pericentre), Q (90 degrees
// ahead) and the orbit normal W of elements el: the directions of position
// and velocity at the pericentre.
func orbitAxes(t *testing.T, mu float64, el kepler.Elements) (p, q, w vec.V) {
	el.M = 0
	x, v, err := kepler.ToState(mu, el)
	if err != nil {
		t.Fatal(err)
	}
	p, q = x.Unit(), v.Unit()
	return p, q, p.Cross(q)
}

// gaussSecular averages Gauss's planetary equations (Murray & Dermott,
// Solar System Dynamics, ch. 2; Vallado, Fundamentals of Astrodynamics and
// Applications; memory)
//
//	dOmega/dt = r sin u N / (h sin i)
//	domega/dt = sqrt(p/mu)/e [-R cos f + T (1 + r/p) sin f] - cos i dOmega/dt
//
// over one period of the Kepler ellipse el (u = omega + f, h = sqrt(mu p);
// R, T, N the radial, transverse and normal components of perturb), with
// dt = r^2 df/h. Gauss-Legendre in f with 256 nodes: the integrand is
// smooth and periodic.
func gaussSecular(t *testing.T, mu float64, el kepler.Elements, perturb func(x, v vec.V) vec.V) (dNode, dPeri float64) {
	p := el.A * (1 - el.E*el.E)
	h := math.Sqrt(mu * p)
	period := kepler.Period(mu, el.A)
	pa, qa, wa := orbitAxes(t, mu, el)
	si, ci := math.Sincos(el.I)
	vk := math.Sqrt(mu / p)
	rates := func(f float64) (node, peri float64) {
		sf, cf := math.Sincos(f)
		r := p / (1 + el.E*cf)
		x := pa.Scale(r*cf).AddScaled(r*sf, qa)
		v := pa.Scale(-vk*sf).AddScaled(vk*(el.E+cf), qa)
		rh := x.Scale(1 / r)
		th := wa.Cross(rh)
		a := perturb(x, v)
		R, T, N := a.Dot(rh), a.Dot(th), a.Dot(wa)
		su := math.Sin(el.Peri + f)
		node = r * su * N / (h * si)
		peri = math.Sqrt(p/mu)/el.E*(-R*cf+T*(1+r/p)*sf) - ci*node
		dt := r * r / h
		return node * dt / period, peri * dt / period
	}
	dNode = quad.Fixed(func(f float64) float64 { n, _ := rates(f); return n }, 0, 2*math.Pi, 256, quad.Legendre{}, 0)
	dPeri = quad.Fixed(func(f float64) float64 { _, w := rates(f); return w }, 0, 2*math.Pi, 256, quad.Legendre{}, 0)
	return dNode, dPeri
}

// integratedRates integrates a test body from el under stack (yoshida6,
// stepsPerOrbit steps per Kepler period) for the given number of orbits,
// averages the osculating node and argument of pericentre over each orbit
// (uniform samples in time: the short-period terms average out) and fits
// the orbit means against time. A whole number of steps per orbit keeps
// the samples of each orbit uniform; it locks the integrator's error to
// the orbit phase, which biases only its own spurious apsidal motion,
// ~(2 pi/steps)^6 per orbit, far below the rates measured here.
//
// It also returns the mean semi-major axis, eccentricity and inclination
// over the run: the first-order rates are functions of the mean elements,
// which differ from the starting osculating ones by the short-period terms.
func integratedRates(t *testing.T, stack *kernels.Stack, mu float64, el kepler.Elements, stepsPerOrbit, orbits int) (dNode, dPeri float64, mean kepler.Elements) {
	t.Helper()
	x0, v0, err := kepler.ToState(mu, el)
	if err != nil {
		t.Fatal(err)
	}
	stepper, err := integrator.New("yoshida6")
	if err != nil {
		t.Fatal(err)
	}
	sys := &integrator.System{X: []vec.V{{}, x0}, V: []vec.V{{}, v0}, A: make([]vec.V, 2), GM: []float64{mu, 0}}
	field := integrator.NewField(stack, sys.GM)
	field.Prime(sys)
	h := kepler.Period(mu, el.A) / float64(stepsPerOrbit)
	var ts, nodes, peris []float64
	prevNode, prevPeri := el.Node, el.Peri
	for range orbits {
		var tSum, nSum, wSum float64
		for range stepsPerOrbit {
			// sample at the step's midpoint in time: the mean of the
			// values before and after each step
			e0, err := kepler.FromState(mu, sys.X[1].Sub(sys.X[0]), sys.V[1].Sub(sys.V[0]))
			if err != nil {
				t.Fatal(err)
			}
			node := e0.Node - 2*math.Pi*math.Round((e0.Node-prevNode)/(2*math.Pi))
			peri := e0.Peri - 2*math.Pi*math.Round((e0.Peri-prevPeri)/(2*math.Pi))
			prevNode, prevPeri = node, peri
			tSum += sys.T
			nSum += node
			wSum += peri
			mean.A += e0.A
			mean.E += e0.E
			mean.I += e0.I
			stepper.Step(sys, field, h)
		}
		n := float64(stepsPerOrbit)
		ts = append(ts, tSum/n)
		nodes = append(nodes, nSum/n)
		peris = append(peris, wSum/n)
	}
	_, dNode = stat.LinearRegression(ts, nodes, nil, false)
	_, dPeri = stat.LinearRegression(ts, peris, nil, false)
	samples := float64(orbits * stepsPerOrbit)
	mean.A, mean.E, mean.I = mean.A/samples, mean.E/samples, mean.I/samples
	return dNode, dPeri, mean
}

// secularRates gives the expected d Omega/dt, d omega/dt and their scale
// for an orbit's elements.
type secularRates func(el kepler.Elements) (node, peri, scale float64)

// checkSecular compares the Gauss average at the starting elements (to
// gaussTol of the scale) and the integrated rates at the mean elements (to
// intTol of the scale) with the expected ones.
func checkSecular(t *testing.T, k kernels.Kernel, mu float64, el kepler.Elements, want secularRates, gaussTol, intTol float64) {
	t.Helper()
	stack := kernels.MustStack(kernels.Newton{}, k)
	inc := math.Round(el.I*180/math.Pi*1e6) / 1e6
	wantNode, wantPeri, scale := want(el)
	gNode, gPeri := gaussSecular(t, mu, el, func(x, v vec.V) vec.V { return k.Accel(mu, x, v) })
	if math.Abs(gNode-wantNode) > gaussTol*scale || math.Abs(gPeri-wantPeri) > gaussTol*scale {
		t.Errorf("i = %g deg: Gauss average dOmega/dt %.10e, domega/dt %.10e; expected %.10e, %.10e",
			inc, gNode, gPeri, wantNode, wantPeri)
	}
	iNode, iPeri, mean := integratedRates(t, stack, mu, el, 300, 40)
	wantNode, wantPeri, scale = want(mean)
	errN, errW := (iNode-wantNode)/scale, (iPeri-wantPeri)/scale
	t.Logf("i = %g deg: integrated dOmega/dt %.6e, domega/dt %.6e; expected at the mean elements %.6e, %.6e; "+
		"differences %.1e, %.1e of the scale %.2e", inc, iNode, iPeri, wantNode, wantPeri, errN, errW, scale)
	if math.Abs(errN) > intTol || math.Abs(errW) > intTol {
		t.Errorf("i = %g deg: integrated rates %.6e, %.6e differ from the expected %.6e, %.6e by %.1e, %.1e of the scale",
			inc, iNode, iPeri, wantNode, wantPeri, errN, errW)
	}
}

// J2: d omega/dt = (3/4) n J2 (R/p)^2 (5 cos^2 i - 1) and
// d Omega/dt = -(3/2) n J2 (R/p)^2 cos i (first order; Vallado, and Murray &
// Dermott ch. 6; memory). The orbit-averaged Gauss equations must give
// them to quadrature accuracy (they are the same first-order average). For
// the integrated orbit the rates are evaluated at its mean elements; what
// is left is second order, O(J2 (R/p)^2) = 1e-4 relative here, and the
// fit's residual. Errors are measured against the rates' scale
// n J2 (R/p)^2 (the pericentre rate passes through zero at 63.4 deg);
// tolerance 1e-3 of it, 10 times the leading neglected order (common
// practice).
func TestOblatenessSecularRates(t *testing.T) {
	const mu, j2, radius = 1.0, 1e-3, 0.3
	k, err := kernels.New("j2", kernels.Values{Num: map[string]float64{"j2": j2, "radius": radius}})
	if err != nil {
		t.Fatal(err)
	}
	textbook := func(el kepler.Elements) (node, peri, scale float64) {
		p := el.A * (1 - el.E*el.E)
		n := 2 * math.Pi / kepler.Period(mu, el.A)
		ci := math.Cos(el.I)
		scale = n * j2 * (radius / p) * (radius / p)
		return -1.5 * scale * ci, 0.75 * scale * (5*ci*ci - 1), scale
	}
	for _, inc := range []float64{40, 75, 130} {
		el := kepler.Elements{A: 1, E: 0.2, I: inc * math.Pi / 180, Node: 0.5, Peri: 0.9, M: 0.3}
		checkSecular(t, k, mu, el, textbook, 1e-10, 1e-3)
	}
}

// Lense-Thirring: d Omega/dt = 2 G J/(c^2 a^3 (1 - e^2)^(3/2)) and
// d omega/dt = -6 G J cos i/(c^2 a^3 (1 - e^2)^(3/2)) (Lense & Thirring
// 1918; Ciufolini 1986; memory), for a maximally spinning source
// (G J = mu^2/c) at a = 1e4 mu/c^2, so the rates stand well above the
// integrator's error (spurious apsidal motion ~(2 pi/300)^6 per orbit).
// Measured against the scale 2 G J/(c^2 a^3 (1 - e^2)^(3/2)) at the mean
// elements; tolerance 1e-4 of it (the neglected orders are below 1e-6:
// common practice, a margin for the fit's residual).
func TestLenseThirringSecularRates(t *testing.T) {
	mu := units.GMSun
	c2 := units.C * units.C
	k, err := kernels.New("lense-thirring", kernels.Values{Num: map[string]float64{"spin": 1}})
	if err != nil {
		t.Fatal(err)
	}
	gj := mu * mu / units.C
	lt := func(el kepler.Elements) (node, peri, scale float64) {
		q := gj / (c2 * math.Pow(el.A, 3) * math.Pow(1-el.E*el.E, 1.5))
		return 2 * q, -6 * q * math.Cos(el.I), 2 * q
	}
	for _, inc := range []float64{30, 100} {
		el := kepler.Elements{A: 1e4 * mu / c2, E: 0.25, I: inc * math.Pi / 180, Node: 1.1, Peri: 0.4, M: 2}
		checkSecular(t, k, mu, el, lt, 1e-10, 1e-4)
	}
}
