package kernels

import (
	"math"

	"mgorbit/kernels/vec"
)

// NBody is implemented by base laws that are not a sum of pair forces: the
// acceleration of each body depends on all bodies at once. The integrator's
// Field calls NBodyAccel instead of summing Accel over pairs, and adds the
// stack's corrections pairwise.
type NBody interface {
	// NBodyAccel writes into a the accelerations of all bodies; gm[i] = 0
	// marks a test body, which feels the others and pulls on nothing.
	NBodyAccel(gm []float64, x, v, a []vec.V)
	// NBodyEnergy returns the system's conserved energy times G (units of
	// GM v^2), the measure the study's system-energy guard uses.
	NBodyEnergy(gm []float64, x, v []vec.V) float64
}

// PairConserved is implemented by base laws for which the conserved
// energy and angular momentum of an isolated pair depend on both masses,
// not only on their sum. Stack.PairEnergy and Stack.PairAngularMomentum
// use it.
type PairConserved interface {
	// PairEnergy is the conserved energy of the relative orbit per reduced
	// mass, without v^2/2 (as Kernel.Energy), for relative position x and
	// velocity v of bodies with parameters mu1, mu2.
	PairEnergy(mu1, mu2 float64, x, v vec.V) float64
	// PairJFactor is J/|x x v| of the relative orbit.
	PairJFactor(mu1, mu2 float64, x, v vec.V) float64
}

// EIH is general relativity at first post-Newtonian order for several
// massive bodies: the Einstein-Infeld-Hoffmann equations in harmonic gauge.
// With n_AB = (x_A - x_B)/r_AB, U_A = Sum_{C != A} G m_C/r_AC and a_B^N the
// Newtonian acceleration of B,
//
//	a_A = a_A^N + (1/c^2) Sum_{B != A} (G m_B/r_AB^2) { -n_AB [v_A^2 + 2 v_B^2 - 4 v_A.v_B
//	      - (3/2)(n_AB.v_B)^2 - 4 U_A - U_B - (1/2) r_AB n_AB.a_B^N]
//	      + [n_AB.(4 v_A - 3 v_B)] (v_A - v_B) + (7/2) r_AB a_B^N }
//
// (Einstein, Infeld & Hoffmann, Ann. Math. 39, 65 (1938); the form of e.g.
// Will, Theory and Experiment in Gravitational Physics; memory, checked in
// the tests: a test body about one mass gives gr1pn term by term, two bodies
// give the relative-motion equations with the symmetric mass ratio, and the
// energy below is conserved in integrations). The conserved energy follows
// from the Lagrangian of Landau & Lifshitz, The Classical Theory of Fields,
// section 106 (memory):
//
//	E = Sum_A m_A (v_A^2/2 + 3 v_A^4/(8 c^2)) - (1/2) Sum_{A != B} G m_A m_B/r_AB
//	  + (1/(4 c^2)) Sum_{A != B} (G m_A m_B/r_AB) [6 v_A^2 - 7 v_A.v_B - (n_AB.v_A)(n_AB.v_B)]
//	  + (1/(2 c^2)) Sum_A m_A U_A^2
//
// For two bodies (M = m1 + m2, nu = m1 m2/M^2) the relative orbit conserves,
// per reduced mass,
//
//	E = v^2/2 - G M/r + [(3/8)(1 - 3 nu) v^4 + (G M/(2 r))((3 + nu) v^2 + nu rdot^2) + G^2 M^2/(2 r^2)]/c^2
//	J = |x x v| [1 + ((1 - 3 nu) v^2/2 + (3 + nu) G M/r)/c^2]
//
// (Blanchet, Living Rev. Relativ. 17, 2 (2014), at 1PN; memory), the
// test-body forms of gr1pn at nu = 0.
//
// Applied to a single pair as a Kernel (Accel, Energy) it is the test-body
// limit, gr1pn: only the integrator's N-body path is the full law.
type EIH struct{}

func init() {
	Register(EIH{}.Info(), func(Values) (Kernel, error) { return EIH{}, nil })
}

// Info implements Kernel.
func (EIH) Info() Info {
	return Info{
		Name: "eih",
		Role: Base,
		Summary: "general relativity at first post-Newtonian order for several massive bodies " +
			"(Einstein-Infeld-Hoffmann equations, harmonic gauge); for comparable masses, where gr1pn's test-body form is wrong",
		Mu:                "G M of each body, the same at every distance",
		VelocityDependent: true,
	}
}

// Values implements Kernel.
func (EIH) Values() Values { return Values{} }

// Accel implements Kernel: the test-body limit (a body about one mass).
func (EIH) Accel(mu float64, x, v vec.V) vec.V { return GR1PN{}.Accel(mu, x, v) }

// Energy implements Kernel: the test-body limit.
func (EIH) Energy(mu float64, x, v vec.V) float64 { return GR1PN{}.Energy(mu, x, v) }

// JFactor implements AngularMomentumFactor: the test-body limit.
func (EIH) JFactor(mu float64, x, v vec.V) float64 { return GR1PN{}.JFactor(mu, x, v) }

// Metric implements Lensing: the weak field of general relativity.
func (EIH) Metric(mu, r float64) MetricPotentials { return newtonMetric(mu, r) }

// Carrier implements Lensing.
func (EIH) Carrier() string { return carrierGR }

// symmetricMassRatio returns nu = mu1 mu2/(mu1 + mu2)^2 and M = mu1 + mu2.
func symmetricMassRatio(mu1, mu2 float64) (nu, m float64) {
	m = mu1 + mu2
	return mu1 * mu2 / (m * m), m
}

// PairEnergy implements PairConserved.
func (EIH) PairEnergy(mu1, mu2 float64, x, v vec.V) float64 {
	nu, m := symmetricMassRatio(mu1, mu2)
	r := x.Norm()
	v2 := v.Dot(v)
	rdot := x.Dot(v) / r
	pn := 3.0/8*(1-3*nu)*v2*v2 + m/(2*r)*((3+nu)*v2+nu*rdot*rdot) + m*m/(2*r*r)
	return -m/r + pn*invC2
}

// PairJFactor implements PairConserved.
func (EIH) PairJFactor(mu1, mu2 float64, x, v vec.V) float64 {
	nu, m := symmetricMassRatio(mu1, mu2)
	return 1 + ((1-3*nu)*v.Dot(v)/2+(3+nu)*m/x.Norm())*invC2
}

// eihStack is the body count up to which NBodyAccel keeps its scratch on
// the stack (no allocation per force evaluation).
const eihStack = 32

// NBodyAccel implements NBody.
func (EIH) NBodyAccel(gm []float64, x, v, a []vec.V) {
	n := len(x)
	var bufA [eihStack]vec.V
	var bufU [eihStack]float64
	aN, u := bufA[:0], bufU[:0]
	if n <= eihStack {
		aN, u = bufA[:n], bufU[:n]
	} else {
		aN, u = make([]vec.V, n), make([]float64, n)
	}
	// Newtonian accelerations and potentials first: the 1PN terms need
	// every body's.
	for i := range x {
		var acc vec.V
		var pot float64
		for j := range x {
			if j == i || gm[j] == 0 {
				continue
			}
			d := x[i].Sub(x[j])
			r2 := d.Dot(d)
			r := math.Sqrt(r2)
			acc = acc.AddScaled(-gm[j]/(r2*r), d)
			pot += gm[j] / r
		}
		aN[i], u[i] = acc, pot
	}
	for i := range x {
		vi := v[i]
		vi2 := vi.Dot(vi)
		var pn vec.V
		for j := range x {
			if j == i || gm[j] == 0 {
				continue
			}
			d := x[i].Sub(x[j])
			r := d.Norm()
			nij := d.Scale(1 / r)
			vj := v[j]
			k := gm[j] / (r * r)
			nvi, nvj := nij.Dot(vi), nij.Dot(vj)
			bracket := vi2 + 2*vj.Dot(vj) - 4*vi.Dot(vj) - 1.5*nvj*nvj - 4*u[i] - u[j] - 0.5*r*nij.Dot(aN[j])
			pn = pn.AddScaled(-k*bracket, nij)
			pn = pn.AddScaled(k*(4*nvi-3*nvj), vi.Sub(vj))
			pn = pn.AddScaled(3.5*gm[j]/r, aN[j])
		}
		a[i] = aN[i].AddScaled(invC2, pn)
	}
}

// NBodyEnergy implements NBody.
func (EIH) NBodyEnergy(gm []float64, x, v []vec.V) float64 {
	var newt, pn float64
	for i := range x {
		if gm[i] == 0 {
			continue
		}
		vi2 := v[i].Dot(v[i])
		newt += gm[i] * vi2 / 2
		pn += 3.0 / 8 * gm[i] * vi2 * vi2
		var ui float64
		for j := range x {
			if j == i || gm[j] == 0 {
				continue
			}
			d := x[i].Sub(x[j])
			r := d.Norm()
			nij := d.Scale(1 / r)
			g := gm[i] * gm[j] / r
			newt -= g / 2
			pn += g / 4 * (6*vi2 - 7*v[i].Dot(v[j]) - nij.Dot(v[i])*nij.Dot(v[j]))
			ui += gm[j] / r
		}
		pn += gm[i] * ui * ui / 2
	}
	return newt + pn*invC2
}

// PairEnergy returns the conserved energy of the relative orbit of two
// bodies of parameters mu1, mu2 per reduced mass: the base's pair energy
// where it depends on both masses (PairConserved), else Energy with
// mu = mu1 + mu2. Corrections enter with mu1 + mu2, as in Energy.
func (s *Stack) PairEnergy(mu1, mu2 float64, x, v vec.V) float64 {
	pc, ok := s.Base.(PairConserved)
	if !ok {
		return s.Energy(mu1+mu2, x, v)
	}
	e := 0.5*v.Dot(v) + pc.PairEnergy(mu1, mu2, x, v)
	for _, c := range s.Corrections {
		e += c.Energy(mu1+mu2, x, v)
	}
	return e
}

// PairAngularMomentum is AngularMomentum for a pair of bodies of parameters
// mu1, mu2 (see PairEnergy).
func (s *Stack) PairAngularMomentum(mu1, mu2 float64, x, v vec.V) float64 {
	pc, ok := s.Base.(PairConserved)
	if !ok {
		return s.AngularMomentum(mu1+mu2, x, v)
	}
	return x.Cross(v).Norm() * pc.PairJFactor(mu1, mu2, x, v)
}
