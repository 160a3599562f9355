package integrator

import (
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
)

// System is the state of all bodies: positions X (m), velocities V (m/s),
// and accelerations A at (X, V), which every Stepper leaves valid after a
// step (the observers use them to interpolate between steps).
type System struct {
	T  float64
	X  []vec.V
	V  []vec.V
	A  []vec.V
	GM []float64
}

// Clone returns a deep copy.
func (s *System) Clone() *System {
	c := &System{T: s.T}
	c.X = append([]vec.V(nil), s.X...)
	c.V = append([]vec.V(nil), s.V...)
	c.A = append([]vec.V(nil), s.A...)
	c.GM = append([]float64(nil), s.GM...)
	return c
}

// CopyFrom overwrites s with o's state without allocating (same size).
func (s *System) CopyFrom(o *System) {
	s.T = o.T
	copy(s.X, o.X)
	copy(s.V, o.V)
	copy(s.A, o.A)
	copy(s.GM, o.GM)
}

// Field evaluates the accelerations of all bodies under a kernel stack.
type Field struct {
	Stack   *kernels.Stack
	massive []int
}

// NewField prepares a field for bodies with the given GM values (0 = test body).
func NewField(stack *kernels.Stack, gm []float64) *Field {
	f := &Field{Stack: stack}
	for i, m := range gm {
		if m != 0 {
			f.massive = append(f.massive, i)
		}
	}
	return f
}

// Eval writes into a the acceleration of every body at positions x and
// velocities v.
func (f *Field) Eval(gm []float64, x, v, a []vec.V) {
	st := f.Stack
	for i := range x {
		var acc vec.V
		xi, vi := x[i], v[i]
		for _, j := range f.massive {
			if j == i {
				continue
			}
			acc = acc.Add(st.Accel(gm[j], xi.Sub(x[j]), vi.Sub(v[j])))
		}
		a[i] = acc
	}
}

// EvalBody returns the acceleration of body i alone.
func (f *Field) EvalBody(gm []float64, x, v []vec.V, i int) vec.V {
	var acc vec.V
	for _, j := range f.massive {
		if j != i {
			acc = acc.Add(f.Stack.Accel(gm[j], x[i].Sub(x[j]), v[i].Sub(v[j])))
		}
	}
	return acc
}

// Massive returns the indices of the bodies that pull.
func (f *Field) Massive() []int { return f.massive }

// Prime makes s.A valid for the current state; call it once before the
// first step.
func (f *Field) Prime(s *System) { f.Eval(s.GM, s.X, s.V, s.A) }
