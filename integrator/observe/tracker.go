package observe

import (
	"math"

	"mgorbit/kernels/vec"
)

// Apsis is a refined pericentre or apocentre passage of a relative orbit.
type Apsis struct {
	T float64 // time, s
	X vec.V   // relative position there
	R float64 // |X|
}

// Tracker follows one relative orbit (a body about its primary) step by
// step and records its apsides and azimuth crossings.
type Tracker struct {
	Peri, Apo []Apsis
	// Crossings are the times at which the in-plane azimuth has advanced by
	// a whole turn from its start (for the azimuthal period of circular
	// orbits).
	Crossings []float64
	// RMin and RMax are the extreme distances seen at the steps.
	RMin, RMax float64

	normal, p, q vec.V // orbit-plane basis: normal from the initial angular momentum
	started      bool
	t0           float64
	x0, v0, a0   vec.V
	phi          float64 // unwrapped azimuth at the last step
	phiStart     float64
	turns        int
}

// NewTracker starts a tracker at relative state (x, v, a) at time t.
func NewTracker(t float64, x, v, a vec.V) *Tracker {
	tr := &Tracker{RMin: x.Norm(), RMax: x.Norm()}
	tr.normal = x.Cross(v).Unit()
	tr.p = x.Unit()
	tr.q = tr.normal.Cross(tr.p)
	tr.t0, tr.x0, tr.v0, tr.a0 = t, x, v, a
	tr.phi = tr.Azimuth(x)
	tr.phiStart = tr.phi
	tr.started = true
	return tr
}

// Azimuth is the angle of x in the initial orbit plane, measured from the
// initial position (radians, in (-pi, pi]).
func (tr *Tracker) Azimuth(x vec.V) float64 { return math.Atan2(x.Dot(tr.q), x.Dot(tr.p)) }

// Observe takes the relative state at the end of the next step.
func (tr *Tracker) Observe(t float64, x, v, a vec.V) {
	r := x.Norm()
	tr.RMin = math.Min(tr.RMin, r)
	tr.RMax = math.Max(tr.RMax, r)
	g0, g1 := tr.x0.Dot(tr.v0), x.Dot(v)
	if (g0 < 0 && g1 >= 0) || (g0 > 0 && g1 <= 0) {
		h := Hermite{X0: tr.x0, V0: tr.v0, A0: tr.a0, X1: x, V1: v, A1: a, H: t - tr.t0}
		s := h.RadialRoot()
		xs, _ := h.At(s)
		ap := Apsis{T: tr.t0 + s*(t-tr.t0), X: xs, R: xs.Norm()}
		if g0 < 0 {
			tr.Peri = append(tr.Peri, ap)
		} else {
			tr.Apo = append(tr.Apo, ap)
		}
	}
	// azimuth crossings of whole turns, interpolated linearly in the angle
	phi := tr.Azimuth(x)
	d := phi - math.Mod(tr.phi, 2*math.Pi)
	// unwrap into (-pi, pi]
	d = math.Remainder(d, 2*math.Pi)
	next := tr.phi + d
	target := tr.phiStart + 2*math.Pi*float64(tr.turns+1)
	if next >= target && tr.phi < target {
		f := (target - tr.phi) / (next - tr.phi)
		tr.Crossings = append(tr.Crossings, tr.t0+f*(t-tr.t0))
		tr.turns++
	}
	tr.phi = next
	tr.t0, tr.x0, tr.v0, tr.a0 = t, x, v, a
}
