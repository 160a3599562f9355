package kernels

// Metric implements Lensing: the PPN metric's potentials, Phi = -mu/r and
// Psi = -gamma mu/r (g_ij = (1 + 2 gamma U) delta_ij), so light is bent by
// 2 (1 + gamma) mu/(c^2 b).
func (k PPN) Metric(mu, r float64) MetricPotentials {
	p, d := -mu/r, mu/(r*r)
	return split(p, k.gamma*p, d, k.gamma*d)
}

// Carrier implements Lensing.
func (k PPN) Carrier() string { return "parameterised post-Newtonian metric (Psi = gamma Phi)" }
