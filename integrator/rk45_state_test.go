package integrator

import (
	"math"
	"testing"

	"mgorbit/kernels"
)

// TestRK45StateCarriesOver: an RK45 restored from MarshalBinary after some
// steps continues with the same substeps, to the bit, as the original; a
// fresh stepper at the same state does not (the proposed substep matters).
func TestRK45StateCarriesOver(t *testing.T) {
	stack := kernels.MustStack(kernels.Newton{})
	x, v := pericentreState(1, 1, 0.6)
	s := twoBody(1, x, v)
	f := NewField(stack, s.GM)
	f.Prime(s)
	orig := NewRK45(1e-10)
	h := 2 * math.Pi / 17.3
	for k := 0; k < 9; k++ {
		orig.Step(s, f, h)
	}
	state, _ := orig.MarshalBinary()
	restored, fresh := &RK45{}, NewRK45(1e-10)
	if err := restored.UnmarshalBinary(state); err != nil {
		t.Fatal(err)
	}
	if restored.UnmarshalBinary(state[:5]) == nil {
		t.Error("a short state was accepted")
	}
	a, b, c := s.Clone(), s.Clone(), s.Clone()
	for k := 0; k < 9; k++ {
		orig.Step(a, f, h)
		restored.Step(b, f, h)
		fresh.Step(c, f, h)
	}
	if a.X[1] != b.X[1] || a.V[1] != b.V[1] || orig.Substeps != restored.Substeps || orig.Rejected != restored.Rejected {
		t.Errorf("restored stepper diverged: x %v vs %v, substeps %d vs %d", a.X[1], b.X[1], orig.Substeps, restored.Substeps)
	}
	if a.X[1] == c.X[1] {
		t.Error("a fresh stepper follows the same substeps: the test cannot tell state from none")
	}
}
