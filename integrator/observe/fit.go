package observe

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/stat"
)

// Line is a least-squares straight line y = Intercept + Slope k against
// the passage number k = 0, 1, ..., with the slope's standard error.
type Line struct {
	Intercept, Slope, SlopeErr float64
	N                          int
}

// FitLine fits y against its index. The standard error is the usual
// sqrt(sum r^2 / (n - 2) / sum (k - kbar)^2): the fit's scatter, which is
// not the accuracy of the integration.
func FitLine(y []float64) (Line, error) {
	n := len(y)
	if n < 3 {
		return Line{N: n}, errors.New("fewer than three points")
	}
	k := make([]float64, n)
	for i := range k {
		k[i] = float64(i)
	}
	alpha, beta := stat.LinearRegression(k, y, nil, false)
	var ss, sk float64
	kbar := float64(n-1) / 2
	for i := range y {
		r := y[i] - (alpha + beta*k[i])
		ss += r * r
		sk += (k[i] - kbar) * (k[i] - kbar)
	}
	return Line{Intercept: alpha, Slope: beta, SlopeErr: math.Sqrt(ss / float64(n-2) / sk), N: n}, nil
}

// Unwrap makes successive angles continuous (no jumps larger than pi).
func Unwrap(a []float64) []float64 {
	out := make([]float64, len(a))
	if len(a) == 0 {
		return out
	}
	out[0] = a[0]
	for i := 1; i < len(a); i++ {
		out[i] = out[i-1] + math.Remainder(a[i]-a[i-1], 2*math.Pi)
	}
	return out
}
