package kernels

import (
	"fmt"
	"math"

	"mgorbit/kernels/special"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// Crossover is induced gravity on a brane with crossover radius r_c, in its
// linear regime:
//
//	Phi = -(2 t mu/(pi r)) f(x),  a_r = -(2 t mu/(pi r^2)) [f(x) + x g(x)],  x = r/r_c
//
// with f and g the auxiliary functions of the sine and cosine integrals
// (Abramowitz & Stegun 5.2.6-7, f' = -g); the potential is that of
// Dvali, Gabadadze & Porrati, Phys. Lett. B 485, 208 (2000) (memory). At
// r << r_c it is t times Newton (f -> pi/2), the force falling short by the
// fraction (2/pi) x; at r >> r_c the potential is five-dimensional,
// -(2/pi) t mu r_c/r^2 (f ~ 1/x). t is the tensor factor of the static
// part: 1 for modes = scalar, 4/3 for modes = spin2 (massive spin-2 exchange,
// as for the massive graviton). mu is the short-distance value: G M holds at
// r << r_c.
//
// As a correction it returns
//
//	phi = -(mu/r) [t (2/pi) f - 1],  a_r = -(mu/r^2) [t (2/pi) (f + x g) - 1],
//
// written through the deficits 1 - (2/pi) f and 1 - (2/pi)(f + x g) so that
// the difference from Newton, ~ x, keeps its relative accuracy as x -> 0.
//
// The linear regime does not hold inside the Vainshtein radius (about 100 pc
// for a Sun-like star at r_c of a few Gpc): there the nonlinear scalar screens
// the deviation, and for orbits inside it the vainshtein kernel is the model.
type Crossover struct {
	rc    float64
	modes string
	t     float64 // tensor factor
}

func init() {
	Register(crossoverInfo(), newCrossover)
}

func crossoverInfo() Info {
	return Info{
		Name:    "crossover",
		Role:    Correction,
		Summary: "induced-gravity brane world (linear regime), Phi = -(2 t mu/(pi r)) f(r/r_c); returns the difference from Newton",
		Mu:      "short-distance: G M holds at r << r_c (times t = 4/3 there for modes = spin2)",
		Params: []Param{
			{Name: "r_c", Kind: Number, Dim: units.Length, Unit: "m",
				Doc:      "crossover radius: four-dimensional gravity inside, five-dimensional outside",
				Required: true, Min: 0, MinOpen: true, Max: math.Inf(1)},
			{Name: "modes", Kind: Choice, Choices: []string{"scalar", "spin2"}, DefaultChoice: "scalar",
				Doc: "tensor factor t of the static part: scalar t = 1, spin2 t = 4/3"},
		},
	}
}

func newCrossover(v Values) (Kernel, error) {
	rc, ok := v.Num["r_c"]
	if !ok {
		return nil, fmt.Errorf("kernel crossover: parameter r_c (the crossover radius, a length) is required")
	}
	if !(rc > 0) || math.IsInf(rc, 0) {
		return nil, fmt.Errorf("kernel crossover: r_c = %g must be a finite length > 0", rc)
	}
	k := &Crossover{rc: rc, modes: v.Str["modes"]}
	switch k.modes {
	case "", "scalar":
		k.modes, k.t = "scalar", 1
	case "spin2":
		k.t = 4.0 / 3
	default:
		return nil, fmt.Errorf("kernel crossover: modes = %q is not allowed (one of scalar, spin2)", k.modes)
	}
	return k, nil
}

// Info implements Kernel.
func (*Crossover) Info() Info { return crossoverInfo() }

// Values implements Kernel.
func (k *Crossover) Values() Values {
	return Values{Num: map[string]float64{"r_c": k.rc}, Str: map[string]string{"modes": k.modes}}
}

// Radial implements Central: the parts beyond Newton. With the deficits
// D = 1 - (2/pi) f, t (2/pi) f - 1 = (t - 1) - t D, exact for t = 1.
func (k *Crossover) Radial(mu, r float64) (ar, phi float64) {
	dPhi, dForce := special.CrossoverDeficits(r / k.rc)
	phi = -(mu / r) * ((k.t - 1) - k.t*dPhi)
	ar = -(mu / (r * r)) * ((k.t - 1) - k.t*dForce)
	return ar, phi
}

// Accel implements Kernel.
func (k *Crossover) Accel(mu float64, x, _ vec.V) vec.V {
	r := x.Norm()
	ar, _ := k.Radial(mu, r)
	return x.Scale(ar / r)
}

// Energy implements Kernel: the potential beyond Newton.
func (k *Crossover) Energy(mu float64, x, _ vec.V) float64 {
	_, phi := k.Radial(mu, x.Norm())
	return phi
}
