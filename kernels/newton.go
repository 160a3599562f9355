package kernels

import (
	"math"

	"mgorbit/kernels/vec"
)

// Newton is Newtonian gravity: Phi = -mu/r, a = -mu x / r^3.
// mu is G M at every distance.
type Newton struct{}

func init() {
	Register(Newton{}.Info(), func(Values) (Kernel, error) { return Newton{}, nil })
}

// Info implements Kernel.
func (Newton) Info() Info {
	return Info{
		Name:    "newton",
		Role:    Base,
		Summary: "Newtonian gravity, Phi = -mu/r",
		Mu:      "G M, the same at every distance",
	}
}

// Values implements Kernel.
func (Newton) Values() Values { return Values{} }

// Accel implements Kernel.
func (Newton) Accel(mu float64, x, _ vec.V) vec.V {
	r2 := x.Dot(x)
	return x.Scale(-mu / (r2 * math.Sqrt(r2)))
}

// Energy implements Kernel.
func (Newton) Energy(mu float64, x, _ vec.V) float64 { return -mu / x.Norm() }

// Radial implements Central.
func (Newton) Radial(mu, r float64) (ar, phi float64) { return -mu / (r * r), -mu / r }
