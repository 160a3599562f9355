// Package vec is the three-vector arithmetic shared by kernels and
// integrators. Values, not pointers: the compiler keeps them in registers.
package vec

import "math"

// V is a Cartesian three-vector.
type V [3]float64

// Add returns a + b.
func (a V) Add(b V) V { return V{a[0] + b[0], a[1] + b[1], a[2] + b[2]} }

// Sub returns a - b.
func (a V) Sub(b V) V { return V{a[0] - b[0], a[1] - b[1], a[2] - b[2]} }

// Scale returns s a.
func (a V) Scale(s float64) V { return V{s * a[0], s * a[1], s * a[2]} }

// AddScaled returns a + s b.
func (a V) AddScaled(s float64, b V) V {
	return V{a[0] + s*b[0], a[1] + s*b[1], a[2] + s*b[2]}
}

// Dot returns a . b.
func (a V) Dot(b V) float64 { return a[0]*b[0] + a[1]*b[1] + a[2]*b[2] }

// Cross returns a x b.
func (a V) Cross(b V) V {
	return V{a[1]*b[2] - a[2]*b[1], a[2]*b[0] - a[0]*b[2], a[0]*b[1] - a[1]*b[0]}
}

// Norm returns |a|.
func (a V) Norm() float64 { return math.Sqrt(a.Dot(a)) }

// Norm2 returns |a|^2.
func (a V) Norm2() float64 { return a.Dot(a) }

// Unit returns a / |a| (the zero vector stays zero).
func (a V) Unit() V {
	n := a.Norm()
	if n == 0 {
		return a
	}
	return a.Scale(1 / n)
}
