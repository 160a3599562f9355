package kernels

import (
	"fmt"
	"math"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// Yukawa is a fifth force of strength alpha and range lambda on top of
// Newtonian gravity:
//
//	Phi = -(mu/r) (1 + alpha e^(-r/lambda))
//	a_r = -(mu/r^2) [1 + alpha (1 + r/lambda) e^(-r/lambda)]
//
// As a correction it returns only the alpha terms. mu is G M at large
// distance (r >> lambda); at r << lambda the force is (1 + alpha) mu/r^2.
// The range is given directly or through the mediator's rest energy,
// lambda = hbar c / (m c^2) (1e-23 eV gives 1.973e16 m).
//
// The exchanged field (scalar by default, or tensor) does not change orbits;
// it is kept for light deflection, where a scalar force is invisible and a
// tensor one bends light like the potential it adds.
type Yukawa struct {
	vals     Values
	alpha    float64
	lambda   float64
	exchange string
}

func init() {
	Register(yukawaInfo(), newYukawa)
}

func yukawaInfo() Info {
	return Info{
		Name:    "yukawa",
		Role:    Correction,
		Summary: "Yukawa fifth force, Phi = -(mu/r)(1 + alpha e^(-r/lambda)); returns the alpha term",
		Mu:      "G M at large distance (r >> lambda); the force at r << lambda is (1 + alpha) mu/r^2",
		Params: []Param{
			{Name: "alpha", Kind: Number, Dim: units.Dimensionless,
				Doc:      "strength relative to Newton (any sign)",
				Required: true, Min: math.Inf(-1), Max: math.Inf(1)},
			rangeLengthParam("lambda", "range of the force; give this or mediator_mass"),
			rangeEnergyParam("mediator_mass", "rest energy m c^2 of the exchanged field; give this or lambda"),
			{Name: "exchange", Kind: Choice, Choices: []string{"scalar", "tensor"}, DefaultChoice: "scalar",
				Doc: "spin of the exchanged field: scalar forces do not bend light, tensor ones do (no effect on orbits)"},
		},
	}
}

// rangeLengthParam and rangeEnergyParam declare the two ways of giving a range.
func rangeLengthParam(name, doc string) Param {
	return Param{Name: name, Kind: Number, Dim: units.Length, Unit: "m", Doc: doc,
		Default: math.NaN(), Min: 0, MinOpen: true, Max: math.Inf(1)}
}

func rangeEnergyParam(name, doc string) Param {
	return Param{Name: name, Kind: Number, Dim: units.Energy, Unit: "eV", Doc: doc,
		Default: math.NaN(), Min: 0, MinOpen: true, Max: math.Inf(1)}
}

// mediatorRange returns the range from exactly one of a length parameter
// and a rest-energy parameter.
func mediatorRange(kernel string, v Values, lengthName, massName string) (float64, error) {
	lambda, haveRange := v.Num[lengthName]
	mass, haveMass := v.Num[massName]
	switch {
	case haveRange && haveMass:
		return 0, fmt.Errorf("kernel %s: give either %s or %s, not both", kernel, lengthName, massName)
	case haveRange:
		return lambda, nil
	case haveMass:
		lambda = units.RangeFromMass(mass)
		if math.IsInf(lambda, 0) || lambda <= 0 {
			return 0, fmt.Errorf("kernel %s: %s = %g eV gives a range outside the float64 range", kernel, massName, mass)
		}
		return lambda, nil
	}
	return 0, fmt.Errorf("kernel %s: the range is missing: give %s (a length) or %s (a rest energy in eV)",
		kernel, lengthName, massName)
}

func newYukawa(v Values) (Kernel, error) {
	lambda, err := mediatorRange("yukawa", v, "lambda", "mediator_mass")
	if err != nil {
		return nil, err
	}
	alpha, ok := v.Num["alpha"]
	if !ok || math.IsNaN(alpha) || math.IsInf(alpha, 0) {
		return nil, fmt.Errorf("kernel yukawa: alpha must be a finite number")
	}
	ex := v.Str["exchange"]
	if ex == "" {
		ex = "scalar"
	}
	return &Yukawa{vals: cloneKernelValues(v), alpha: alpha, lambda: lambda, exchange: ex}, nil
}

// cloneKernelValues keeps a kernel's parameters safe from later edits of the map
// it was built from.
func cloneKernelValues(v Values) Values {
	c := Values{Num: map[string]float64{}, Str: map[string]string{}}
	for k, x := range v.Num {
		c.Num[k] = x
	}
	for k, s := range v.Str {
		c.Str[k] = s
	}
	return c
}

// Info implements Kernel.
func (*Yukawa) Info() Info { return yukawaInfo() }

// Values implements Kernel: the parameters as given (lambda or
// mediator_mass, whichever was used).
func (y *Yukawa) Values() Values { return cloneKernelValues(y.vals) }

// Alpha returns the strength.
func (y *Yukawa) Alpha() float64 { return y.alpha }

// Lambda returns the range in metres.
func (y *Yukawa) Lambda() float64 { return y.lambda }

// Exchange returns "scalar" or "tensor".
func (y *Yukawa) Exchange() string { return y.exchange }

// Radial implements Central: the alpha terms only.
func (y *Yukawa) Radial(mu, r float64) (ar, phi float64) {
	u := r / y.lambda
	e := y.alpha * math.Exp(-u)
	phi = -mu / r * e
	return phi / r * (1 + u), phi
}

// Accel implements Kernel.
func (y *Yukawa) Accel(mu float64, x, _ vec.V) vec.V {
	r := x.Norm()
	ar, _ := y.Radial(mu, r)
	return x.Scale(ar / r)
}

// Energy implements Kernel.
func (y *Yukawa) Energy(mu float64, x, _ vec.V) float64 {
	_, phi := y.Radial(mu, x.Norm())
	return phi
}
