package scenarios

import "mgorbit/integrator/kepler"

// BodyIndex returns the index of the named body in Bodies, or -1.
func (s *Scenario) BodyIndex(name string) int {
	for i, b := range s.Bodies {
		if b.Name == name {
			return i
		}
	}
	return -1
}

// OrbitOf returns the index of the body whose orbit times the run:
// Integrator.OrbitOf, or the first body with a primary.
func (s *Scenario) OrbitOf() int {
	if s.Integrator.OrbitOf != "" {
		return s.BodyIndex(s.Integrator.OrbitOf)
	}
	for i, b := range s.Bodies {
		if b.Primary != "" {
			return i
		}
	}
	return -1
}

// OrbitPeriod returns the initial Keplerian period of the OrbitOf body about
// its primary, with mu = G (M_primary + m) (0 if there is none; a loaded
// scenario always has one).
func (s *Scenario) OrbitPeriod() float64 {
	i := s.OrbitOf()
	if i < 0 {
		return 0
	}
	b := s.Bodies[i]
	p := s.BodyIndex(b.Primary)
	if p < 0 {
		return 0
	}
	mu := s.Bodies[p].GM + b.GM
	x, v := b.X.Sub(s.Bodies[p].X), b.V.Sub(s.Bodies[p].V)
	inv := 2/x.Norm() - v.Norm2()/mu // 1/a from vis-viva
	if !(inv > 0) {
		return 0
	}
	return kepler.Period(mu, 1/inv)
}

// TimeStep returns the integration step in s.
func (s *Scenario) TimeStep() float64 {
	if s.Integrator.StepsPerOrbit > 0 {
		return s.OrbitPeriod() / s.Integrator.StepsPerOrbit
	}
	return s.Integrator.Step
}

// EndTime returns the integration time span in s.
func (s *Scenario) EndTime() float64 {
	if s.Integrator.Orbits > 0 {
		return s.Integrator.Orbits * s.OrbitPeriod()
	}
	return s.Integrator.Duration
}
