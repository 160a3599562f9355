package integrator_test

import (
	"context"
	"fmt"
	"math"
	"testing"

	"mgorbit/integrator"
	"mgorbit/integrator/kepler"
	"mgorbit/integrator/reference"
	"mgorbit/integrator/study"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// ringSystem is the problem of ../shared/bench/leapfrog.c: n test bodies
// about a centre of GM 1 (body 0), on slightly eccentric, slightly inclined
// orbits between r = 1 and 3.
func ringSystem(n int, gmOthers float64) *integrator.System {
	s := &integrator.System{GM: make([]float64, n+1), X: make([]vec.V, n+1), V: make([]vec.V, n+1), A: make([]vec.V, n+1)}
	s.GM[0] = 1
	for i := 0; i < n; i++ {
		r := 1.0 + 2.0*float64(i)/float64(n)
		th := 2.399963229728653 * float64(i)
		sp := 1.05 * math.Sqrt(1.0/r)
		s.X[i+1] = vec.V{r * math.Cos(th), r * math.Sin(th), 0.01 * r * math.Sin(3*th)}
		s.V[i+1] = vec.V{-sp * math.Sin(th), sp * math.Cos(th), 0}
		s.GM[i+1] = gmOthers
	}
	return s
}

// sampleValues builds kernels that have required parameters, with values
// in their stated ranges at planetary scales (ranges of about 1 au).
var sampleValues = map[string]kernels.Values{
	"yukawa":           {Num: map[string]float64{"alpha": 1e-3, "lambda": units.AU}},
	"crossover":        {Num: map[string]float64{"r_c": 1e26}},
	"tower":            {Num: map[string]float64{"sites": 8, "circumference": units.AU}},
	"vainshtein":       {Num: map[string]float64{"r_c": 1e26}},
	"massive-graviton": {Num: map[string]float64{"lambda": 10 * units.AU}},
}

// BenchmarkForce: force evaluations per second per kernel, for 1000 test
// bodies about the Sun at 0.5 to 1.5 au through Field.Eval. Corrections
// are stacked on Newton; base laws stand alone.
func BenchmarkForce(b *testing.B) {
	for _, info := range kernels.All() {
		k, err := kernels.New(info.Name, sampleValues[info.Name])
		if err != nil {
			b.Logf("%s: skipped (%v)", info.Name, err)
			continue
		}
		var stack *kernels.Stack
		if info.Role == kernels.Base {
			stack, err = kernels.NewStack(k)
		} else {
			stack, err = kernels.NewStack(kernels.Newton{}, k)
		}
		if err != nil {
			b.Logf("%s: skipped (%v)", info.Name, err)
			continue
		}
		b.Run(info.Name, func(b *testing.B) {
			n := 1000
			s := ringSystem(n, 0)
			s.GM[0] = units.GMSun
			for i := 1; i <= n; i++ {
				s.X[i] = s.X[i].Scale(0.5 * units.AU)
				s.V[i] = s.V[i].Scale(math.Sqrt(units.GMSun / (0.5 * units.AU)))
			}
			f := integrator.NewField(stack, s.GM)
			f.Prime(s)
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				f.Eval(s.GM, s.X, s.V, s.A)
			}
			b.ReportMetric(float64(n)*float64(b.N)/b.Elapsed().Seconds(), "evals/s")
		})
	}
}

// BenchmarkSteps: steps per second for 1, 10, 1000 and 100 000 test bodies
// about one mass, per method (Newtonian field; body-steps/s also shown).
func BenchmarkSteps(b *testing.B) {
	newton := kernels.MustStack(kernels.Newton{})
	for _, method := range []string{"leapfrog", "yoshida6", "wisdom-holman", "wisdom-holman-4", "logh-leapfrog"} {
		for _, n := range []int{1, 10, 1000, 100000} {
			b.Run(fmt.Sprintf("%s/n=%d", method, n), func(b *testing.B) {
				s := ringSystem(n, 0)
				st, err := integrator.New(method)
				if err != nil {
					b.Fatal(err)
				}
				f := integrator.NewField(newton, s.GM)
				f.Prime(s)
				b.ResetTimer()
				for i := 0; i < b.N; i++ {
					st.Step(s, f, 0.01)
				}
				sec := b.Elapsed().Seconds()
				b.ReportMetric(float64(b.N)/sec, "steps/s")
				b.ReportMetric(float64(n)*float64(b.N)/sec, "body-steps/s")
			})
		}
	}
}

// BenchmarkMassive: time per step for 2 to 100 massive bodies (all pairs).
func BenchmarkMassive(b *testing.B) {
	newton := kernels.MustStack(kernels.Newton{})
	for _, method := range []string{"leapfrog", "wisdom-holman-4"} {
		for _, n := range []int{2, 5, 10, 20, 50, 100} {
			b.Run(fmt.Sprintf("%s/n=%d", method, n), func(b *testing.B) {
				s := ringSystem(n-1, 1e-7)
				st, _ := integrator.New(method)
				f := integrator.NewField(newton, s.GM)
				f.Prime(s)
				b.ResetTimer()
				for i := 0; i < b.N; i++ {
					st.Step(s, f, 0.01)
				}
				b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "steps/s")
			})
		}
	}
}

// BenchmarkLeapfrogReference is leapfrog.c's loop (1000 bodies) through
// the public path; testdata/bench/run_bench.sh compares it with the C
// build, checksum included.
func BenchmarkLeapfrogReference(b *testing.B) {
	s := ringSystem(1000, 0)
	st, _ := integrator.New("leapfrog")
	f := integrator.NewField(kernels.MustStack(kernels.Newton{}), s.GM)
	f.Prime(s)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		st.Step(s, f, 0.01)
	}
	b.ReportMetric(1000*float64(b.N)/b.Elapsed().Seconds(), "body-steps/s")
}

// BenchmarkMercuryPrecession: the Mercury-like relativistic perihelion
// advance to 1e-6 relative, per method, at the cheapest configuration
// found by testdata/bench (gobench mercury): gr-orbit against its exact
// quadrature for the Wisdom-Holman and logH methods, gr1pn by difference
// from a Newtonian run against 6 pi mu/(c^2 a (1 - e^2)) for the Yoshida
// compositions. rel-err is reported beside the time.
func BenchmarkMercuryPrecession(b *testing.B) {
	mu := units.GMSun
	a, e := 0.38709893*units.AU, 0.20563069
	x, v, err := kepler.ToState(mu, kepler.Elements{A: a, E: e, Peri: 0.3, M: 0.1})
	if err != nil {
		b.Fatal(err)
	}
	h := x.Cross(v).Norm()
	ex, err := reference.FromState(mu, x, v, func(mu, r float64) (float64, float64) { return kernels.GROrbit{}.RadialAtH(mu, h, r) })
	if err != nil {
		b.Fatal(err)
	}
	gauss := 6 * math.Pi * mu / (units.C * units.C * a * (1 - e*e))
	grOrbit := kernels.MustStack(kernels.GROrbit{})
	gr := kernels.MustStack(kernels.GR1PN{})
	newton := kernels.MustStack(kernels.Newton{})
	P := kepler.Period(mu, a)
	for _, c := range []struct {
		method        string
		stack         *kernels.Stack
		diff          bool
		steps, orbits float64
	}{
		{"wisdom-holman-6", grOrbit, false, 15.3, 3},
		{"wisdom-holman-4", grOrbit, false, 45.3, 3},
		{"wisdom-holman", grOrbit, false, 60.3, 5},
		{"logh-yoshida4", grOrbit, false, 700.3, 5},
		{"yoshida6", gr, true, 130.3, 3},
		{"yoshida4", gr, true, 1000.3, 3},
	} {
		target := ex.AdvancePerOrbit
		if c.diff {
			target = gauss
		}
		b.Run(c.method, func(b *testing.B) {
			su := study.Setup{Names: []string{"Sun", "Mercury"}, GM: []float64{mu, 0}, Primary: []int{-1, 0},
				X0: []vec.V{{}, x}, V0: []vec.V{{}, v}, Radius: []float64{0, 0}, Stack: c.stack, Method: c.method,
				H: P / c.steps, Steps: int64(math.Ceil(c.orbits*c.steps - 1e-9)), OutputEvery: 1 << 30,
				EnergyTol: 1, AngMomTol: 1, KeepGoing: true}
			var p float64
			for i := 0; i < b.N; i++ {
				res, err := study.Integrate(context.Background(), su, false, nil)
				if err != nil {
					b.Fatal(err)
				}
				p = res.Orbits[1].PrecessionPerOrbit
				if c.diff {
					n := su
					n.Stack = newton
					nres, err := study.Integrate(context.Background(), n, false, nil)
					if err != nil {
						b.Fatal(err)
					}
					p -= nres.Orbits[1].PrecessionPerOrbit
				}
			}
			b.ReportMetric(math.Abs(p/target-1), "rel-err")
		})
	}
}
