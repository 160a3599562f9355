package observe

import "mgorbit/kernels/vec"

// TrackerState is everything a Tracker has gathered, with every field
// exported so that a checkpoint can store it (gob keeps float64 bits
// exactly). A tracker restored from it continues as the original would.
type TrackerState struct {
	Peri, Apo  []Apsis
	Crossings  []float64
	RMin, RMax float64

	Normal, P, Q vec.V
	Started      bool
	T0           float64
	X0, V0, A0   vec.V
	Phi          float64
	PhiStart     float64
	Turns        int
}

// Snapshot returns a copy of the tracker's state; later observations do
// not change it.
func (tr *Tracker) Snapshot() TrackerState {
	return TrackerState{
		Peri: append([]Apsis(nil), tr.Peri...), Apo: append([]Apsis(nil), tr.Apo...),
		Crossings: append([]float64(nil), tr.Crossings...),
		RMin:      tr.RMin, RMax: tr.RMax,
		Normal: tr.normal, P: tr.p, Q: tr.q, Started: tr.started,
		T0: tr.t0, X0: tr.x0, V0: tr.v0, A0: tr.a0,
		Phi: tr.phi, PhiStart: tr.phiStart, Turns: tr.turns,
	}
}

// RestoreTracker rebuilds a tracker from a snapshot.
func RestoreTracker(s TrackerState) *Tracker {
	return &Tracker{
		Peri: append([]Apsis(nil), s.Peri...), Apo: append([]Apsis(nil), s.Apo...),
		Crossings: append([]float64(nil), s.Crossings...),
		RMin:      s.RMin, RMax: s.RMax,
		normal: s.Normal, p: s.P, q: s.Q, started: s.Started,
		t0: s.T0, x0: s.X0, v0: s.V0, a0: s.A0,
		phi: s.Phi, phiStart: s.PhiStart, turns: s.Turns,
	}
}
