package kernels

import (
	"fmt"
	"math"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// SpinAngularMomentum is the dimension of G J, the way a spin angular
// momentum J is held (masses are held as G M): "kg*m^2/s" parses to it.
var SpinAngularMomentum = units.Dim{L: 5, T: -3}

// LenseThirring is the gravitomagnetic (frame-dragging) acceleration of a
// test body about a body of spin angular momentum J along the unit axis s:
//
//	a = (2 G/(c^2 r^3)) [(3/r^2) (J.x) (x x v) + v x J],   J = J s
//
// (general relativity's Lense-Thirring term; IERS Conventions (2010),
// Petit & Luzum eds., eq. 10.12 at gamma = 1; memory). It is v x B with
// B = (2 G/(c^2 r^3)) [J - 3 (J.r^) r^], a dipole: no work is done, so it
// adds nothing to the conserved energy. Averaged over an orbit it turns the
// node and the pericentre (relative to the body's equator) at
//
//	d Omega/dt = 2 G J / (c^2 a^3 (1 - e^2)^(3/2)),   d omega/dt = -6 G J cos i / (c^2 a^3 (1 - e^2)^(3/2))
//
// (Lense & Thirring, Phys. Z. 19, 156 (1918); Ciufolini, Phys. Rev. Lett.
// 56, 278 (1986); memory). J is given either in SI (as G J, like masses)
// or as the dimensionless spin chi = c J/(G M^2); with chi, G J = chi
// mu^2/c follows each source's mu, otherwise the same J applies to every
// massive source (meant for one dominant spinning body). At r = 0 the term
// is set to zero.
type LenseThirring struct {
	gj, chi       float64 // exactly one is NaN
	tilt, azimuth float64
	axis          vec.V
}

func init() {
	Register(lenseThirringInfo(), newLenseThirring)
}

func lenseThirringInfo() Info {
	return Info{
		Name:    "lense-thirring",
		Role:    Correction,
		Summary: "frame dragging by the central body's spin, a = (2G/(c^2 r^3)) [3 (J.x)(x x v)/r^2 + v x J]",
		Mu: "G M of the spinning body; it enters only through spin (G J = spin mu^2/c), " +
			"the acceleration itself depends on G J",
		VelocityDependent: true,
		Params: append([]Param{
			{Name: "angular_momentum", Kind: Number, Dim: SpinAngularMomentum, Unit: "kg*m^2/s",
				Doc:     "the body's spin angular momentum J (held as G J in m^5 s^-3, as masses are held as G M); give this or spin",
				Default: math.NaN(), Min: 0, Max: math.Inf(1)},
			{Name: "spin", Kind: Number, Dim: units.Dimensionless,
				Doc:     "dimensionless spin chi = c J/(G M^2) (at most 1 for a black hole); give this or angular_momentum",
				Default: math.NaN(), Min: 0, Max: math.Inf(1)},
		}, spinAxisParams()...),
	}
}

func newLenseThirring(v Values) (Kernel, error) {
	gj, haveJ := v.Num["angular_momentum"]
	chi, haveChi := v.Num["spin"]
	switch {
	case haveJ && haveChi:
		return nil, fmt.Errorf("kernel lense-thirring: give either angular_momentum or spin, not both")
	case !haveJ && !haveChi:
		return nil, fmt.Errorf("kernel lense-thirring: the spin is missing: give angular_momentum (in kg*m^2/s) or spin (c J/(G M^2))")
	case haveJ:
		chi = math.NaN()
	default:
		gj = math.NaN()
	}
	k := &LenseThirring{gj: gj, chi: chi, tilt: v.Num["axis_tilt"], azimuth: v.Num["axis_azimuth"]}
	k.axis = spinAxis(k.tilt, k.azimuth)
	return k, nil
}

// Info implements Kernel.
func (*LenseThirring) Info() Info { return lenseThirringInfo() }

// Values implements Kernel: the spin as given (angular_momentum or spin).
func (k *LenseThirring) Values() Values {
	v := Values{Num: map[string]float64{"axis_tilt": k.tilt, "axis_azimuth": k.azimuth}, Str: map[string]string{}}
	if math.IsNaN(k.chi) {
		v.Num["angular_momentum"] = k.gj
	} else {
		v.Num["spin"] = k.chi
	}
	return v
}

// GJ returns G J (m^5 s^-3) for a source of parameter mu.
func (k *LenseThirring) GJ(mu float64) float64 {
	if math.IsNaN(k.chi) {
		return k.gj
	}
	return k.chi * mu * mu / units.C
}

// SymmetryAxis returns the unit spin axis.
func (k *LenseThirring) SymmetryAxis() vec.V { return k.axis }

// Accel implements Kernel.
func (k *LenseThirring) Accel(mu float64, x, v vec.V) vec.V {
	r2 := x.Dot(x)
	if r2 == 0 {
		return vec.V{}
	}
	j := k.axis.Scale(k.GJ(mu))
	q := 2 * invC2 / (r2 * math.Sqrt(r2))
	return x.Cross(v).Scale(q*3*j.Dot(x)/r2).AddScaled(q, v.Cross(j))
}

// Energy implements Kernel: the force does no work, so it adds nothing.
func (*LenseThirring) Energy(float64, vec.V, vec.V) float64 { return 0 }
