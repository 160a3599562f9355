package kernels

import (
	"math"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// InverseArea is the dimension of the cosmological constant, m^-2.
var InverseArea = units.Dim{L: -2}

// Cosmological is the cosmological-constant term: the Newtonian limit of the
// Schwarzschild-de Sitter field, g00 = -(1 - 2 mu/(c^2 r) - Lambda r^2/3),
//
//	Phi = -Lambda c^2 r^2 / 6,   a_r = +Lambda c^2 r / 3
//
// a repulsion growing with distance for Lambda > 0 (Kerr, Hauck & Mashhoon,
// Class. Quantum Grav. 20, 2727 (2003); memory). As a perturbation R = k r,
// k = Lambda c^2/3, Gauss's equation gives per orbit
//
//	Delta varpi = (k/(mu e)) Int_0^2pi -r^3 cos f df = 3 pi k a^3 sqrt(1 - e^2)/mu
//	            = pi Lambda c^2 a^3 sqrt(1 - e^2) / mu
//
// using Int_0^2pi cos f/(1 + e cos f)^3 df = -3 pi e/(1 - e^2)^(5/2) (the e
// derivative of Int (1 + e cos f)^-2 df = 2 pi/(1 - e^2)^(3/2)); the same
// result as the cited paper (memory). With the measured Lambda = 1.1e-52 m^-2
// it is about 4e-15 arcsec per century for Mercury, far below any measurement.
//
// The term belongs to space, not to a source, and does not depend on mu;
// the stack adds it once per massive source, relative to that source. That
// is right for test bodies about one massive body; with several massive
// bodies it is counted once per source (twice for the relative orbit of a
// massive pair), so use test bodies with it. Bound orbits end where the
// attraction mu/r^2 falls to k r, at r = (mu/k)^(1/3).
type Cosmological struct {
	lambda float64
	k      float64 // Lambda c^2 / 3
}

func init() {
	Register(cosmologicalInfo(), newCosmological)
}

func cosmologicalInfo() Info {
	return Info{
		Name:    "cosmological-constant",
		Role:    Correction,
		Summary: "cosmological constant, the Newtonian limit of Schwarzschild-de Sitter: a_r = +Lambda c^2 r/3",
		Mu:      "not used: the term is the same about any source (counted once per massive source)",
		Params: []Param{
			{Name: "lambda_cc", Kind: Number, Dim: InverseArea, Unit: "m^-2",
				Doc:      `the cosmological constant Lambda (any sign), e.g. "1.1e-52 m^-2"`,
				Required: true, Min: math.Inf(-1), Max: math.Inf(1)},
		},
	}
}

func newCosmological(v Values) (Kernel, error) {
	l := v.Num["lambda_cc"]
	return &Cosmological{lambda: l, k: l * units.C * units.C / 3}, nil
}

// Info implements Kernel.
func (*Cosmological) Info() Info { return cosmologicalInfo() }

// Values implements Kernel.
func (k *Cosmological) Values() Values {
	return Values{Num: map[string]float64{"lambda_cc": k.lambda}, Str: map[string]string{}}
}

// Lambda returns the cosmological constant (m^-2).
func (k *Cosmological) Lambda() float64 { return k.lambda }

// Radial implements Central.
func (k *Cosmological) Radial(_, r float64) (ar, phi float64) {
	return k.k * r, -0.5 * k.k * r * r
}

// Accel implements Kernel.
func (k *Cosmological) Accel(_ float64, x, _ vec.V) vec.V { return x.Scale(k.k) }

// Energy implements Kernel.
func (k *Cosmological) Energy(_ float64, x, _ vec.V) float64 { return -0.5 * k.k * x.Dot(x) }
