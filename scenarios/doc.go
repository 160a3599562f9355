// Package scenarios loads and checks scenario files: which bodies, which
// force-law stack, which integrator, for how long. Load reads a TOML file,
// Builtin one of the scenarios shipped with the program (BuiltinNames).
// The result is a Scenario in SI units with every body's initial state in
// the output frame, ready to run.
//
// # Schema
//
// Quantities with a unit are strings ("0.31 au", "2e-7 Msun", "7 deg",
// "30 km/s"; see package units); dimensionless numbers may be bare.
//
//	name = "Vesper"                  # required
//	description = "..."              # optional
//
//	[integrator]                     # optional table, all keys optional
//	method = "yoshida6"              # see `mgorbit run --help`; default: wisdom-holman-4 where one mass
//	                                 # dominates and the stack is position-only, else yoshida6
//	steps_per_orbit = 317.3          # or step = "0.5 d"; not both (default steps_per_orbit = 400.3)
//	orbits = 100                     # or duration = "20 yr"; not both (default orbits = 50)
//	orbit_of = "Tiber"               # whose initial Keplerian period is "one orbit"
//	                                 # (default: the first body with a primary)
//	output_every = 10                # steps between trajectory rows (default: about 200 rows per orbit)
//	tolerance = 1e-12                # rk45 only: relative error per step
//	energy_tolerance = 1e-6          # allowed relative drift of the conserved energy
//	angular_momentum_tolerance = 1e-6
//	frame = "barycentric"            # or "primary"
//
//	[[kernel]]                       # the stack, base law first, then corrections
//	name = "gr1pn"                   # default stack without [[kernel]]: newton
//	[[kernel]]
//	name = "yukawa"
//	alpha = 1e-6                     # each kernel's own parameters (mgorbit kernels)
//	lambda = "2 au"
//
//	[[body]]
//	name = "Aster"
//	mass = "1.05 Msun"               # or "2e30 kg"
//
//	[[body]]
//	name = "Tiber"
//	mass = "2e-7 Msun"               # or test = true: a massless test body
//	primary = "Aster"
//	a = "0.31 au"                    # orbital elements about the primary ...
//	e = 0.21
//	i = "7 deg"                      # optional (default 0): i, node, peri, mean_anomaly
//	radius = "2400 km"               # optional
//
//	[[body]]
//	name = "Wanderer"
//	test = true
//	position = ["1 au", "0 m", "0 m"]         # ... or a state vector, relative to the
//	velocity = ["0 m/s", "30 km/s", "0 m/s"]  # primary if one is given, else absolute
//
// Kernel parameters are read by their declared kind: numbers bare when
// dimensionless, else strings with a unit; whole-number parameters that
// allow it take "inf"; choices are strings (signed choices such as "+1"
// may also be written as the TOML integers +1 and -1).
//
// # Meaning
//
// Elements (a, e, i, node, peri, mean_anomaly; reference plane x-y, see
// package kepler) describe the relative two-body orbit about the primary,
// converted with mu = G (M_primary + m_body). A primary may have a primary
// of its own (a moon of a planet); states are resolved primaries first. A
// body with neither elements nor a state and no primary sits at rest at the
// origin. Then every state is shifted to the output frame: barycentric
// (centre of mass of the massive bodies at the origin and at rest) or
// primary (the first massive body at the origin and at rest).
//
// Masses given in Msun enter as G M through the nominal solar GM (IAU 2015
// B3), masses in kg through the CODATA G: a mass never passes through
// kilograms when it was given in solar masses.
//
// # Checks
//
// Everything is checked before anything runs, and every problem is reported
// (as Problems) with the file, the TOML line, the field path (body[2].e is
// the e of the second [[body]] table, counting from 1), the value, and what
// is allowed. Unknown keys are errors: a misspelt key never falls back to a
// default. Beyond types, units and ranges, a scenario must have at least two
// bodies, one of them massive; orbit_of must be bound to its primary (a
// precession needs a bound orbit); the run must cover at least 3 radial
// periods of orbit_of (three pericentre passages); and for fixed-step
// methods the step must be at most 1/20 of the pericentre passage time
// r_p / v_p of every orbit about a primary (common practice), the message
// saying which steps_per_orbit or step would do. rk45 picks its own steps,
// so the step check does not apply to it.
package scenarios
