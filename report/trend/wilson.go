package trend

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// Wilson returns the Wilson score interval (Wilson 1927) for x successes out of n trials
// at confidence level conf (e.g. 0.95; 0 means 0.95):
//
//	p = x/n,  z = Φ⁻¹(1 − (1−conf)/2)   (z = 1.959964 for 95%)
//	centre    = (p + z²/(2n)) / (1 + z²/n)
//	halfwidth = z/(1 + z²/n) · sqrt(p(1−p)/n + z²/(4n²))
//	low, high = centre ∓ halfwidth, clamped to [0, 1]
//
// Unlike the Wald interval p ± z·sqrt(p(1−p)/n), it never leaves [0, 1], is not empty at
// x = 0 or x = n, and keeps close to its nominal coverage for small n (Newcombe 1998,
// "Two-sided confidence intervals for the single proportion", Statistics in Medicine 17).
//
// If n is 0 there is no interval and Wilson returns NaN, NaN. It panics if x < 0, x > n or
// conf is not in (0, 1).
func Wilson(x, n int, conf float64) (low, high float64) {
	if x < 0 || x > n {
		panic("trend: Wilson count out of range")
	}
	if n == 0 {
		return math.NaN(), math.NaN()
	}
	z := zFor(conf)
	nf := float64(n)
	p := float64(x) / nf
	z2 := z * z
	den := 1 + z2/nf
	centre := (p + z2/(2*nf)) / den
	half := z / den * math.Sqrt(p*(1-p)/nf+z2/(4*nf*nf))
	low, high = centre-half, centre+half
	if x == 0 || low < 0 {
		low = 0
	}
	if x == n || high > 1 {
		high = 1
	}
	return low, high
}

// zFor returns the two-sided standard normal quantile for confidence level conf
// (0 means 0.95).
func zFor(conf float64) float64 {
	if conf == 0 {
		conf = 0.95
	}
	if !(conf > 0 && conf < 1) {
		panic("trend: confidence level not in (0, 1)")
	}
	return distuv.UnitNormal.Quantile(1 - (1-conf)/2)
}

// NewcombeDiff returns the difference p1 − p2 of two independent proportions x1/n1 and
// x2/n2 and its hybrid score interval (Newcombe 1998, "Interval estimation for the
// difference between independent proportions: comparison of eleven methods",
// Statistics in Medicine 17:873–890, method 10), built from the two Wilson intervals
// (l1, u1) and (l2, u2) at level conf (0 means 0.95):
//
//	d    = p1 − p2
//	low  = d − sqrt((p1 − l1)² + (u2 − p2)²)
//	high = d + sqrt((u1 − p1)² + (p2 − l2)²)
//
// It returns NaN for all three if n1 or n2 is 0, and panics as Wilson does.
func NewcombeDiff(x1, n1, x2, n2 int, conf float64) (diff, low, high float64) {
	l1, u1 := Wilson(x1, n1, conf)
	l2, u2 := Wilson(x2, n2, conf)
	if n1 == 0 || n2 == 0 {
		return math.NaN(), math.NaN(), math.NaN()
	}
	p1, p2 := float64(x1)/float64(n1), float64(x2)/float64(n2)
	diff = p1 - p2
	low = diff - math.Sqrt((p1-l1)*(p1-l1)+(u2-p2)*(u2-p2))
	high = diff + math.Sqrt((u1-p1)*(u1-p1)+(p2-l2)*(p2-l2))
	return diff, low, high
}
