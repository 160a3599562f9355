// Command gobench is the Go side of testdata/bench/run_bench.sh: every
// figure goes through the public integrator, kernel and study paths.
//
//	gobench leapfrog N STEPS   the loop of ../shared/bench/leapfrog.c
//	gobench mercury            Mercury-like 1PN precession to 1e-6, per method
//	gobench scaling            time per step against body counts, with exponents
//	gobench errstep            precession error against step (CSV, for the plot)
package main

import (
	"context"
	"fmt"
	"math"
	"os"
	"sort"
	"strconv"
	"time"

	"mgorbit/integrator"
	"mgorbit/integrator/kepler"
	"mgorbit/integrator/reference"
	"mgorbit/integrator/study"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

func main() {
	if len(os.Args) < 2 {
		fmt.Fprintln(os.Stderr, "usage: gobench leapfrog N STEPS | mercury | scaling | errstep")
		os.Exit(2)
	}
	switch os.Args[1] {
	case "leapfrog":
		n, _ := strconv.Atoi(arg(2, "1000"))
		steps, _ := strconv.Atoi(arg(3, "20000"))
		leapfrog(n, steps)
	case "mercury":
		mercury()
	case "scaling":
		scaling()
	case "errstep":
		errstep()
	default:
		fmt.Fprintln(os.Stderr, "unknown command", os.Args[1])
		os.Exit(2)
	}
}

func arg(i int, def string) string {
	if len(os.Args) > i {
		return os.Args[i]
	}
	return def
}

// leapfrog sets up leapfrog.c's problem (its header gives the initial
// state) with the centre as body 0 of GM 1, and steps it with the
// registered leapfrog and a plain-Newton Field.
func leapfrog(n, steps int) {
	s := &integrator.System{GM: make([]float64, n+1), X: make([]vec.V, n+1), V: make([]vec.V, n+1), A: make([]vec.V, n+1)}
	s.GM[0] = 1
	for i := 0; i < n; i++ {
		r := 1.0 + 2.0*float64(i)/float64(n)
		th := 2.399963229728653 * float64(i)
		sp := 1.05 * math.Sqrt(1.0/r)
		s.X[i+1] = vec.V{r * math.Cos(th), r * math.Sin(th), 0.01 * r * math.Sin(3*th)}
		s.V[i+1] = vec.V{-sp * math.Sin(th), sp * math.Cos(th), 0}
	}
	st, err := integrator.New("leapfrog")
	if err != nil {
		panic(err)
	}
	f := integrator.NewField(kernels.MustStack(kernels.Newton{}), s.GM)
	t0 := time.Now()
	f.Prime(s)
	for k := 0; k < steps; k++ {
		st.Step(s, f, 0.01)
	}
	sec := time.Since(t0).Seconds()
	sum := 0.0
	for i := 1; i <= n; i++ {
		sum += s.X[i][0] + s.X[i][1] + s.X[i][2]
	}
	fmt.Printf("checksum %.17g\n", sum)
	fmt.Printf("body_steps_per_s %.6g\n", float64(n)*float64(steps)/sec)
}

// Mercury (PHYSICS.md): a = 0.387 098 93 au, e = 0.205 630 69, nominal solar GM.
var (
	mercA = 0.38709893 * units.AU
	mercE = 0.20563069
	mu    = units.GMSun
)

func mercuryState() (vec.V, vec.V) {
	x, v, err := kepler.ToState(mu, kepler.Elements{A: mercA, E: mercE, Peri: 0.3, M: 0.1})
	if err != nil {
		panic(err)
	}
	return x, v
}

func setup(stack *kernels.Stack, method string, stepsPerOrbit, orbits, tol float64) study.Setup {
	x, v := mercuryState()
	P := kepler.Period(mu, mercA)
	h := P / stepsPerOrbit
	return study.Setup{Names: []string{"Sun", "Mercury"}, GM: []float64{mu, 0}, Primary: []int{-1, 0},
		X0: []vec.V{{}, x}, V0: []vec.V{{}, v}, Radius: []float64{0, 0},
		Stack: stack, Method: method, Tolerance: tol, H: h, Steps: int64(math.Ceil(orbits*P/h - 1e-9)),
		OutputEvery: 1 << 30, EnergyTol: 1, AngMomTol: 1, KeepGoing: true}
}

// job is one way of measuring the precession: the runs it makes and the
// value it reports.
type job struct {
	method   string
	stack    *kernels.Stack
	diff     bool // anomaly by difference from a Newtonian run at the same step
	target   float64
	steps    float64 // steps per orbit (rk45: the output step)
	orbits   float64
	tol      float64 // rk45
	relErr   float64
	seconds  float64
	evalNote string
}

func (j *job) run() (float64, error) {
	su := setup(j.stack, j.method, j.steps, j.orbits, j.tol)
	res, err := study.Integrate(context.Background(), su, false, nil)
	if err != nil {
		return math.NaN(), err
	}
	p := res.Orbits[1].PrecessionPerOrbit
	if j.diff {
		su.Stack = kernels.MustStack(kernels.Newton{})
		nres, err := study.Integrate(context.Background(), su, false, nil)
		if err != nil {
			return math.NaN(), err
		}
		p -= nres.Orbits[1].PrecessionPerOrbit
	}
	return p, nil
}

// timeIt runs the job until 0.2 s have passed (at least 3 times) and
// returns the best wall time of one job.
func (j *job) timeIt() float64 {
	best := math.Inf(1)
	start := time.Now()
	for k := 0; k < 3 || time.Since(start) < 200*time.Millisecond; k++ {
		t0 := time.Now()
		if _, err := j.run(); err != nil {
			panic(err)
		}
		best = math.Min(best, time.Since(t0).Seconds())
	}
	return best
}

func mercury() {
	c2 := units.C * units.C
	gauss := 6 * math.Pi * mu / (c2 * mercA * (1 - mercE*mercE)) // PHYSICS.md, Will 2014
	grOrbit := kernels.MustStack(kernels.GROrbit{})
	x, v := mercuryState()
	h := x.Cross(v).Norm()
	ex, err := reference.FromState(mu, x, v, func(mu, r float64) (float64, float64) {
		return kernels.GROrbit{}.RadialAtH(mu, h, r)
	})
	if err != nil {
		panic(err)
	}
	gr := kernels.MustStack(kernels.GR1PN{})
	type cand struct {
		method string
		stack  *kernels.Stack
		diff   bool
		target float64
		label  string
	}
	cands := []cand{
		{"wisdom-holman-4", grOrbit, false, ex.AdvancePerOrbit, "gr-orbit, absolute (Newton has no spurious precession under WH)"},
		{"wisdom-holman", grOrbit, false, ex.AdvancePerOrbit, "gr-orbit, absolute"},
		{"wisdom-holman-6", grOrbit, false, ex.AdvancePerOrbit, "gr-orbit, absolute"},
		{"yoshida6", gr, true, gauss, "gr1pn, anomaly by difference from Newton"},
		{"yoshida4", gr, true, gauss, "gr1pn, anomaly by difference"},
		{"leapfrog", gr, true, gauss, "gr1pn, anomaly by difference"},
		{"rk45", gr, true, gauss, "gr1pn, anomaly by difference"},
		{"logh-yoshida4", grOrbit, false, ex.AdvancePerOrbit, "gr-orbit, absolute"},
		{"logh-leapfrog", grOrbit, false, ex.AdvancePerOrbit, "gr-orbit, absolute"},
	}
	fmt.Printf("# Mercury-like precession to 1e-6: exact gr-orbit %.12g rad/orbit (%s), first-order 1PN %.12g\n", ex.AdvancePerOrbit, ex.Path, gauss)
	var best *job
	for _, c := range cands {
		var found *job
		for _, orbits := range []float64{3, 5, 10, 20, 40} {
			ladder := []float64{5.3, 7.3, 10.3, 15.3, 20.3, 30.3, 45.3, 60.3, 90.3, 130.3, 200.3, 300.3, 450.3, 700.3, 1000.3, 1500.3, 2200.3}
			if c.method == "rk45" {
				ladder = []float64{1e-8, 1e-9, 1e-10, 1e-11, 1e-12, 1e-13}
			}
			for _, s := range ladder {
				j := &job{method: c.method, stack: c.stack, diff: c.diff, target: c.target, steps: s, orbits: orbits}
				if c.method == "rk45" {
					j.steps, j.tol = 200.3, s // the output step the observers interpolate over
				}
				p, err := j.run()
				if err != nil {
					continue
				}
				j.relErr = p/c.target - 1
				if math.Abs(j.relErr) < 1e-6 {
					j.seconds = j.timeIt()
					if found == nil || j.seconds < found.seconds {
						found = j
					}
					break
				}
			}
		}
		if found == nil {
			fmt.Printf("%-16s no configuration reached 1e-6 (%s)\n", c.method, c.label)
			continue
		}
		what := fmt.Sprintf("steps_per_orbit=%g", found.steps)
		if c.method == "rk45" {
			what = fmt.Sprintf("tol=%g", found.tol)
		}
		fmt.Printf("%-16s %s orbits=%g rel_err=%.3g seconds=%.6g  (%s)\n", c.method, what, found.orbits, found.relErr, found.seconds, c.label)
		if best == nil || found.seconds < best.seconds {
			best = found
		}
	}
	fmt.Printf("go_best method=%s seconds=%.6g\n", best.method, best.seconds)
}

// scaling times steps of the leapfrog and the fourth-order Wisdom-Holman
// map against the test-body count (one central mass) and the massive-body
// count, and fits the exponent of time per step ~ N^p by least squares on
// the logs.
func scaling() {
	newton := kernels.MustStack(kernels.Newton{})
	perStep := func(method string, s *integrator.System) float64 {
		st, _ := integrator.New(method)
		f := integrator.NewField(newton, s.GM)
		f.Prime(s)
		st.Step(s, f, 1e-3)
		n := 0
		t0 := time.Now()
		for time.Since(t0) < 150*time.Millisecond || n < 3 {
			st.Step(s, f, 1e-3)
			n++
		}
		return time.Since(t0).Seconds() / float64(n)
	}
	testSys := func(n int) *integrator.System {
		s := &integrator.System{GM: make([]float64, n+1), X: make([]vec.V, n+1), V: make([]vec.V, n+1), A: make([]vec.V, n+1)}
		s.GM[0] = 1
		for i := 1; i <= n; i++ {
			r := 1 + 2*float64(i)/float64(n)
			th := 2.399963229728653 * float64(i)
			s.X[i] = vec.V{r * math.Cos(th), r * math.Sin(th), 0}
			s.V[i] = vec.V{-math.Sin(th) / math.Sqrt(r), math.Cos(th) / math.Sqrt(r), 0}
		}
		return s
	}
	massiveSys := func(n int) *integrator.System {
		s := testSys(n - 1)
		for i := 1; i < n; i++ {
			s.GM[i] = 1e-7
		}
		return s
	}
	report := func(label, method string, counts []int, mk func(int) *integrator.System, fitFrom int) {
		var lx, ly []float64
		fmt.Printf("%s, %s:\n", label, method)
		for _, n := range counts {
			t := perStep(method, mk(n))
			fmt.Printf("  N=%-7d %.4g s/step  %.4g s per body-step\n", n, t, t/float64(n))
			if n >= fitFrom {
				lx = append(lx, math.Log(float64(n)))
				ly = append(ly, math.Log(t))
			}
		}
		fmt.Printf("  exponent (N >= %d): %.3f\n", fitFrom, slope(lx, ly))
	}
	tests := []int{1, 10, 100, 1000, 10000, 100000}
	massive := []int{2, 5, 10, 20, 50, 100}
	report("test bodies about one mass", "leapfrog", tests, testSys, 100)
	report("test bodies about one mass", "wisdom-holman-4", tests, testSys, 100)
	report("massive bodies", "leapfrog", massive, massiveSys, 10)
	report("massive bodies", "wisdom-holman-4", massive, massiveSys, 10)
}

func slope(x, y []float64) float64 {
	var mx, my float64
	for i := range x {
		mx += x[i]
		my += y[i]
	}
	mx /= float64(len(x))
	my /= float64(len(x))
	var sxy, sxx float64
	for i := range x {
		sxy += (x[i] - mx) * (y[i] - my)
		sxx += (x[i] - mx) * (x[i] - mx)
	}
	return sxy / sxx
}

// errstep prints the relative precession error against steps per orbit for
// the Mercury-like gr-orbit case (330 orbits, exact quadrature reference),
// as CSV: method,steps_per_orbit,h_over_period,rel_err.
func errstep() {
	grOrbit := kernels.MustStack(kernels.GROrbit{})
	x, v := mercuryState()
	h := x.Cross(v).Norm()
	ex, err := reference.FromState(mu, x, v, func(mu, r float64) (float64, float64) {
		return kernels.GROrbit{}.RadialAtH(mu, h, r)
	})
	if err != nil {
		panic(err)
	}
	fmt.Println("method,steps_per_orbit,h_over_period,rel_err")
	methods := []string{"wisdom-holman", "wisdom-holman-4", "wisdom-holman-6", "yoshida6", "leapfrog"}
	sort.Strings(methods)
	for _, m := range methods {
		for _, s := range []float64{10.3, 15.3, 20.3, 30.3, 45.3, 60.3, 90.3, 130.3, 200.3, 300.3} {
			j := &job{method: m, stack: grOrbit, steps: s, orbits: 330}
			p, err := j.run()
			if err != nil {
				continue
			}
			fmt.Printf("%s,%g,%.6g,%.6g\n", m, s, 1/s, math.Abs(p/ex.AdvancePerOrbit-1))
		}
	}
}
