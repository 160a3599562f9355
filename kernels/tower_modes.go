package kernels

import (
	"cmp"
	"math"
	"slices"
)

// Mode lists of the finite tower: masses ascending, with the weight each
// mass carries in the potential sum (multiplicity times the site factors,
// before the factor t). The zero mode (Newton) is left out.

// periodicModes lists the massive modes of a periodic lattice of n^d sites
// with spacing s, source and test body sep sites apart along the first
// dimension. Per dimension the index p and n - p give the same mass, so
// only q = min(p, n - p) in 0..n/2 is kept, with multiplicity 2 (1 for q = 0
// and, n even, q = n/2); cos(2 pi p sep/n) is the same for both.
func periodicModes(n, d int, s float64, sep int) (masses, weights []float64) {
	half := n / 2
	scale := 2 / s
	mult := make([]float64, half+1)
	sin2 := make([]float64, half+1) // (2/s)^2 sin^2(pi q/n)
	for q := 0; q <= half; q++ {
		mult[q] = 2
		if q == 0 || 2*q == n {
			mult[q] = 1
		}
		sn := math.Sin(math.Pi * float64(q) / float64(n))
		sin2[q] = scale * scale * sn * sn
	}
	// cos(2 pi q sep/n) with q sep reduced mod n first, exact in integers
	phase := func(q int) float64 {
		j := (int64(q) * int64(sep)) % int64(n)
		return math.Cos(2 * math.Pi * float64(j) / float64(n))
	}

	if d == 1 {
		// sin is increasing on [0, pi/2]: q order is mass order
		for q := 1; q <= half; q++ {
			masses = append(masses, scale*math.Sin(math.Pi*float64(q)/float64(n)))
			weights = append(weights, mult[q]*phase(q))
		}
		return masses, weights
	}

	type mode struct{ m2, w float64 }
	var list []mode
	switch d {
	case 2:
		list = make([]mode, 0, (half+1)*(half+1))
		for q1 := 0; q1 <= half; q1++ {
			w1 := mult[q1] * phase(q1)
			for q2 := 0; q2 <= half; q2++ {
				if q1 == 0 && q2 == 0 {
					continue
				}
				list = append(list, mode{sin2[q1] + sin2[q2], w1 * mult[q2]})
			}
		}
	case 3:
		// the second and third dimensions are interchangeable: q2 <= q3
		for q1 := 0; q1 <= half; q1++ {
			w1 := mult[q1] * phase(q1)
			for q2 := 0; q2 <= half; q2++ {
				for q3 := q2; q3 <= half; q3++ {
					if q1 == 0 && q3 == 0 {
						continue
					}
					w := w1 * mult[q2] * mult[q3]
					if q2 != q3 {
						w *= 2
					}
					list = append(list, mode{sumSorted3(sin2[q1], sin2[q2], sin2[q3]), w})
				}
			}
		}
	}
	// equal masses (permuted indices) were summed in the same order, so
	// they compare equal and merge into one term
	slices.SortFunc(list, func(a, b mode) int { return cmp.Compare(a.m2, b.m2) })
	for i := 0; i < len(list); {
		m2, w := list[i].m2, 0.0
		for ; i < len(list) && list[i].m2 == m2; i++ {
			w += list[i].w
		}
		if w != 0 {
			masses = append(masses, math.Sqrt(m2))
			weights = append(weights, w)
		}
	}
	return masses, weights
}

// sumSorted3 adds three values in ascending order, so that any permutation
// of them gives the same float64.
func sumSorted3(a, b, c float64) float64 {
	if a > b {
		a, b = b, a
	}
	if b > c {
		b, c = c, b
	}
	if a > b {
		a, b = b, a
	}
	return (a + b) + c
}

// openChainModes lists the massive modes of an open chain (Neumann ends) of
// n sites with spacing s: m_p = (2/s) sin(pi p/(2n)), weight
// 2 cos(pi p (src + 1/2)/n) cos(pi p (dst + 1/2)/n), from the orthonormal
// mode functions sqrt((2 - delta_p0)/n) cos(pi p (k + 1/2)/n).
func openChainModes(n int, s float64, src, dst int) (masses, weights []float64) {
	// cos(pi p (2k + 1)/(2n)) with p (2k + 1) reduced mod 4n in integers
	c := func(p, k int) float64 {
		j := (int64(p) * int64(2*k+1)) % int64(4*n)
		return math.Cos(math.Pi * float64(j) / float64(2*n))
	}
	for p := 1; p < n; p++ {
		masses = append(masses, 2/s*math.Sin(math.Pi*float64(p)/float64(2*n)))
		weights = append(weights, 2*c(p, src)*c(p, dst))
	}
	return masses, weights
}
