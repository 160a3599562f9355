// Package bounds judges scan tables against measurements: a bounds file
// (TOML) lists observables of a system with a measured value and its
// uncertainty, or a one-sided limit, each at a confidence level, and every
// grid point of a scan is marked allowed or excluded.
//
// A measurement value ± sigma at confidence CL excludes a point whose
// observable deviates by more than k sigma_eff, k the two-sided normal
// quantile Phi^-1((1 + CL)/2) and sigma_eff = sqrt(sigma^2 + err^2) with
// err the scan's integration-error estimate of that observable when the
// table has one (an uncertain model value must not be excluded by its own
// numerical noise). A limit (upper, lower) excludes a point beyond it by
// more than z err, z = Phi^-1(CL) one-sided.
//
// Several bounds combine by one of two rules, both always computed:
//   - each (the default): a point is excluded when any bound excludes it
//     at its own confidence level. The table says which.
//   - chi-square: the measurements' squared pulls are summed and compared
//     with the chi-square quantile of n degrees of freedom at the stated
//     confidence (n the number of measurements); limits still apply one by
//     one.
//
// With one measurement the two rules agree (the chi-square quantile of one
// degree of freedom is k^2). Judging adds columns to the table and never
// recomputes the scan; the columns derived from the point's scenario alone
// (light deflection, for a gamma bound) are computed from the scenario
// text and grid stored in the table's metadata.
//
// Boundary locates, along one swept axis, where the verdict changes
// between neighbouring grid points, by interpolating the deciding
// statistic (the pull, the distance beyond a limit, the square root of the
// chi-square) linearly in the axis value, with a three-point quadratic as
// the interpolation-error estimate.
package bounds
