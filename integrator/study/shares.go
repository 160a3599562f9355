package study

import (
	"fmt"
	"math"

	"mgorbit/integrator/kepler"
	"mgorbit/integrator/reference"
	"mgorbit/kernels"
	"mgorbit/kernels/vec"
)

// PathTermShares names how TermShare values are computed.
const PathTermShares = "gauss-first-order-per-term"

// TermShare is one stacked term's part of the precession: Gauss's
// first-order orbit average of that term's perturbing acceleration alone
// (for the base law, its difference from Newton), on the osculating Kepler
// ellipse of the initial state. So a user sees the anomaly beside the
// relativistic and oblateness parts. The shares add up to the stack's
// first-order advance; the cross terms between terms (second order) are
// not in any share.
type TermShare struct {
	// Term is the kernel name; Role "base" or "correction".
	Term, Role string
	// AdvancePerOrbit is the advance of the pericentre within the orbit
	// plane, rad per orbit: d omega + cos i d Omega for a term that also
	// turns the plane (j2, lense-thirring), the apsidal advance for a
	// central one.
	AdvancePerOrbit float64
	// AdvancePerCentury is the same in arcsec per Julian century, over the
	// summary's radial period (the osculating Kepler period if that is
	// undefined).
	AdvancePerCentury float64
	// Share is AdvancePerOrbit over the sum of all terms' (NaN if that sum
	// is zero). Terms of opposite sign make shares outside [0, 1].
	Share float64
}

// TermShares returns the first-order advance of each term of stack for the
// relative orbit through x, v about a source of parameter mu (see
// TermShare); period converts to arcsec per century (NaN: the osculating
// Kepler period). A stack that is plain Newton has no terms. The orbit must
// be bound and not circular (a circle has no pericentre).
func TermShares(stack *kernels.Stack, mu float64, x, v vec.V, period float64) ([]TermShare, error) {
	if stack.NewtonOnly() {
		return nil, nil
	}
	el, err := kepler.FromState(mu, x, v)
	if err != nil {
		return nil, fmt.Errorf("osculating elements: %w", err)
	}
	if math.IsNaN(period) || !(period > 0) {
		period = kepler.Period(mu, el.A)
	}
	// reference.GaussAdvance puts the ellipse in the x-y plane with the
	// pericentre on +x; rotate its states into the orbit's true orientation
	// (a non-central term depends on it) and the acceleration back.
	p, q, w, err := perifocal(mu, el)
	if err != nil {
		return nil, err
	}
	toOrbit := func(s vec.V) vec.V { return p.Scale(s[0]).AddScaled(s[1], q).AddScaled(s[2], w) }
	fromOrbit := func(a vec.V) vec.V { return vec.V{a.Dot(p), a.Dot(q), a.Dot(w)} }
	advance := func(accel func(x, v vec.V) vec.V) (float64, error) {
		return reference.GaussAdvance(mu, el.A, el.E, func(xs, vs vec.V) vec.V {
			return fromOrbit(accel(toOrbit(xs), toOrbit(vs)))
		})
	}

	var out []TermShare
	add := func(k kernels.Kernel, accel func(x, v vec.V) vec.V) error {
		adv, err := advance(accel)
		if err != nil {
			return fmt.Errorf("term %s: %w", k.Info().Name, err)
		}
		out = append(out, TermShare{Term: k.Info().Name, Role: k.Info().Role.String(), AdvancePerOrbit: adv,
			AdvancePerCentury: PerCentury(adv, period)})
		return nil
	}
	if _, newton := stack.Base.(kernels.Newton); !newton {
		base := stack.Base
		if err := add(base, func(x, v vec.V) vec.V {
			return base.Accel(mu, x, v).Sub(kernels.Newton{}.Accel(mu, x, v))
		}); err != nil {
			return nil, err
		}
	}
	for _, c := range stack.Corrections {
		c := c
		if err := add(c, func(x, v vec.V) vec.V { return c.Accel(mu, x, v) }); err != nil {
			return nil, err
		}
	}
	var sum float64
	for _, s := range out {
		sum += s.AdvancePerOrbit
	}
	for k := range out {
		out[k].Share = math.NaN()
		if sum != 0 {
			out[k].Share = out[k].AdvancePerOrbit / sum
		}
	}
	return out, nil
}

// perifocal returns the unit vectors to the pericentre (P), 90 degrees
// ahead in the direction of motion (Q) and along the orbit normal (W): the
// position and velocity directions at the pericentre.
func perifocal(mu float64, el kepler.Elements) (p, q, w vec.V, err error) {
	el.M = 0
	x, v, err := kepler.ToState(mu, el)
	if err != nil {
		return p, q, w, fmt.Errorf("osculating elements: %w", err)
	}
	p, q = x.Unit(), v.Unit()
	return p, q, p.Cross(q), nil
}

// attachTerms fills s.Terms for body i and returns notes for the summary:
// why the shares are missing, and whether the measured orbit left the
// domain of a term defined only on a range of distances (a table).
func attachTerms(st *Study, i int, s *Summary) []string {
	var notes []string
	su := st.Setup
	if rp, ra := s.RPeri, s.RApo; !math.IsNaN(rp) && !math.IsNaN(ra) {
		if err := kernels.DomainError(su.Stack, rp, ra); err != nil {
			notes = append(notes, "measured orbit: "+err.Error())
		}
	}
	if su.Stack.NewtonOnly() {
		return notes
	}
	if !st.Main.Isolated[i] {
		return append(notes, "term shares: other massive bodies perturb this orbit")
	}
	p := su.Primary[i]
	terms, err := TermShares(su.Stack, su.GM[p]+su.GM[i], su.X0[i].Sub(su.X0[p]), su.V0[i].Sub(su.V0[p]), s.RadialPeriod)
	if err != nil {
		return append(notes, "term shares: "+err.Error())
	}
	s.Terms = terms
	return notes
}
