package observe

import (
	"fmt"
	"math"
)

// Orbit holds the observables measured from one tracker.
type Orbit struct {
	Passages int
	// Circular orbits (measured eccentricity below CircularLimit) have no
	// pericentre to follow; their precession is not measurable.
	Circular bool
	// PrecessionPerOrbit (rad) and its least-squares standard error;
	// NaN when not measurable (see Reason).
	PrecessionPerOrbit, PrecessionStdErr float64
	// RadialPeriod is the mean interval between pericentre passages (s),
	// AzimuthalPeriod = 2 pi P_r / (2 pi + precession), or from whole-turn
	// crossings for circular orbits.
	RadialPeriod, AzimuthalPeriod float64
	// RPeri and RApo are the mean refined apsidal distances; SizeA their
	// mean (r_min + r_max)/2.
	RPeri, RApo, SizeA float64
	Eccentricity       float64
	// Reason says why something is NaN.
	Reason string
}

// CircularLimit is the measured eccentricity (r_max - r_min)/(r_max + r_min)
// below which pericentre passages are noise, not apsides.
const CircularLimit = 1e-7

// Measure turns a tracker's records into observables.
func Measure(tr *Tracker) Orbit {
	o := Orbit{PrecessionPerOrbit: math.NaN(), PrecessionStdErr: math.NaN(),
		RadialPeriod: math.NaN(), AzimuthalPeriod: math.NaN(),
		RPeri: math.NaN(), RApo: math.NaN(), SizeA: math.NaN()}
	o.Eccentricity = (tr.RMax - tr.RMin) / (tr.RMax + tr.RMin)
	if o.Eccentricity < CircularLimit {
		o.Circular = true
		o.Reason = fmt.Sprintf("circular orbit (measured eccentricity %.2g < %g): no pericentre to follow, precession not measurable", o.Eccentricity, CircularLimit)
		o.RPeri, o.RApo = tr.RMin, tr.RMax
		o.SizeA = 0.5 * (tr.RMin + tr.RMax)
		if len(tr.Crossings) >= 3 {
			l, _ := FitLine(tr.Crossings)
			o.AzimuthalPeriod = l.Slope
		}
		return o
	}
	o.Passages = len(tr.Peri)
	if len(tr.Peri) < 3 {
		o.Reason = fmt.Sprintf("only %d pericentre passages; at least 3 are needed: integrate longer", len(tr.Peri))
		o.SizeA = 0.5 * (tr.RMin + tr.RMax)
		return o
	}
	ang := make([]float64, len(tr.Peri))
	ts := make([]float64, len(tr.Peri))
	for i, p := range tr.Peri {
		ang[i] = tr.Azimuth(p.X)
		ts[i] = p.T
	}
	la, _ := FitLine(Unwrap(ang))
	lt, _ := FitLine(ts)
	o.PrecessionPerOrbit, o.PrecessionStdErr = la.Slope, la.SlopeErr
	o.RadialPeriod = lt.Slope
	o.AzimuthalPeriod = 2 * math.Pi * o.RadialPeriod / (2*math.Pi + o.PrecessionPerOrbit)
	o.RPeri = meanR(tr.Peri)
	if len(tr.Apo) > 0 {
		o.RApo = meanR(tr.Apo)
	} else {
		o.RApo = tr.RMax
	}
	o.SizeA = 0.5 * (o.RPeri + o.RApo)
	return o
}

func meanR(a []Apsis) float64 {
	s := 0.0
	for _, p := range a {
		s += p.R
	}
	return s / float64(len(a))
}
