package lensing

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/integrate/quad"

	"mgorbit/kernels"
	"mgorbit/scenarios/units"
)

// DefaultPathFactor places the emitter and the receiver, when not given, at
// this many impact parameters from the point of closest approach along the
// ray. The delay grows as ln(z_e z_r): it is only defined for a finite path.
const DefaultPathFactor = 1000

// Ray is a straight light path past the source: impact parameter B, and the
// emitter and receiver at distances Emitter and Receiver along the ray from
// the point of closest approach (on either side of it), all in metres.
type Ray struct {
	B, Emitter, Receiver float64
}

// NewRay returns a ray at impact parameter b with the default path.
func NewRay(b float64) Ray {
	return Ray{B: b, Emitter: DefaultPathFactor * b, Receiver: DefaultPathFactor * b}
}

// Result is what a stack does to one ray. Angles in rad, times in s.
type Result struct {
	Ray Ray
	// Mu is the source's gravitational parameter as the stack takes it.
	Mu float64

	// Angle is the deflection (positive towards the source); AngleBeyond
	// is the corrections' part of it, integrated apart.
	Angle, AngleBeyond float64
	// AngleGR is general relativity's 4 mu/(c^2 b) with the stack's mu;
	// RatioToGR = Angle/AngleGR.
	AngleGR, RatioToGR float64
	// MuDynamical is b^2 dPhi/dr at r = b: the mu an orbit at b measures.
	// RatioToGRDynamical = Angle / (4 MuDynamical/(c^2 b)).
	MuDynamical, RatioToGRDynamical float64

	// Shapiro is the delay along the ray from emitter to receiver;
	// ShapiroBeyond the corrections' part; ShapiroGR the closed form of
	// general relativity with the stack's mu,
	// (2 mu/c^3) ln((r_e + z_e)(r_r + z_r)/b^2).
	Shapiro, ShapiroBeyond, ShapiroGR float64

	// GammaPotentials is Psi/Phi of the whole stack at r = b;
	// GammaDeflection is Angle c^2 b/(2 MuDynamical) - 1. The MinusOne
	// fields are gamma - 1 computed without the cancellation of 1 + small - 1.
	GammaPotentials, GammaPotentialsMinusOne float64
	GammaDeflection, GammaDeflectionMinusOne float64
}

// DeflectionGR is general relativity's deflection 4 mu/(c^2 b).
func DeflectionGR(mu, b float64) float64 { return 4 * mu / (units.C * units.C * b) }

// ShapiroGR is general relativity's delay for the straight ray,
// (2 mu/c^3) [asinh(z_e/b) + asinh(z_r/b)], the integral of 2 mu/(c^3 r)
// along it; it equals the usual (2 mu/c^3) ln((r_e + r_r + R)/(r_e + r_r - R))
// with R = z_e + z_r.
func ShapiroGR(mu float64, ray Ray) float64 {
	return 2 * mu / (units.C * units.C * units.C) * (math.Asinh(ray.Emitter/ray.B) + math.Asinh(ray.Receiver/ray.B))
}

// profile holds the stack's terms as Lensing, split into base and corrections.
type profile struct {
	base  kernels.Lensing
	corrs []kernels.Lensing
	mu    float64
}

func newProfile(st *kernels.Stack, mu float64) (*profile, error) {
	if err := st.LensingReady(); err != nil {
		return nil, err
	}
	p := &profile{base: st.Base.(kernels.Lensing), mu: mu}
	for _, c := range st.Corrections {
		p.corrs = append(p.corrs, c.(kernels.Lensing))
	}
	return p, nil
}

func (p *profile) baseAt(r float64) kernels.MetricPotentials { return p.base.Metric(p.mu, r) }

func (p *profile) corrAt(r float64) kernels.MetricPotentials {
	var m kernels.MetricPotentials
	for _, c := range p.corrs {
		m = m.Add(c.Metric(p.mu, r))
	}
	return m
}

func checkRay(mu float64, ray Ray) error {
	switch {
	case !(ray.B > 0) || math.IsInf(ray.B, 0):
		return fmt.Errorf("impact parameter b = %g m must be a positive length", ray.B)
	case !(ray.Emitter > 0) || !(ray.Receiver > 0) || math.IsInf(ray.Emitter, 0) || math.IsInf(ray.Receiver, 0):
		return fmt.Errorf("emitter (%g m) and receiver (%g m) distances along the ray must be positive lengths", ray.Emitter, ray.Receiver)
	case !(mu > 0) || math.IsInf(mu, 0):
		return fmt.Errorf("the source's mu = %g m^3/s^2 must be positive", mu)
	}
	return nil
}

// deflectionSpan is the upper end of t = asinh(z/b): r reaches b cosh 64,
// about 3e27 b, past every kernel scale of interest, while Newton's
// integrand has fallen there as sech^2 t to 1e-55 of its peak.
const deflectionSpan = 64

// Deflection returns the deflection angle at impact parameter b, and its
// part from the stack's corrections. Positive is towards the source.
func Deflection(st *kernels.Stack, mu, b float64) (total, beyond float64, err error) {
	if err := checkRay(mu, NewRay(b)); err != nil {
		return 0, 0, err
	}
	p, err := newProfile(st, mu)
	if err != nil {
		return 0, 0, err
	}
	t, c := p.deflection(b)
	return t, c, nil
}

// deflection integrates grad_perp (Phi + Psi) = F'(r) b/r along z = b sinh t
// (dz = r dt): theta = (2/c^2) Int_0^inf b F'(b cosh t) dt by symmetry.
func (p *profile) deflection(b float64) (total, beyond float64) {
	integrand := func(at func(float64) kernels.MetricPotentials) func(float64) float64 {
		return func(t float64) float64 {
			m := at(b * math.Cosh(t))
			return b * m.DLightDr
		}
	}
	scale := 2 / (units.C * units.C)
	baseInt := panels(integrand(p.baseAt), 0, deflectionSpan)
	beyond = 0
	if len(p.corrs) > 0 {
		beyond = scale * panels(integrand(p.corrAt), 0, deflectionSpan)
	}
	return scale*baseInt + beyond, beyond
}

// Shapiro returns the delay along the ray and its part from the stack's
// corrections.
func Shapiro(st *kernels.Stack, mu float64, ray Ray) (total, beyond float64, err error) {
	if err := checkRay(mu, ray); err != nil {
		return 0, 0, err
	}
	p, err := newProfile(st, mu)
	if err != nil {
		return 0, 0, err
	}
	t, c := p.shapiro(ray)
	return t, c, nil
}

// shapiro integrates -(Phi + Psi)/c^3 from z = -z_e to z_r, with
// z = b sinh t: Int F dz = Int F(b cosh t) b cosh t dt.
func (p *profile) shapiro(ray Ray) (total, beyond float64) {
	b := ray.B
	integrand := func(at func(float64) kernels.MetricPotentials) func(float64) float64 {
		return func(t float64) float64 {
			r := b * math.Cosh(t)
			m := at(r)
			return m.Light * r
		}
	}
	te, tr := math.Asinh(ray.Emitter/b), math.Asinh(ray.Receiver/b)
	along := func(f func(float64) float64) float64 {
		// F depends on |z| only: both halves run from the closest point out
		return panels(f, 0, te) + panels(f, 0, tr)
	}
	scale := -1 / (units.C * units.C * units.C)
	baseInt := along(integrand(p.baseAt))
	if len(p.corrs) > 0 {
		beyond = scale * along(integrand(p.corrAt))
	}
	return scale*baseInt + beyond + 0, beyond + 0 // + 0: no -0 in output
}

// GammaAt returns the effective PPN gamma = Psi/Phi of the stack's
// potentials at distance r, and gamma - 1 without cancellation.
func GammaAt(st *kernels.Stack, mu, r float64) (gamma, minusOne float64, err error) {
	base, corr, err := st.Metric(mu, r)
	if err != nil {
		return 0, 0, err
	}
	phi := base.Phi + corr.Phi
	minusOne = ((base.Psi-base.Phi)+(corr.Psi-corr.Phi))/phi + 0 // + 0: no -0 in output
	return 1 + minusOne, minusOne, nil
}

// Compute returns everything the stack does to the ray.
func Compute(st *kernels.Stack, mu float64, ray Ray) (Result, error) {
	if err := checkRay(mu, ray); err != nil {
		return Result{}, err
	}
	p, err := newProfile(st, mu)
	if err != nil {
		return Result{}, err
	}
	b := ray.B
	res := Result{Ray: ray, Mu: mu}
	res.Angle, res.AngleBeyond = p.deflection(b)
	res.AngleGR = DeflectionGR(mu, b)
	res.RatioToGR = res.Angle / res.AngleGR

	mb, mc := p.baseAt(b), p.corrAt(b)
	muBase, muCorr := b*b*mb.DPhiDr, b*b*mc.DPhiDr
	res.MuDynamical = muBase + muCorr
	res.RatioToGRDynamical = res.Angle / DeflectionGR(res.MuDynamical, b)

	res.Shapiro, res.ShapiroBeyond = p.shapiro(ray)
	res.ShapiroGR = ShapiroGR(mu, ray)

	phi := mb.Phi + mc.Phi
	res.GammaPotentialsMinusOne = ((mb.Psi-mb.Phi)+(mc.Psi-mc.Phi))/phi + 0 // + 0: no -0 in output
	res.GammaPotentials = 1 + res.GammaPotentialsMinusOne

	// theta c^2 b - 4 mu_dyn, base and corrections apart
	c2b := units.C * units.C * b
	thetaBase := res.Angle - res.AngleBeyond
	excess := (thetaBase*c2b - 4*muBase) + (res.AngleBeyond*c2b - 4*muCorr)
	res.GammaDeflectionMinusOne = excess / (2 * res.MuDynamical)
	res.GammaDeflection = 1 + res.GammaDeflectionMinusOne
	return res, nil
}

// Quadrature: Gauss-Legendre (gonum) on unit panels in t, each split in
// halves until the halves agree with the whole to panelTol of the panel's
// integral of |f|, or to panelFloor of the whole range's (which stops the
// splitting where f has underflowed to subnormal numbers). Smooth
// integrands converge at the first split. Kernels give Phi + Psi without
// cancellation (MetricPotentials.Light), so rounding noise does not keep
// a panel splitting; maxDepth bounds the work if one ever does.
const (
	gaussNodes = 20
	panelTol   = 1e-14
	panelFloor = 1e-17
	maxDepth   = 16
)

var nodes, weights = func() ([]float64, []float64) {
	x, w := make([]float64, gaussNodes), make([]float64, gaussNodes)
	quad.Legendre{}.FixedLocations(x, w, -1, 1)
	return x, w
}()

// gauss returns the n-point rule's value and its integral of |f| on [a, b].
func gauss(f func(float64) float64, a, b float64) (val, abs float64) {
	mid, half := 0.5*(a+b), 0.5*(b-a)
	for k, x := range nodes {
		y := f(mid + half*x)
		val += weights[k] * y
		abs += weights[k] * math.Abs(y)
	}
	return half * val, half * abs
}

func adaptive(f func(float64) float64, a, b, whole, floor float64, depth int) float64 {
	m := 0.5 * (a + b)
	l, la := gauss(f, a, m)
	r, ra := gauss(f, m, b)
	if d := math.Abs(l + r - whole); d <= panelTol*(la+ra) || d <= floor || depth >= maxDepth {
		return l + r
	}
	return adaptive(f, a, m, l, floor, depth+1) + adaptive(f, m, b, r, floor, depth+1)
}

// panels integrates f over [a, b] in unit panels, summed from the far end
// inwards (small tail terms first).
func panels(f func(float64) float64, a, b float64) float64 {
	if b <= a {
		return 0
	}
	n := int(math.Ceil(b - a))
	lo := make([]float64, n)
	hi := make([]float64, n)
	whole := make([]float64, n)
	var total float64
	for k := range lo {
		lo[k] = a + float64(k)
		hi[k] = math.Min(lo[k]+1, b)
		var abs float64
		whole[k], abs = gauss(f, lo[k], hi[k])
		total += abs
	}
	floor := panelFloor * total / float64(n)
	sum := 0.0
	for k := n - 1; k >= 0; k-- {
		sum += adaptive(f, lo[k], hi[k], whole[k], floor, 0)
	}
	return sum
}
