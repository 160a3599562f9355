package integrator

import (
	"math"

	"mgorbit/kernels/vec"
)

// RK45 is the embedded Dormand-Prince 5(4) Runge-Kutta pair with local
// error control (Dormand & Prince, J. Comput. Appl. Math. 6, 19 (1980);
// tableau as in Hairer, Norsett & Wanner, Solving ODEs I, Table 5.2). It
// is not symplectic: its energy error drifts. It serves as an independent
// reference for the symplectic steppers. Step(h) advances exactly by h
// with as many adaptive substeps as the tolerance needs.
type RK45 struct {
	// Tol is the relative local error allowed per substep.
	Tol float64
	// Substeps counts accepted substeps; Rejected the rejected ones.
	Substeps, Rejected int

	hsub float64
	k    [7][2][]vec.V // stage derivatives: [stage][0]=dx/dt, [1]=dv/dt
	x0   []vec.V
	v0   []vec.V
	xs   []vec.V
	vs   []vec.V
}

// NewRK45 returns a Dormand-Prince stepper with relative tolerance tol.
func NewRK45(tol float64) *RK45 { return &RK45{Tol: tol} }

// Name implements Stepper.
func (r *RK45) Name() string { return "rk45" }

// Order implements Stepper (the propagated solution is fifth order).
func (r *RK45) Order() int { return 5 }

// Dormand-Prince coefficients.
var (
	dpC = [7]float64{0, 1.0 / 5, 3.0 / 10, 4.0 / 5, 8.0 / 9, 1, 1}
	dpA = [7][6]float64{
		{},
		{1.0 / 5},
		{3.0 / 40, 9.0 / 40},
		{44.0 / 45, -56.0 / 15, 32.0 / 9},
		{19372.0 / 6561, -25360.0 / 2187, 64448.0 / 6561, -212.0 / 729},
		{9017.0 / 3168, -355.0 / 33, 46732.0 / 5247, 49.0 / 176, -5103.0 / 18656},
		{35.0 / 384, 0, 500.0 / 1113, 125.0 / 192, -2187.0 / 6784, 11.0 / 84},
	}
	// fifth-order weights (equal to the last row of dpA: first same as last)
	dpB5 = [7]float64{35.0 / 384, 0, 500.0 / 1113, 125.0 / 192, -2187.0 / 6784, 11.0 / 84, 0}
	// fourth-order embedded weights
	dpB4 = [7]float64{5179.0 / 57600, 0, 7571.0 / 16695, 393.0 / 640, -92097.0 / 339200, 187.0 / 2100, 1.0 / 40}
)

func (r *RK45) alloc(n int) {
	if len(r.x0) == n {
		return
	}
	for s := range r.k {
		r.k[s][0] = make([]vec.V, n)
		r.k[s][1] = make([]vec.V, n)
	}
	r.x0, r.v0 = make([]vec.V, n), make([]vec.V, n)
	r.xs, r.vs = make([]vec.V, n), make([]vec.V, n)
}

// Step implements Stepper.
func (r *RK45) Step(s *System, f *Field, h float64) {
	n := len(s.X)
	r.alloc(n)
	if r.hsub <= 0 || r.hsub > h {
		r.hsub = h
	}
	t, tEnd := 0.0, h
	for t < tEnd {
		hs := math.Min(r.hsub, tEnd-t)
		last := hs >= tEnd-t
		errNorm := r.trial(s, f, hs)
		if errNorm <= 1 {
			r.Substeps++
			copy(s.X, r.xs)
			copy(s.V, r.vs)
			if last {
				t = tEnd
			} else {
				t += hs
			}
			copy(s.A, r.k[6][1]) // FSAL: the last stage is a(x_new, v_new)
		} else {
			r.Rejected++
		}
		fac := 5.0
		if errNorm > 0 {
			fac = math.Min(5, math.Max(0.2, 0.9*math.Pow(errNorm, -0.2)))
		}
		if errNorm <= 1 && last {
			// keep the proposal for the next call, but not a shrunken last piece
			r.hsub = math.Max(r.hsub, hs*fac)
		} else {
			r.hsub = hs * fac
		}
	}
	s.T += h
}

// trial takes one Dormand-Prince step of size h from s, leaving the
// fifth-order result in r.xs, r.vs, and returns the scaled error norm.
func (r *RK45) trial(s *System, f *Field, h float64) float64 {
	copy(r.x0, s.X)
	copy(r.v0, s.V)
	copy(r.k[0][0], s.V)
	copy(r.k[0][1], s.A)
	for st := 1; st < 7; st++ {
		for i := range r.x0 {
			x, v := r.x0[i], r.v0[i]
			for j := 0; j < st; j++ {
				if a := dpA[st][j]; a != 0 {
					x = x.AddScaled(h*a, r.k[j][0][i])
					v = v.AddScaled(h*a, r.k[j][1][i])
				}
			}
			r.xs[i], r.vs[i] = x, v
		}
		copy(r.k[st][0], r.vs)
		f.Eval(s.GM, r.xs, r.vs, r.k[st][1])
	}
	// r.xs, r.vs now hold the fifth-order solution (stage 7 = b5 row).
	var xmax, vmax float64
	for i := range r.x0 {
		xmax = math.Max(xmax, r.xs[i].Norm())
		vmax = math.Max(vmax, r.vs[i].Norm())
	}
	worst := 0.0
	for i := range r.x0 {
		var ex, ev vec.V
		for j := 0; j < 7; j++ {
			d := dpB5[j] - dpB4[j]
			ex = ex.AddScaled(h*d, r.k[j][0][i])
			ev = ev.AddScaled(h*d, r.k[j][1][i])
		}
		sx := r.Tol * (r.xs[i].Norm() + 1e-3*xmax)
		sv := r.Tol * (r.vs[i].Norm() + 1e-3*vmax)
		worst = math.Max(worst, math.Max(ex.Norm()/sx, ev.Norm()/sv))
	}
	return worst
}
