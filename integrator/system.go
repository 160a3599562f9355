package integrator

import (
	"math"

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
//
// Above a few thousand body-source pairs the loop over bodies is split
// across GOMAXPROCS goroutines (SetWorkers caps them). Each body's sum over
// the sources runs in the same order whatever the split, so the results
// are bit-identical for any worker count. A plain-Newton stack takes an
// inline formula instead of the kernel calls.
type Field struct {
	Stack   *kernels.Stack
	massive []int

	newton bool
	mx     []vec.V   // massive bodies' positions, gathered per Eval
	mgm    []float64 // and their GM
	pool   workPool
}

// NewField prepares a field for bodies with the given GM values (0 = test body).
func NewField(stack *kernels.Stack, gm []float64) *Field {
	f := &Field{Stack: stack, newton: stack.NewtonOnly()}
	for i, m := range gm {
		if m != 0 {
			f.massive = append(f.massive, i)
		}
	}
	f.mx = make([]vec.V, len(f.massive))
	f.mgm = make([]float64, len(f.massive))
	return f
}

// SetWorkers caps the goroutines of the body loops (Eval, and the
// Wisdom-Holman drifts and kicks); n <= 0 restores the default, GOMAXPROCS.
func (f *Field) SetWorkers(n int) { f.pool.workers = n }

// evalChunk is the fewest body-source pairs per worker: a pair costs a few
// ns, a goroutine start about a microsecond.
const evalChunk = 8192

// Eval writes into a the acceleration of every body at positions x and
// velocities v.
func (f *Field) Eval(gm []float64, x, v, a []vec.V) {
	for k, j := range f.massive {
		f.mx[k] = x[j]
		f.mgm[k] = gm[j]
	}
	if nb, ok := f.Stack.Base.(kernels.NBody); ok {
		f.evalNBody(nb, gm, x, v, a)
		return
	}
	n := len(x)
	m := len(f.massive)
	if m == 0 {
		clear(a[:n])
		return
	}
	chunk := (evalChunk + m - 1) / m
	if f.pool.count(n, chunk) <= 1 {
		f.evalRange(x, v, a, 0, n)
		return
	}
	f.pool.run(n, chunk, func(lo, hi int) { f.evalRange(x, v, a, lo, hi) })
}

func (f *Field) evalRange(x, v, a []vec.V, lo, hi int) {
	if f.newton {
		f.evalNewton(x, a, lo, hi)
		return
	}
	st := f.Stack
	for i := lo; i < hi; i++ {
		var acc vec.V
		xi, vi := x[i], v[i]
		for k, j := range f.massive {
			if j == i {
				continue
			}
			acc = acc.Add(st.Accel(f.mgm[k], xi.Sub(f.mx[k]), vi.Sub(v[j])))
		}
		a[i] = acc
	}
}

// evalNewton is the plain-Newton loop: a = -sum GM_j (x - x_j)/|x - x_j|^3,
// over flat component views (see flat).
func (f *Field) evalNewton(x, a []vec.V, lo, hi int) {
	mx := flat(f.mx)
	mgm, idx := f.mgm, f.massive
	m := len(mgm)
	mx = mx[:3*m]
	idx = idx[:m]
	xf := flat(x)
	af := flat(a)
	if m == 1 {
		// one source (test bodies about one mass): no inner loop
		c0, c1, c2, gm, self := mx[0], mx[1], mx[2], mgm[0], idx[0]
		xf = xf[3*lo : 3*hi]
		af = af[3*lo : 3*hi]
		for k := 0; k+2 < len(xf); k += 3 {
			dx, dy, dz := xf[k]-c0, xf[k+1]-c1, xf[k+2]-c2
			r2 := dx*dx + dy*dy + dz*dz
			inv := gm / (r2 * math.Sqrt(r2))
			af[k], af[k+1], af[k+2] = -(dx * inv), -(dy * inv), -(dz * inv)
		}
		if self >= lo && self < hi {
			a[self] = vec.V{}
		}
		return
	}
	for i := lo; i < hi; i++ {
		xi0, xi1, xi2 := xf[3*i], xf[3*i+1], xf[3*i+2]
		var ax, ay, az float64
		for k := 0; k < m; k++ {
			if idx[k] == i {
				continue
			}
			dx, dy, dz := xi0-mx[3*k], xi1-mx[3*k+1], xi2-mx[3*k+2]
			r2 := dx*dx + dy*dy + dz*dz
			inv := mgm[k] / (r2 * math.Sqrt(r2))
			ax -= dx * inv
			ay -= dy * inv
			az -= dz * inv
		}
		af[3*i], af[3*i+1], af[3*i+2] = ax, ay, az
	}
}

// evalNBody is the path for base laws that are not a sum of pair forces:
// the base gives all accelerations at once, the corrections add pairwise.
func (f *Field) evalNBody(nb kernels.NBody, gm []float64, x, v, a []vec.V) {
	nb.NBodyAccel(gm, x, v, a)
	if len(f.Stack.Corrections) == 0 {
		return
	}
	for i := range x {
		a[i] = a[i].Add(f.correctionsOn(gm, x, v, i))
	}
}

// evalNBodyOne is evalNBody for body i alone.
func (f *Field) evalNBodyOne(nb kernels.NBody, gm []float64, x, v []vec.V, i int) vec.V {
	a := make([]vec.V, len(x))
	nb.NBodyAccel(gm, x, v, a)
	return a[i].Add(f.correctionsOn(gm, x, v, i))
}

// correctionsOn sums the stack's corrections on body i from every massive body.
func (f *Field) correctionsOn(gm []float64, x, v []vec.V, i int) vec.V {
	var acc vec.V
	for _, j := range f.massive {
		if j == i {
			continue
		}
		for _, c := range f.Stack.Corrections {
			acc = acc.Add(c.Accel(gm[j], x[i].Sub(x[j]), v[i].Sub(v[j])))
		}
	}
	return acc
}

// EvalBody returns the acceleration of body i alone.
func (f *Field) EvalBody(gm []float64, x, v []vec.V, i int) vec.V {
	if nb, ok := f.Stack.Base.(kernels.NBody); ok {
		return f.evalNBodyOne(nb, gm, x, v, i)
	}
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
