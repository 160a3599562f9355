package kernels

import (
	"math"

	"mgorbit/kernels/vec"
)

// MassiveGraviton is linear (Fierz-Pauli) massive spin-2 exchange. Its
// static potential is
//
//	Phi_mg = -k (mu/r) e^(-r/lambda)
//
// with k = 4/3 when mu is the massless graviton's coupling ("coupling"
// normalisation: the exchange amplitude goes as T.T - (1/3) T T instead of
// T.T - (1/2) T T, the van Dam-Veltman-Zakharov discontinuity; van Dam &
// Veltman 1970, Zakharov 1970), or k = 1 when the static force is fixed to
// Newton at r << lambda ("static" normalisation; light bending is then 3/4
// of general relativity's).
//
// The law has no Newtonian limit of its own, so as a correction it returns
// Phi_mg minus Newton:
//
//	phi = -(mu/r) (k e^(-u) - 1),  a_r = -(mu/r^2) (k (1 + u) e^(-u) - 1),  u = r/lambda
//
// and newton + massive-graviton is the pure massive graviton. Both brackets
// are evaluated as expm1 of a logarithm: nothing cancels at r << lambda in
// the static normalisation (where they vanish as u and u^2/2), and near
// k e^(-u) = 1 only the rounding of u itself is left.
type MassiveGraviton struct {
	vals   Values
	lambda float64
	k      float64
	logK   float64
}

func init() {
	Register(massiveGravitonInfo(), newMassiveGraviton)
}

func massiveGravitonInfo() Info {
	return Info{
		Name: "massive-graviton",
		Role: Correction,
		Summary: "linear massive spin-2 exchange, Phi = -k (mu/r) e^(-r/lambda), k = 4/3 or 1; " +
			"returns Phi minus Newton, so stack it on newton (no Newtonian limit of its own)",
		Mu: "the massless graviton's coupling G M (coupling normalisation: static force (4/3) mu/r^2 at r << lambda, " +
			"none at r >> lambda), or the short-distance static G M (static normalisation); " +
			"the law has no Newtonian limit of its own and is meant to be stacked or compared",
		Params: []Param{
			{Name: "normalisation", Kind: Choice, Choices: []string{"coupling", "static"}, DefaultChoice: "coupling",
				Doc: "coupling: mu is the massless coupling (k = 4/3); static: static force equals Newton at r << lambda (k = 1)"},
			rangeLengthParam("lambda", "Compton wavelength of the graviton; give this or graviton_mass"),
			rangeEnergyParam("graviton_mass", "graviton rest energy m c^2; give this or lambda"),
		},
	}
}

func newMassiveGraviton(v Values) (Kernel, error) {
	lambda, err := mediatorRange("massive-graviton", v, "lambda", "graviton_mass")
	if err != nil {
		return nil, err
	}
	k := 4.0 / 3
	if v.Str["normalisation"] == "static" {
		k = 1
	}
	return &MassiveGraviton{vals: cloneKernelValues(v), lambda: lambda, k: k, logK: math.Log(k)}, nil
}

// Info implements Kernel.
func (*MassiveGraviton) Info() Info { return massiveGravitonInfo() }

// Values implements Kernel.
func (g *MassiveGraviton) Values() Values { return cloneKernelValues(g.vals) }

// Lambda returns the range in metres.
func (g *MassiveGraviton) Lambda() float64 { return g.lambda }

// Factor returns k: 4/3 (coupling normalisation) or 1 (static).
func (g *MassiveGraviton) Factor() float64 { return g.k }

// Radial implements Central: the massive graviton minus Newton.
func (g *MassiveGraviton) Radial(mu, r float64) (ar, phi float64) {
	u := r / g.lambda
	phi = -mu / r * math.Expm1(g.logK-u)
	ar = -mu / (r * r) * math.Expm1(g.logK+log1pMinusX(u))
	return ar, phi
}

// log1pMinusX returns ln(1 + u) - u for u >= 0 without the cancellation of
// the direct difference at small u. With z = u/(2 + u), ln(1 + u) =
// 2 atanh z and u = 2z/(1 - z), so ln(1 + u) - u = -2z^2/(1 - z) +
// 2 (z^3/3 + z^5/5 + ...); for u <= 1, z <= 1/3 and 18 terms reach 1e-17.
func log1pMinusX(u float64) float64 {
	if u > 1 {
		return math.Log1p(u) - u
	}
	z := u / (2 + u)
	z2 := z * z
	var series float64
	pow := z * z2
	for n := 3; n <= 37; n += 2 {
		series += pow / float64(n)
		pow *= z2
	}
	return -2*z2/(1-z) + 2*series
}

// Accel implements Kernel.
func (g *MassiveGraviton) Accel(mu float64, x, _ vec.V) vec.V {
	r := x.Norm()
	ar, _ := g.Radial(mu, r)
	return x.Scale(ar / r)
}

// Energy implements Kernel.
func (g *MassiveGraviton) Energy(mu float64, x, _ vec.V) float64 {
	_, phi := g.Radial(mu, x.Norm())
	return phi
}
