package kernels

import (
	"math"

	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// Oblateness is the quadrupole (J2) term of an axisymmetric central body of
// equatorial radius R with its symmetry axis along the unit vector s:
//
//	Phi = (mu J2 R^2 / (2 r^3)) (3 (z/r)^2 - 1),   z = x.s
//	a   = (3 mu J2 R^2 / (2 r^5)) [(5 z^2/r^2 - 1) x - 2 z s]
//
// the second term of the exterior potential's expansion in Legendre
// polynomials, -(mu/r) [1 - J2 (R/r)^2 P2(z/r)] (Vallado, Fundamentals of
// Astrodynamics and Applications, and Murray & Dermott, Solar System
// Dynamics, ch. 6; memory). J2 > 0 is an oblate body. To first order
// in J2 it turns the pericentre and the node at
//
//	d omega/dt = (3/4) n J2 (R/p)^2 (5 cos^2 i - 1),  d Omega/dt = -(3/2) n J2 (R/p)^2 cos i
//
// with i measured from the body's equator (same sources; memory).
//
// The field is not central: the guard's |x x v| is not conserved on an
// inclined orbit (only its component along s is), and swings by about
// J2 (R/p)^2 sin^2 i. The same J2 and R apply to every massive source in
// the stack: meant for one dominant oblate body. The formula holds outside
// the body (r > R); below that the model is meaningless, and at r = 0 the
// term is set to zero. mu is G M of the body, the monopole the term rides on.
type Oblateness struct {
	j2, radius    float64
	tilt, azimuth float64
	axis          vec.V
	strengthPerMu float64 // J2 R^2
}

func init() {
	Register(oblatenessInfo(), newOblateness)
}

func oblatenessInfo() Info {
	return Info{
		Name:    "j2",
		Role:    Correction,
		Summary: "oblateness of the central body, Phi = (mu J2 R^2/(2 r^3)) (3 (z/r)^2 - 1) with z along its spin axis",
		Mu:      "G M of the oblate body (its monopole); J2 and R apply to every massive source alike",
		Params: append([]Param{
			{Name: "j2", Kind: Number, Dim: units.Dimensionless,
				Doc:      "J2, the quadrupole coefficient (positive for an oblate body)",
				Required: true, Min: math.Inf(-1), Max: math.Inf(1)},
			{Name: "radius", Kind: Number, Dim: units.Length, Unit: "m",
				Doc:      "the body's equatorial radius R, the reference radius of J2",
				Required: true, Min: 0, MinOpen: true, Max: math.Inf(1)},
		}, spinAxisParams()...),
	}
}

// spinAxisParams declare the direction of a body's spin axis, shared by the
// oblateness and frame-dragging kernels.
func spinAxisParams() []Param {
	return []Param{
		{Name: "axis_tilt", Kind: Number, Dim: units.Angle, Unit: "rad",
			Doc:     "angle between the spin axis and the frame's +z axis (default 0: the axis is +z)",
			Default: 0, Min: 0, Max: math.Pi},
		{Name: "axis_azimuth", Kind: Number, Dim: units.Angle, Unit: "rad",
			Doc:     "azimuth of the tilted axis, from +x towards +y (no effect when axis_tilt is 0)",
			Default: 0, Min: -2 * math.Pi, Max: 2 * math.Pi},
	}
}

// spinAxis is the unit vector (sin t cos a, sin t sin a, cos t).
func spinAxis(tilt, azimuth float64) vec.V {
	st, ct := math.Sincos(tilt)
	sa, ca := math.Sincos(azimuth)
	return vec.V{st * ca, st * sa, ct}
}

func newOblateness(v Values) (Kernel, error) {
	k := &Oblateness{j2: v.Num["j2"], radius: v.Num["radius"],
		tilt: v.Num["axis_tilt"], azimuth: v.Num["axis_azimuth"]}
	k.axis = spinAxis(k.tilt, k.azimuth)
	k.strengthPerMu = k.j2 * k.radius * k.radius
	return k, nil
}

// Info implements Kernel.
func (*Oblateness) Info() Info { return oblatenessInfo() }

// Values implements Kernel.
func (k *Oblateness) Values() Values {
	return Values{Num: map[string]float64{"j2": k.j2, "radius": k.radius,
		"axis_tilt": k.tilt, "axis_azimuth": k.azimuth}, Str: map[string]string{}}
}

// J2 returns the quadrupole coefficient.
func (k *Oblateness) J2() float64 { return k.j2 }

// Radius returns the reference radius (m).
func (k *Oblateness) Radius() float64 { return k.radius }

// SymmetryAxis returns the unit spin axis: the field is symmetric about it,
// so the angular momentum along it is conserved.
func (k *Oblateness) SymmetryAxis() vec.V { return k.axis }

// Accel implements Kernel.
func (k *Oblateness) Accel(mu float64, x, _ vec.V) vec.V {
	r2 := x.Dot(x)
	if r2 == 0 {
		return vec.V{}
	}
	z := x.Dot(k.axis)
	r := math.Sqrt(r2)
	q := 1.5 * mu * k.strengthPerMu / (r2 * r2 * r)
	return x.Scale(q*(5*z*z/r2-1)).AddScaled(-2*q*z, k.axis)
}

// Energy implements Kernel: the quadrupole potential.
func (k *Oblateness) Energy(mu float64, x, _ vec.V) float64 {
	r2 := x.Dot(x)
	if r2 == 0 {
		return 0
	}
	z := x.Dot(k.axis)
	r := math.Sqrt(r2)
	return 0.5 * mu * k.strengthPerMu / (r2 * r) * (3*z*z/r2 - 1)
}
