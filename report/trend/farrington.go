package trend

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// FarringtonSettings controls FarringtonLimits. The zero value is ready to use.
type FarringtonSettings struct {
	// Years is b, the number of earlier years whose months form the baseline; 0 means 3.
	Years int
	// Window is w: the baseline takes the same calendar month and the w months either
	// side of it in each earlier year; 0 means 1. Use a negative value for 0.
	Window int
	// Alpha sets z = Φ⁻¹(1 − α/2) for the upper limit; 0 means 0.05 (the default of the
	// R package surveillance's algo.farrington, per its documentation).
	Alpha float64
	// MinBaseline is the smallest number of baseline months with data; 0 means 5.
	MinBaseline int
}

func (fs FarringtonSettings) norm() (b, w int, z float64, minBase int) {
	b, w, minBase = fs.Years, fs.Window, fs.MinBaseline
	if b == 0 {
		b = 3
	}
	if w == 0 {
		w = 1
	} else if w < 0 {
		w = 0
	}
	if minBase == 0 {
		minBase = 5
	}
	alpha := fs.Alpha
	if alpha == 0 {
		alpha = 0.05
	}
	if !(alpha > 0 && alpha < 1) || b < 1 {
		panic("trend: bad Farrington settings")
	}
	return b, w, distuv.UnitNormal.Quantile(1 - alpha/2), minBase
}

// FarringtonStat is the Farrington upper limit for one theme in one month.
type FarringtonStat struct {
	// Z is the z of the upper limit.
	Z float64
	// OK is false when the month is a gap or has too short a baseline; the other fields
	// are then zero.
	OK bool
	// Count is the observed count, Expected μ̂0 the predicted count for the month's
	// total, Upper the upper limit U, Score the exceedance score (see FarringtonLimits).
	Count                  int
	Expected, Upper, Score float64
	// Dispersion is φ, Trend whether the time trend was kept, Baseline the number of
	// baseline months used.
	Dispersion float64
	Trend      bool
	Baseline   int
}

// FarringtonLimits computes the Farrington et al. (1996) upper limit of theme's count in each
// month of s ("A statistical algorithm for the early detection of outbreaks of
// infectious disease", JRSS A 159:547–563), adapted to monthly counts with the month's
// number of narratives as exposure. For month t:
//
//  1. Baseline: the months t − 12y + j for y = 1..b and j = −w..w that have data
//     (b = 3 years, w = 1: up to 9 months from the same season in earlier years).
//
//  2. Fit the quasi-Poisson log-linear model log μ_j = α + β·x_j + log(total_j), x_j in
//     years, by IRLS; φ = max(1, X²/(n − p)).
//
//  3. Down-weight past unusual months: Anscombe residuals
//     r_j = (3/2)(y_j^{2/3} μ_j^{−1/6} − μ_j^{1/2}) / sqrt(φ(1 − h_jj)), h the hat
//     values; weights ω_j = γ/r_j² where r_j > 1 and γ elsewhere, γ making Σω = n.
//     Refit with prior weights ω; φ = max(1, Σ ω_j (y_j − μ_j)²/μ_j / (n − p)).
//
//  4. Keep the trend only if its Wald test (with φ) has p < 0.05 and the predicted
//     rate does not exceed the highest baseline rate; otherwise redo 2–3 without it.
//
//  5. Predict μ̂0 = exp(α + β·x_t + log(total_t)), var(μ̂0) = μ̂0² x_tᵀ V x_t with
//     V = φ(XᵀWX)⁻¹, and τ = φ + var(μ̂0)/μ̂0.
//
// The upper limit and the exceedance score use the 2/3-power transformation, which
// makes a Poisson-like count nearly symmetric:
//
//	U     = (μ̂0^{2/3} + z · sqrt(4/9 · μ̂0^{1/3} · τ))^{3/2}
//	score = (y_t^{2/3} − μ̂0^{2/3}) / sqrt(4/9 · μ̂0^{1/3} · τ)
//
// A month is above its limit when y_t > U (score > z). The steps follow the list in the
// documentation of the R package surveillance (algo.farrington); the τ, U and score
// formulas were checked against a public R implementation (the sykdomspuls package's
// Farrington functions); the reweighting cut-off 1 and the trend rule are from memory
// of the paper. Adaptations: months instead of weeks, the month's number of narratives
// as exposure (offset), and flags only from Changes' MinCount up. Because the baseline
// comes from the same season in earlier years, a seasonal pattern is not flagged. The
// method needs at least one earlier year and MinBaseline baseline months; months
// without them get no limit (OK false). When the theme is absent from every baseline
// month no model can be fitted: Expected and Upper are 0 and any count above 0 is above
// the limit (Score +Inf).
func FarringtonLimits(s *Series, theme int, fs FarringtonSettings) []FarringtonStat {
	if theme < 0 || theme >= s.Themes {
		panic("trend: theme out of range")
	}
	b, w, z, minBase := fs.norm()
	out := make([]FarringtonStat, len(s.Months))
	index := map[Month]int{}
	for i, mi := range s.Months {
		index[mi.Month] = i
	}
	for i, mi := range s.Months {
		if mi.Gap {
			continue
		}
		var x, y, off, rate []float64
		for yr := b; yr >= 1; yr-- {
			for j := -w; j <= w; j++ {
				m := mi.Month - Month(12*yr) + Month(j)
				k, ok := index[m]
				if !ok || s.Months[k].Gap {
					continue
				}
				c := float64(s.Cells[k][theme].Count)
				x = append(x, float64(m-mi.Month)/12)
				y = append(y, c)
				off = append(off, math.Log(float64(s.Months[k].Total)))
				rate = append(rate, c/float64(s.Months[k].Total))
			}
		}
		if len(y) < minBase {
			continue
		}
		st := FarringtonStat{OK: true, Z: z, Count: s.Cells[i][theme].Count, Baseline: len(y)}
		maxRate := 0.0
		sumY := 0.0
		for j := range y {
			maxRate = math.Max(maxRate, rate[j])
			sumY += y[j]
		}
		if sumY == 0 {
			// Nothing of the theme in the baseline: no model can be fitted. Any count
			// above zero is then unusual by this method's standard; report μ̂0 = 0.
			st.Expected, st.Upper, st.Dispersion = 0, 0, 1
			st.Score = math.Inf(1)
			if st.Count == 0 {
				st.Score = 0
			}
			out[i] = st
			continue
		}
		offT := math.Log(float64(mi.Total))
		var f *farFit
		for _, trend := range []bool{true, false} {
			f = farringtonFit(x, y, off, trend)
			if f == nil {
				continue
			}
			if !trend {
				break
			}
			zt := f.beta[1] / math.Sqrt(f.cov[1][1])
			mu0 := math.Exp(f.beta[0] + offT) // x_t = 0
			if twoSided(zt) < 0.05 && mu0/float64(mi.Total) <= maxRate {
				break
			}
		}
		if f == nil {
			out[i] = FarringtonStat{}
			continue
		}
		mu0 := math.Exp(f.beta[0] + offT)
		v := f.cov[0][0] * mu0 * mu0 // x_t = 0, so xᵀVx = V00
		tau := f.phi + v/mu0
		se := math.Sqrt(4.0 / 9 * math.Cbrt(mu0) * tau)
		st.Expected, st.Dispersion, st.Trend = mu0, f.phi, f.trend
		st.Upper = math.Pow(math.Pow(mu0, 2.0/3)+z*se, 1.5)
		st.Score = (math.Pow(float64(st.Count), 2.0/3) - math.Pow(mu0, 2.0/3)) / se
		out[i] = st
	}
	return out
}

type farFit struct {
	beta  [2]float64
	cov   [2][2]float64 // φ (XᵀWX)⁻¹
	phi   float64
	trend bool
}

// farringtonFit runs steps 2 and 3 of FarringtonLimits. It returns nil if the fit fails.
func farringtonFit(x, y, off []float64, trend bool) *farFit {
	n := len(y)
	p := 1
	if trend {
		p = 2
	}
	if n <= p {
		return nil
	}
	ones := make([]float64, n)
	for j := range ones {
		ones[j] = 1
	}
	g, ok := weightedPoisson(x, y, off, ones, trend)
	if !ok {
		return nil
	}
	phi := math.Max(1, g.pearson/float64(n-p))
	// Anscombe residuals and weights.
	omega := make([]float64, n)
	sum := 0.0
	for j := range y {
		mu := g.mu[j]
		r := 1.5 * (math.Pow(y[j], 2.0/3)*math.Pow(mu, -1.0/6) - math.Sqrt(mu)) / math.Sqrt(phi*(1-g.hat[j]))
		omega[j] = 1
		if r > 1 {
			omega[j] = 1 / (r * r)
		}
		sum += omega[j]
	}
	for j := range omega {
		omega[j] *= float64(n) / sum
	}
	g, ok = weightedPoisson(x, y, off, omega, trend)
	if !ok {
		return nil
	}
	f := &farFit{beta: g.beta, trend: trend, phi: math.Max(1, g.pearson/float64(n-p))}
	for a := 0; a < 2; a++ {
		for c := 0; c < 2; c++ {
			f.cov[a][c] = f.phi * g.inv[a][c]
		}
	}
	return f
}

type wpFit struct {
	beta    [2]float64
	inv     [2][2]float64 // (XᵀWX)⁻¹, W = ω μ
	mu, hat []float64
	pearson float64 // Σ ω (y − μ)²/μ
}

// weightedPoisson fits log μ = β0 (+ β1 x) + off with prior weights omega by IRLS.
func weightedPoisson(x, y, off, omega []float64, trend bool) (*wpFit, bool) {
	n := len(y)
	mean := 0.0
	for j := range y {
		mean += y[j]
	}
	mean /= float64(n)
	mu := make([]float64, n)
	for j := range y {
		mu[j] = (y[j] + mean) / 2
	}
	var beta [2]float64
	var inv [2][2]float64
	solve := func() bool {
		var s00, s01, s11, t0, t1 float64
		for j := range y {
			w := omega[j] * mu[j]
			zj := math.Log(mu[j]) - off[j] + (y[j]-mu[j])/mu[j]
			s00 += w
			t0 += w * zj
			if trend {
				s01 += w * x[j]
				s11 += w * x[j] * x[j]
				t1 += w * x[j] * zj
			}
		}
		if !trend {
			if !(s00 > 0) {
				return false
			}
			beta = [2]float64{t0 / s00, 0}
			inv = [2][2]float64{{1 / s00, 0}, {0, 0}}
			return true
		}
		det := s00*s11 - s01*s01
		if !(det > 0) {
			return false
		}
		beta = [2]float64{(s11*t0 - s01*t1) / det, (s00*t1 - s01*t0) / det}
		inv = [2][2]float64{{s11 / det, -s01 / det}, {-s01 / det, s00 / det}}
		return true
	}
	for it := 0; ; it++ {
		prev := beta
		if !solve() {
			return nil, false
		}
		for j := range y {
			mu[j] = math.Exp(beta[0] + beta[1]*x[j] + off[j])
		}
		if it > 0 && math.Abs(beta[0]-prev[0]) <= 1e-12*(1+math.Abs(beta[0])) && math.Abs(beta[1]-prev[1]) <= 1e-12*(1+math.Abs(beta[1])) {
			break
		}
		if it == 100 {
			return nil, false
		}
	}
	// Covariance and hat values at the final μ.
	if !solve() {
		return nil, false
	}
	f := &wpFit{mu: append([]float64(nil), mu...), hat: make([]float64, n)}
	// solve() recomputed beta from the working response at the final μ; it equals the
	// converged beta to rounding. Keep the converged inverse and beta.
	f.beta, f.inv = beta, inv
	for j := range y {
		w := omega[j] * mu[j]
		h := inv[0][0]
		if trend {
			h += 2*inv[0][1]*x[j] + inv[1][1]*x[j]*x[j]
		}
		f.hat[j] = w * h
		f.pearson += omega[j] * (y[j] - mu[j]) * (y[j] - mu[j]) / mu[j]
	}
	return f, true
}

// farringtonExplain is the plain-words text of a month above its Farrington limit.
func farringtonExplain(m Month, st FarringtonStat, b int) string {
	if st.Expected == 0 {
		return fmt.Sprintf("In %s this theme was dominant in %d narratives, and in none of the %d months from the same season in up to %d earlier years. This marks the month for a closer reading of its narratives; it does not show that anything changed in what happened.",
			m, st.Count, st.Baseline, b)
	}
	trend := "without a time trend"
	if st.Trend {
		trend = "with a time trend"
	}
	return fmt.Sprintf("In %s this theme was dominant in %d narratives, above the upper limit of %.1f expected from the same season in up to %d earlier years (%d baseline months, expected %.1f for this month's number of narratives, quasi-Poisson %s, dispersion %.2f; Farrington score %.2f). This marks the month for a closer reading of its narratives; it does not show that anything changed in what happened.",
		m, st.Count, st.Upper, b, st.Baseline, st.Expected, trend, st.Dispersion, st.Score)
}
