package study

import (
	"math"

	"mgorbit/integrator"
	"mgorbit/kernels"
	"mgorbit/scenarios/units"
)

// nbodySystemEnergy is systemEnergy for an N-body base law (EIH): its own
// conserved energy plus the corrections' pair potentials.
func nbodySystemEnergy(nb kernels.NBody, st *kernels.Stack, s *integrator.System, massive []int) float64 {
	e := nb.NBodyEnergy(s.GM, s.X, s.V)
	for a, i := range massive {
		for _, j := range massive[a+1:] {
			for _, c := range st.Corrections {
				e += s.GM[i] * c.Energy(s.GM[j], s.X[i].Sub(s.X[j]), s.V[i].Sub(s.V[j]))
			}
		}
	}
	return e
}

// DegPerYear converts a precession per orbit (rad) and a radial period (s)
// into degrees per Julian year, the unit of binary-pulsar periastron rates.
func DegPerYear(perOrbit, radialPeriod float64) float64 {
	return perOrbit / radialPeriod * units.JulianYear * 180 / math.Pi
}
