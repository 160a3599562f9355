package observe

import "mgorbit/kernels/vec"

// Hermite is the quintic Hermite interpolant on a step of length H that
// matches position, velocity and acceleration at both ends.
type Hermite struct {
	X0, V0, A0, X1, V1, A1 vec.V
	H                      float64
}

// At returns the interpolated position and velocity at fraction s in [0, 1]
// of the step.
func (h *Hermite) At(s float64) (x, v vec.V) {
	s2 := s * s
	s3 := s2 * s
	s4 := s3 * s
	s5 := s4 * s
	// basis functions and their s-derivatives
	h0 := 1 - 10*s3 + 15*s4 - 6*s5
	h1 := s - 6*s3 + 8*s4 - 3*s5
	h2 := 0.5*s2 - 1.5*s3 + 1.5*s4 - 0.5*s5
	h3 := 0.5*s3 - s4 + 0.5*s5
	h4 := -4*s3 + 7*s4 - 3*s5
	h5 := 10*s3 - 15*s4 + 6*s5
	d0 := -30*s2 + 60*s3 - 30*s4
	d1 := 1 - 18*s2 + 32*s3 - 15*s4
	d2 := s - 4.5*s2 + 6*s3 - 2.5*s4
	d3 := 1.5*s2 - 4*s3 + 2.5*s4
	d4 := -12*s2 + 28*s3 - 15*s4
	d5 := 30*s2 - 60*s3 + 30*s4
	H, H2 := h.H, h.H*h.H
	for k := 0; k < 3; k++ {
		x[k] = h0*h.X0[k] + h1*H*h.V0[k] + h2*H2*h.A0[k] + h3*H2*h.A1[k] + h4*H*h.V1[k] + h5*h.X1[k]
		v[k] = (d0*h.X0[k]+d5*h.X1[k])/H + d1*h.V0[k] + d4*h.V1[k] + (d2*h.A0[k]+d3*h.A1[k])*H
	}
	return x, v
}

// RadialRoot finds s in [0, 1] where x.v = 0 on the interpolant, given that
// x.v has opposite signs (or a zero) at the two ends. Illinois false
// position: bracketing, superlinear.
func (h *Hermite) RadialRoot() float64 {
	g := func(s float64) float64 { x, v := h.At(s); return x.Dot(v) }
	a, b := 0.0, 1.0
	ga, gb := h.X0.Dot(h.V0), h.X1.Dot(h.V1)
	if ga == 0 {
		return 0
	}
	if gb == 0 {
		return 1
	}
	side := 0
	for it := 0; it < 100 && b-a > 1e-16; it++ {
		c := (a*gb - b*ga) / (gb - ga)
		if !(c > a && c < b) {
			c = 0.5 * (a + b)
		}
		gc := g(c)
		if gc == 0 {
			return c
		}
		if (gc > 0) == (gb > 0) {
			b, gb = c, gc
			if side == -1 {
				ga *= 0.5
			}
			side = -1
		} else {
			a, ga = c, gc
			if side == 1 {
				gb *= 0.5
			}
			side = 1
		}
	}
	return 0.5 * (a + b)
}
