package study

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"mgorbit/kernels"
)

// TestKeepGoingMarksRows: a leapfrog run whose energy error passes a tight
// tolerance stops with an accuracy error; with KeepGoing it finishes, the
// summary is marked, and exactly the trajectory samples where the energy
// (v^2/2 - mu/r, vis-viva) or the angular momentum |x x v|, recomputed here
// from the rows themselves, is past the tolerance carry the mark.
func TestKeepGoingMarksRows(t *testing.T) {
	const tol = 1e-3
	sc := testScenario(t, kernels.MustStack(kernels.Newton{}), 1, 1, 0.5, "leapfrog", 300.3, 4)
	sc.Integrator.EnergyTolerance, sc.Integrator.AngularMomentumTolerance = tol, tol
	_, err := Run(context.Background(), sc, Options{})
	var acc *AccuracyError
	if !errors.As(err, &acc) || !strings.Contains(err.Error(), "probe: relative energy error") || !strings.Contains(err.Error(), fmt.Sprintf("exceeds the tolerance %.3g", tol)) {
		t.Fatalf("without KeepGoing: %v, want an accuracy error naming the body and the tolerance", err)
	}

	st, err := Run(context.Background(), sc, Options{KeepGoing: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(st.Summaries) != 1 || !st.Summaries[0].ToleranceExceeded || len(st.Warnings) == 0 {
		t.Fatalf("summary not marked (%v) or no warning (%d)", st.Summaries[0].ToleranceExceeded, len(st.Warnings))
	}
	var e0, l0 float64
	marked, past := 0, 0
	for _, r := range st.Trajectory {
		if r.Body == 0 {
			if r.Exceeded {
				t.Fatalf("the centre, which has no orbit to check, is marked at t = %g", r.T)
			}
			continue
		}
		// the centre stays at rest at the origin: a test body pulls nothing
		e := 0.5*r.V.Norm2() - 1/r.X.Norm()
		l := r.X.Cross(r.V).Norm()
		if r.T == 0 {
			e0, l0 = e, l
		}
		de, dl := math.Abs(e/e0-1), math.Abs(l/l0-1)
		over := de > tol || dl > tol
		nearEdge := math.Abs(de/tol-1) < 1e-9 || math.Abs(dl/tol-1) < 1e-9
		if over != r.Exceeded && !nearEdge {
			t.Fatalf("t = %.6g: energy error %.4g, angular momentum error %.4g, marked %v", r.T, de, dl, r.Exceeded)
		}
		if r.Exceeded {
			marked++
		}
		if over {
			past++
		}
	}
	if marked == 0 || marked == len(st.Trajectory)/2 {
		t.Errorf("%d of %d probe samples marked: the case does not separate good from bad samples", marked, len(st.Trajectory)/2)
	}
	t.Logf("%d of %d probe samples past the tolerance %g, %d marked", past, len(st.Trajectory)/2, tol, marked)
}
