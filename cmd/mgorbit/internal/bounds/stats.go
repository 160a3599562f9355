package bounds

import "gonum.org/v1/gonum/stat/distuv"

// TwoSidedK is the half-width, in sigma, of the central interval holding a
// fraction cl of a normal distribution: Phi^-1((1 + cl)/2).
func TwoSidedK(cl float64) float64 { return distuv.UnitNormal.Quantile((1 + cl) / 2) }

// OneSidedZ is Phi^-1(cl): a fraction cl of a normal distribution lies
// below z sigma.
func OneSidedZ(cl float64) float64 { return distuv.UnitNormal.Quantile(cl) }

// ChiSquareThreshold is the chi-square value of n degrees of freedom that
// a fraction cl of draws stays below.
func ChiSquareThreshold(n int, cl float64) float64 {
	return distuv.ChiSquared{K: float64(n)}.Quantile(cl)
}

// ChiSquarePValue is the chance of a chi-square of n degrees of freedom at
// least x.
func ChiSquarePValue(n int, x float64) float64 {
	return distuv.ChiSquared{K: float64(n)}.Survival(x)
}
