package study

import (
	"context"
	"errors"
	"fmt"
	"math"

	"mgorbit/integrator"
	"mgorbit/integrator/observe"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
)

// Setup is what an integration needs: bodies, stack, method and step.
type Setup struct {
	Names   []string
	GM      []float64
	Primary []int // index of each body's primary, -1 for none
	X0, V0  []vec.V
	// Radius is each body's radius in m (0 for a point): the collision check.
	Radius []float64

	Stack       *kernels.Stack
	Method      string
	Tolerance   float64 // rk45 only
	H           float64
	Steps       int64
	OutputEvery int

	EnergyTol, AngMomTol float64
	// KeepGoing records a tolerance breach instead of stopping the run.
	KeepGoing bool
}

// Row is one trajectory sample of one body.
type Row struct {
	T    float64
	Body int
	X, V vec.V
	// R is the distance from the primary (from the origin without one).
	R float64
	// EnergyErr is the relative error of the conserved orbital energy
	// about the primary; NaN where it is not conserved (perturbed orbits).
	EnergyErr float64
	// Exceeded marks a sample at which this body's energy or angular
	// momentum (or the system's energy, for a massive body) was past the
	// tolerance; only a KeepGoing run gets that far.
	Exceeded bool
}

// Result is one integration's measurements.
type Result struct {
	Orbits []observe.Orbit // per body; zero value for bodies without a primary
	// MaxEnergyErr and MaxAngMomErr are the largest relative errors of the
	// relative orbit's conserved energy and angular momentum seen at the
	// output cadence; NaN where not conserved.
	MaxEnergyErr, MaxAngMomErr []float64
	// Isolated marks bodies whose orbit about the primary is an isolated
	// two-body problem (so its energy is conserved and the semi-analytic
	// reference applies).
	Isolated []bool
	// SystemEnergyErr is the relative error of the total energy of the
	// massive bodies (NaN for velocity-dependent stacks or one massive body).
	SystemEnergyErr float64
	Trajectory      []Row
	Steps           int64
	// Breaches lists tolerance breaches seen with KeepGoing.
	Breaches []string
	// Exceeded marks the bodies with a tolerance breach (KeepGoing).
	Exceeded []bool
}

// AccuracyError reports a run whose conserved quantities drifted past the
// tolerance.
type AccuracyError struct{ Msg string }

func (e *AccuracyError) Error() string { return e.Msg }

// ErrInterrupted is returned when the context is cancelled mid-run.
var ErrInterrupted = errors.New("interrupted")

// Integrate runs one integration. record keeps the trajectory; progress,
// if not nil, is called with the steps done.
func Integrate(ctx context.Context, su Setup, record bool, progress func(done int64)) (*Result, error) {
	return integrate(ctx, su, record, progress, nil)
}

// integrate is Integrate with a checkpoint hook (nil for none).
func integrate(ctx context.Context, su Setup, record bool, progress func(done int64), hook *jobHook) (*Result, error) {
	stepper, err := integrator.New(su.Method)
	if err != nil {
		return nil, err
	}
	if rk, ok := stepper.(*integrator.RK45); ok && su.Tolerance > 0 {
		rk.Tol = su.Tolerance
	}
	if ap, ok := stepper.(integrator.Applicability); ok {
		if err := ap.Applies(su.Stack, su.GM); err != nil {
			return nil, fmt.Errorf("integrator %s: %w", su.Method, err)
		}
	}
	n := len(su.GM)
	sys := &integrator.System{
		X: append([]vec.V(nil), su.X0...), V: append([]vec.V(nil), su.V0...),
		A: make([]vec.V, n), GM: append([]float64(nil), su.GM...),
	}
	field := integrator.NewField(su.Stack, sys.GM)
	field.Prime(sys)
	// Time-transformed steppers (logH) take steps of varying length: they
	// run until the planned duration, not for a count of steps.
	_, variable := stepper.(integrator.VariableStep)
	tEnd := float64(su.Steps) * su.H
	finished := func(k int64) bool {
		if variable {
			return sys.T >= tEnd*(1-1e-12)
		}
		return k == su.Steps
	}

	res := &Result{Orbits: make([]observe.Orbit, n), MaxEnergyErr: make([]float64, n),
		MaxAngMomErr: make([]float64, n), Isolated: make([]bool, n), Steps: su.Steps, Exceeded: make([]bool, n)}
	massive := field.Massive()
	trackers := make([]*observe.Tracker, n)
	e0 := make([]float64, n)
	j0 := make([]float64, n)
	for i := 0; i < n; i++ {
		p := su.Primary[i]
		if p < 0 {
			res.MaxEnergyErr[i], res.MaxAngMomErr[i] = math.NaN(), math.NaN()
			continue
		}
		res.Isolated[i] = isolated(massive, i, p)
		x, v, a := rel(sys, i, p)
		trackers[i] = observe.NewTracker(0, x, v, a)
		if res.Isolated[i] {
			e0[i] = su.Stack.PairEnergy(sys.GM[p], sys.GM[i], x, v)
			j0[i] = su.Stack.PairAngularMomentum(sys.GM[p], sys.GM[i], x, v)
		} else {
			res.MaxEnergyErr[i], res.MaxAngMomErr[i] = math.NaN(), math.NaN()
		}
	}
	sysE0 := math.NaN()
	res.SystemEnergyErr = math.NaN()
	if _, nbody := su.Stack.Base.(kernels.NBody); len(massive) >= 2 && (!su.Stack.VelocityDependent() || nbody) {
		sysE0 = systemEnergy(su.Stack, sys, massive)
		res.SystemEnergyErr = 0
	}

	every := int64(su.OutputEvery)
	if every < 1 {
		every = 1
	}
	check := func(step int64) error {
		var msgs []string
		for i := 0; i < n; i++ {
			p := su.Primary[i]
			if record {
				row := Row{T: sys.T, Body: i, X: sys.X[i], V: sys.V[i], R: sys.X[i].Norm(), EnergyErr: math.NaN()}
				if p >= 0 {
					row.R = sys.X[i].Sub(sys.X[p]).Norm()
				}
				if p >= 0 && res.Isolated[i] {
					x, v, _ := rel(sys, i, p)
					row.EnergyErr = relErr(su.Stack.PairEnergy(sys.GM[p], sys.GM[i], x, v), e0[i])
				}
				res.Trajectory = append(res.Trajectory, row)
			}
			if p < 0 || !res.Isolated[i] {
				continue
			}
			x, v, _ := rel(sys, i, p)
			de := relErr(su.Stack.PairEnergy(sys.GM[p], sys.GM[i], x, v), e0[i])
			dj := relErr(su.Stack.PairAngularMomentum(sys.GM[p], sys.GM[i], x, v), j0[i])
			res.MaxEnergyErr[i] = math.Max(res.MaxEnergyErr[i], de)
			res.MaxAngMomErr[i] = math.Max(res.MaxAngMomErr[i], dj)
			breached := len(msgs)
			if de > su.EnergyTol || math.IsNaN(de) {
				msgs = append(msgs, fmt.Sprintf("%s: relative energy error %.3g exceeds the tolerance %.3g at t = %.6g s (step %d)", su.Names[i], de, su.EnergyTol, sys.T, step))
			}
			if dj > su.AngMomTol || math.IsNaN(dj) {
				msgs = append(msgs, fmt.Sprintf("%s: relative angular-momentum error %.3g exceeds the tolerance %.3g at t = %.6g s (step %d)", su.Names[i], dj, su.AngMomTol, sys.T, step))
			}
			if len(msgs) > breached {
				markExceeded(res, record, n, i)
			}
		}
		if !math.IsNaN(sysE0) {
			de := relErr(systemEnergy(su.Stack, sys, massive), sysE0)
			res.SystemEnergyErr = math.Max(res.SystemEnergyErr, de)
			if de > su.EnergyTol || math.IsNaN(de) {
				msgs = append(msgs, fmt.Sprintf("system: relative total energy error %.3g exceeds the tolerance %.3g at t = %.6g s (step %d)", de, su.EnergyTol, sys.T, step))
				for _, i := range massive {
					markExceeded(res, record, n, i)
				}
			}
		}
		if len(msgs) == 0 {
			return nil
		}
		if su.KeepGoing {
			if len(res.Breaches) < 20 {
				res.Breaches = append(res.Breaches, msgs...)
			}
			return nil
		}
		return &AccuracyError{Msg: "accuracy lost: " + msgs[0] + "; take a smaller step (steps_per_orbit) or a higher-order method, or loosen energy_tolerance if this is expected"}
	}
	if err := check(0); err != nil {
		return nil, err
	}
	first, err := hook.start(sys, stepper, trackers, res)
	if err != nil {
		return nil, err
	}
	if first > 1 && progress != nil {
		progress(first - 1)
	}
	guard := newPairGuard(su, massive, stepper)
	refiner := newApsisRefiner(su, stepper, massive)
	for k := first; variable || k <= su.Steps; k++ {
		if variable && sys.T >= tEnd*(1-1e-12) {
			res.Steps = k - 1
			break
		}
		stepper.Step(sys, field, su.H)
		for i, tr := range trackers {
			if tr != nil {
				x, v, a := rel(sys, i, su.Primary[i])
				np := len(tr.Peri)
				tr.Observe(sys.T, x, v, a)
				if refiner != nil && len(tr.Peri) > np {
					refiner.refine(sys, tr, i)
				}
			}
		}
		if k%every == 0 || finished(k) {
			if err := check(k); err != nil {
				return nil, err
			}
			if progress != nil {
				progress(k)
			}
		}
		if err := guard.check(sys, trackers, k); err != nil {
			return nil, err
		}
		// last in the step, so that a checkpoint holds it complete
		if err := hook.after(ctx, k, k%every == 0 || finished(k), finished(k)); err != nil {
			return nil, err
		}
	}
	for i, tr := range trackers {
		if tr != nil {
			res.Orbits[i] = observe.Measure(tr)
		}
	}
	return res, nil
}

// markExceeded flags body i's breach in the result and on its row of the
// sample being written (among the last n rows).
func markExceeded(res *Result, record bool, n, i int) {
	res.Exceeded[i] = true
	if !record {
		return
	}
	for k := len(res.Trajectory) - 1; k >= 0 && k >= len(res.Trajectory)-n; k-- {
		if res.Trajectory[k].Body == i {
			res.Trajectory[k].Exceeded = true
			return
		}
	}
}

func isolated(massive []int, i, p int) bool {
	for _, j := range massive {
		if j != i && j != p {
			return false
		}
	}
	return true
}

func rel(s *integrator.System, i, p int) (x, v, a vec.V) {
	return s.X[i].Sub(s.X[p]), s.V[i].Sub(s.V[p]), s.A[i].Sub(s.A[p])
}

func relErr(x, x0 float64) float64 {
	if x0 == 0 {
		return math.Abs(x)
	}
	return math.Abs((x - x0) / x0)
}

// systemEnergy is the total energy of the massive bodies over G:
// sum GM_i v_i^2/2 + sum_{i<j} GM_i Phi_j(r_ij). Exact for kernels linear
// in mu; the Vainshtein screening is not, and there it is approximate.
func systemEnergy(st *kernels.Stack, s *integrator.System, massive []int) float64 {
	if nb, ok := st.Base.(kernels.NBody); ok {
		return nbodySystemEnergy(nb, st, s, massive)
	}
	e := 0.0
	for a, i := range massive {
		e += 0.5 * s.GM[i] * s.V[i].Norm2()
		for _, j := range massive[a+1:] {
			// relative velocity: gr-orbit's potential depends on h = |x x v|
			vij := s.V[i].Sub(s.V[j])
			e += s.GM[i] * (st.Energy(s.GM[j], s.X[i].Sub(s.X[j]), vij) - 0.5*vij.Norm2())
		}
	}
	return e
}
