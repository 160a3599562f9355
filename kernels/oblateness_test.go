package kernels

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/diff/fd"

	"mgorbit/integrator/reference"
	"mgorbit/kernels/vec"
)

func j2New(t *testing.T, j2, radius, tilt, azimuth float64) *Oblateness {
	t.Helper()
	k, err := New("j2", Values{Num: map[string]float64{"j2": j2, "radius": radius, "axis_tilt": tilt, "axis_azimuth": azimuth}})
	if err != nil {
		t.Fatal(err)
	}
	return k.(*Oblateness)
}

// With the axis along +z the acceleration has the textbook components
// a_x,y = -(3/2) J2 mu R^2 x,y / r^5 (1 - 5 z^2/r^2),
// a_z = -(3/2) J2 mu R^2 z / r^5 (3 - 5 z^2/r^2)
// (Vallado, Fundamentals of Astrodynamics and Applications; memory).
func TestOblatenessTextbookComponents(t *testing.T) {
	const mu, j2, radius = 3.986004e14, 1.08263e-3, 6.378137e6 // Earth's (memory); any values serve
	k := j2New(t, j2, radius, 0, 0)
	for _, x := range []vec.V{{7e6, 0, 0}, {0, 0, 8e6}, {5e6, -4e6, 3e6}, {-1e7, 2e6, -6e6}} {
		r := x.Norm()
		q := -1.5 * j2 * mu * radius * radius / math.Pow(r, 5)
		s := 5 * x[2] * x[2] / (r * r)
		want := vec.V{q * x[0] * (1 - s), q * x[1] * (1 - s), q * x[2] * (3 - s)}
		got := k.Accel(mu, x, vec.V{})
		if d := got.Sub(want).Norm() / want.Norm(); d > 1e-15 {
			t.Errorf("x=%v: acceleration %v, textbook %v (rel %.1e)", x, got, want, d)
		}
	}
	if a, e := k.Accel(mu, vec.V{}, vec.V{}), k.Energy(mu, vec.V{}, vec.V{}); a != (vec.V{}) || e != 0 {
		t.Errorf("at the centre: %v, %g; want zero", a, e)
	}
}

// a = -grad Phi for a tilted axis, by gonum's finite differences of the
// kernel's own potential (five-point stencil, step 1e-4 r: error ~1e-12).
func TestOblatenessForceIsMinusGradient(t *testing.T) {
	const mu = 2.5
	k := j2New(t, 0.03, 0.7, 0.6, -2.2)
	for _, x := range []vec.V{{1.1, 0.3, -0.4}, {-0.2, 2.0, 0.9}, {0.05, -0.1, 1.5}} {
		grad := fd.Gradient(nil, func(p []float64) float64 {
			return k.Energy(mu, vec.V{p[0], p[1], p[2]}, vec.V{})
		}, x[:], &fd.Settings{Formula: fivePoint, Step: 1e-4 * x.Norm()})
		a := k.Accel(mu, x, vec.V{})
		for i := range 3 {
			if d := math.Abs(a[i] + grad[i]); d > 1e-9*a.Norm() {
				t.Errorf("x=%v: a[%d] = %.12g, -dPhi/dx = %.12g", x, i, a[i], -grad[i])
			}
		}
	}
}

// A tilted axis is the +z case seen in a rotated frame: with R taking +z to
// s = (sin t cos a, sin t sin a, cos t), a_s(R x) = R a_z(x).
func TestOblatenessAxisRotation(t *testing.T) {
	const mu, tilt, az = 1.0, 0.9, 2.1
	kz := j2New(t, 1e-3, 0.5, 0, 0)
	ks := j2New(t, 1e-3, 0.5, tilt, az)
	// R = Rz(az) Ry(tilt): columns are the images of x, y, z
	st, ct := math.Sincos(tilt)
	sa, ca := math.Sincos(az)
	ex := vec.V{ct * ca, ct * sa, -st}
	ey := vec.V{-sa, ca, 0}
	ez := vec.V{st * ca, st * sa, ct}
	rot := func(p vec.V) vec.V { return ex.Scale(p[0]).AddScaled(p[1], ey).AddScaled(p[2], ez) }
	if d := ks.SymmetryAxis().Sub(ez).Norm(); d > 1e-16 {
		t.Errorf("axis %v, want %v", ks.SymmetryAxis(), ez)
	}
	for _, x := range []vec.V{{1, 0.2, 0.3}, {-0.4, 0.9, -0.7}} {
		want := rot(kz.Accel(mu, x, vec.V{}))
		got := ks.Accel(mu, rot(x), vec.V{})
		if d := got.Sub(want).Norm() / want.Norm(); d > 1e-14 {
			t.Errorf("x=%v: tilted %v, rotated %v (rel %.1e)", x, got, want, d)
		}
		if d := ks.Energy(mu, rot(x), vec.V{}) - kz.Energy(mu, x, vec.V{}); math.Abs(d) > 1e-16 {
			t.Errorf("x=%v: potentials differ by %g", x, d)
		}
	}
}

// An equatorial orbit's pericentre longitude advances by
// (d omega/dt + d Omega/dt) P = 2 pi J2 (R/p)^2 [(3/4)(5 - 1) - 3/2]
// = 3 pi J2 (R/p)^2 per orbit, from the first-order secular rates
// (Murray & Dermott, Solar System Dynamics, ch. 6; memory).
// Gauss's average of the kernel's force on the equatorial ellipse gives it.
func TestOblatenessEquatorialAdvance(t *testing.T) {
	const mu, a, radius = 1.0, 1.0, 0.4
	for _, j2 := range []float64{1e-3, -2e-4} {
		k := j2New(t, j2, radius, 0, 0)
		for _, e := range []float64{0.1, 0.5, 0.8} {
			got, err := reference.GaussAdvance(mu, a, e, func(x, v vec.V) vec.V { return k.Accel(mu, x, v) })
			if err != nil {
				t.Fatal(err)
			}
			p := a * (1 - e*e)
			want := 3 * math.Pi * j2 * (radius / p) * (radius / p)
			if rel := math.Abs(got/want - 1); rel > 1e-10 {
				t.Errorf("J2 %g e %g: advance %.12e, 3 pi J2 (R/p)^2 = %.12e (rel %.1e)", j2, e, got, want, rel)
			}
		}
	}
}

func TestOblatenessParameters(t *testing.T) {
	k := j2New(t, 1e-3, 7e6, 0, 0)
	if info := k.Info(); info.Role != Correction || info.VelocityDependent {
		t.Errorf("j2: role %v, velocity-dependent %v", info.Role, info.VelocityDependent)
	}
	if _, ok := Kernel(k).(Central); ok {
		t.Error("j2 claims to be central")
	}
	for _, c := range []struct {
		num  map[string]float64
		want string
	}{
		{map[string]float64{"radius": 1}, "j2 is required"},
		{map[string]float64{"j2": 1e-3}, "radius is required"},
		{map[string]float64{"j2": 1e-3, "radius": 0}, "out of range"},
		{map[string]float64{"j2": 1e-3, "radius": 1, "axis_tilt": 4}, "out of range"},
		{map[string]float64{"j2": 1e-3, "radius": 1, "pole": 1}, "unknown parameter"},
	} {
		if _, err := New("j2", Values{Num: c.num}); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("New(j2, %v): %v, want an error containing %q", c.num, err, c.want)
		}
	}
}
