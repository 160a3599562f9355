package observe

import (
	"math"
	"reflect"
	"testing"

	"mgorbit/kernels/vec"
)

// ellipse is the Kepler orbit x = (a(cos E - e), b sin E) with mu = 1,
// parametrised by the eccentric anomaly through Kepler's equation
// M = E - e sin E (any celestial-mechanics text), solved by Newton's method.
func ellipse(t, a, e float64) (x, v, acc vec.V) {
	n := math.Pow(a, -1.5)
	m := n * t
	E := m
	for k := 0; k < 50; k++ {
		E -= (E - e*math.Sin(E) - m) / (1 - e*math.Cos(E))
	}
	b := a * math.Sqrt(1-e*e)
	dE := n / (1 - e*math.Cos(E))
	x = vec.V{a * (math.Cos(E) - e), b * math.Sin(E), 0}
	v = vec.V{-a * math.Sin(E) * dE, b * math.Cos(E) * dE, 0}
	r := x.Norm()
	acc = x.Scale(-1 / (r * r * r))
	return x, v, acc
}

// TestTrackerSnapshotResumes: a tracker rebuilt from a snapshot halfway
// continues exactly as the original, and the snapshot is not changed by
// later observations. The state struct must cover every Tracker field.
func TestTrackerSnapshotResumes(t *testing.T) {
	if a, b := reflect.TypeOf(Tracker{}).NumField(), reflect.TypeOf(TrackerState{}).NumField(); a != b {
		t.Fatalf("Tracker has %d fields, TrackerState %d: the snapshot misses some state", a, b)
	}
	const a, e, h = 1.0, 0.4, 0.05
	x, v, acc := ellipse(0, a, e)
	orig := NewTracker(0, x, v, acc)
	var copyAt TrackerState
	var resumed *Tracker
	for k := 1; k <= 800; k++ {
		tk := float64(k) * h
		x, v, acc := ellipse(tk, a, e)
		orig.Observe(tk, x, v, acc)
		if resumed != nil {
			resumed.Observe(tk, x, v, acc)
		}
		if k == 333 {
			copyAt = orig.Snapshot()
			resumed = RestoreTracker(copyAt)
		}
	}
	if len(copyAt.Peri) >= len(orig.Peri) {
		t.Fatalf("snapshot has %d pericentres, the finished tracker %d: it shares storage", len(copyAt.Peri), len(orig.Peri))
	}
	if !reflect.DeepEqual(orig.Snapshot(), resumed.Snapshot()) {
		t.Error("resumed tracker differs from the uninterrupted one")
	}
	// 800 steps of 0.05 with period 2 pi: 6 pericentres
	if len(orig.Peri) != 6 {
		t.Errorf("%d pericentre passages in %.0f time units of period 2 pi, want 6", len(orig.Peri), 800*h)
	}
}
