package trend

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/stat/distuv"
)

// PoissonTrend is the fit of a Poisson log-linear regression of a theme's monthly count
// on time, with the month's number of narratives as exposure:
//
//	log E[count_t] = β0 + β1·x_t + log(total_t),   x_t = (months since the first month)/12
//
// fitted by iteratively reweighted least squares (McCullagh & Nelder 1989, Generalized
// Linear Models, 2nd ed.) over the months with data (gaps are left out; partial
// months stay in, their smaller total is the offset). exp(β1) is the rate ratio per year:
// the factor by which the theme's share of narratives changes over twelve months.
//
// Tests of β1 = 0:
//
//	Wald:   z = β1 / se(β1), se from (XᵀWX)⁻¹, two-sided normal p
//	LR:     D0 − D1 ~ χ²(1), D the deviance 2 Σ [y log(y/μ) − (y − μ)]; the null model
//	        has β1 = 0, so μ_t = total_t · Σy / Σtotal
//	quasi:  se·sqrt(φ), φ = Pearson X²/(n−2) = Σ (y−μ)²/μ / (n−2), for counts more
//	        variable than Poisson (quasi-Poisson; Wedderburn 1974); reported as the
//	        dispersion-adjusted Wald test, the normal p as in statsmodels GLM(scale="X2")
type PoissonTrend struct {
	// Months is the number of months with data used.
	Months int
	// Beta holds β0 and β1, SE their standard errors (Poisson), Iterations the IRLS steps.
	Beta, SE   [2]float64
	Iterations int
	// Z and P are the Wald statistic and its two-sided p-value.
	Z, P float64
	// Deviance and NullDeviance are D1 and D0; LR = D0 − D1, LRP its χ²(1) p-value.
	Deviance, NullDeviance, LR, LRP float64
	// Dispersion is φ; QuasiSE, QuasiZ and QuasiP the dispersion-adjusted Wald test of
	// β1. They use φ as estimated, also when φ < 1.
	Dispersion, QuasiSE, QuasiZ, QuasiP float64
	// RateRatio is exp(β1), Low and High its Wald interval exp(β1 ∓ z·se) at the
	// requested level, using the quasi-Poisson se when φ > 1 and the Poisson se otherwise.
	RateRatio, Low, High float64
	// First and Last are the first and last months with data; FirstShare and LastShare
	// the model's fitted share in them, exp(β0 + β1·x), with Wald intervals
	// exp(η ∓ z·sqrt(xᵀVx)) on the log scale (V the covariance of β, times φ when
	// φ > 1): "the share went from about FirstShare to about LastShare".
	First, Last                     Month
	FirstShare, FirstLow, FirstHigh float64
	LastShare, LastLow, LastHigh    float64
}

// ErrNoTrend is returned when a trend cannot be estimated: fewer than three months with
// data, or a theme that is never (or always) dominant.
var ErrNoTrend = errors.New("trend: too little data to estimate a trend")

// Poisson fits the PoissonTrend of theme in s. conf is the level of the rate-ratio
// interval (0 means 0.95). It panics if theme is out of range.
func Poisson(s *Series, theme int, conf float64) (*PoissonTrend, error) {
	if theme < 0 || theme >= s.Themes {
		panic("trend: theme out of range")
	}
	z := zFor(conf)
	var x, y, off []float64
	sumY, sumN := 0.0, 0.0
	for i, mi := range s.Months {
		if mi.Gap {
			continue
		}
		x = append(x, float64(mi.Month-s.Months[0].Month)/12)
		c := float64(s.Cells[i][theme].Count)
		y = append(y, c)
		off = append(off, math.Log(float64(mi.Total)))
		sumY += c
		sumN += float64(mi.Total)
	}
	n := len(y)
	if n < 3 || sumY == 0 || sumY == sumN {
		return nil, ErrNoTrend
	}
	// Start from μ = (y + mean(y))/2, as statsmodels and R's glm do for Poisson.
	mu := make([]float64, n)
	for i := range y {
		mu[i] = (y[i] + sumY/float64(n)) / 2
	}
	var beta [2]float64
	dev := deviance(y, mu)
	r := &PoissonTrend{Months: n}
	for it := 1; ; it++ {
		// Weighted least squares of z = η − offset + (y − μ)/μ on (1, x), weights μ.
		var s00, s01, s11, t0, t1 float64
		for i := range y {
			w := mu[i]
			zi := math.Log(mu[i]) - off[i] + (y[i]-mu[i])/mu[i]
			s00 += w
			s01 += w * x[i]
			s11 += w * x[i] * x[i]
			t0 += w * zi
			t1 += w * x[i] * zi
		}
		det := s00*s11 - s01*s01
		if !(det > 0) {
			return nil, fmt.Errorf("trend: Poisson regression has no finite estimate (is all of the theme at one end of the period?): %w", ErrNoTrend)
		}
		prev := beta
		beta = [2]float64{(s11*t0 - s01*t1) / det, (s00*t1 - s01*t0) / det}
		for i := range y {
			mu[i] = math.Exp(beta[0] + beta[1]*x[i] + off[i])
		}
		d := deviance(y, mu)
		// Stop when both the deviance and the coefficients have settled.
		if it > 1 && math.Abs(d-dev) <= 1e-12*(math.Abs(d)+0.1) &&
			math.Abs(beta[0]-prev[0]) <= 1e-12*(1+math.Abs(beta[0])) &&
			math.Abs(beta[1]-prev[1]) <= 1e-12*(1+math.Abs(beta[1])) {
			dev = d
			r.Iterations = it
			break
		}
		dev = d
		if it == 100 {
			return nil, fmt.Errorf("trend: Poisson regression did not converge in 100 iterations (all of the theme at one end of the period?): %w", ErrNoTrend)
		}
	}
	// Standard errors from the weights at the final μ.
	var s00, s01, s11 float64
	for i := range y {
		s00 += mu[i]
		s01 += mu[i] * x[i]
		s11 += mu[i] * x[i] * x[i]
	}
	det := s00*s11 - s01*s01
	cov := [2][2]float64{{s11 / det, -s01 / det}, {-s01 / det, s00 / det}}
	r.Beta = beta
	r.SE = [2]float64{math.Sqrt(cov[0][0]), math.Sqrt(cov[1][1])}
	r.Z = beta[1] / r.SE[1]
	r.P = twoSided(r.Z)
	r.Deviance = dev
	mu0 := make([]float64, n)
	pearson := 0.0
	for i := range y {
		mu0[i] = math.Exp(off[i]) * sumY / sumN
		pearson += (y[i] - mu[i]) * (y[i] - mu[i]) / mu[i]
	}
	r.NullDeviance = deviance(y, mu0)
	r.LR = math.Max(0, r.NullDeviance-r.Deviance)
	r.LRP = distuv.ChiSquared{K: 1}.Survival(r.LR)
	if n > 2 {
		r.Dispersion = pearson / float64(n-2)
	} else {
		r.Dispersion = math.NaN()
	}
	r.QuasiSE = r.SE[1] * math.Sqrt(r.Dispersion)
	r.QuasiZ = beta[1] / r.QuasiSE
	r.QuasiP = twoSided(r.QuasiZ)
	se := r.SE[1]
	if r.Dispersion > 1 {
		se = r.QuasiSE
	}
	r.RateRatio = math.Exp(beta[1])
	r.Low, r.High = math.Exp(beta[1]-z*se), math.Exp(beta[1]+z*se)
	scale := 1.0
	if r.Dispersion > 1 {
		scale = r.Dispersion
	}
	fitted := func(x float64) (share, low, high float64) {
		eta := beta[0] + beta[1]*x
		sd := math.Sqrt(scale * (cov[0][0] + 2*x*cov[0][1] + x*x*cov[1][1]))
		return math.Exp(eta), math.Exp(eta - z*sd), math.Exp(eta + z*sd)
	}
	for _, mi := range s.Months {
		if !mi.Gap {
			if r.First == 0 && r.Last == 0 {
				r.First = mi.Month
			}
			r.Last = mi.Month
		}
	}
	r.FirstShare, r.FirstLow, r.FirstHigh = fitted(x[0])
	r.LastShare, r.LastLow, r.LastHigh = fitted(x[n-1])
	return r, nil
}

// deviance returns the Poisson deviance 2 Σ [y log(y/μ) − (y − μ)], with 0 log 0 = 0.
func deviance(y, mu []float64) float64 {
	d := 0.0
	for i := range y {
		if y[i] > 0 {
			d += y[i] * math.Log(y[i]/mu[i])
		}
		d -= y[i] - mu[i]
	}
	return 2 * d
}

// twoSided returns the two-sided normal p-value of z, erfc(|z|/√2), accurate far into
// the tail (1 − Φ would round to 0 beyond |z| ≈ 8).
func twoSided(z float64) float64 { return math.Erfc(math.Abs(z) / math.Sqrt2) }

// MannKendall is the Mann–Kendall test for a monotonic trend (Mann 1945; Kendall 1975,
// Rank Correlation Methods) of a theme's monthly share over the months with data:
//
//	S    = Σ_{i<j} sign(x_j − x_i)
//	Var  = [n(n−1)(2n+5) − Σ_g t_g(t_g−1)(2t_g+5)] / 18    t_g: sizes of groups of tied shares
//	Z    = (S − 1)/sqrt(Var) if S > 0,  0 if S = 0,  (S + 1)/sqrt(Var) if S < 0
//	p    = two-sided normal p of Z
//	tau  = S / sqrt(n₀(n₀ − n₁)),  n₀ = n(n−1)/2,  n₁ = Σ_g t_g(t_g−1)/2   (Kendall's τ_b
//	       against time, which has no ties)
//
// Slope is the Theil–Sen slope (Sen 1968): the median of (x_j − x_i)/(t_j − t_i) over
// i < j, in share per year. The test uses only the order of the shares, not their size or
// the months' numbers of narratives: read it beside the Poisson trend.
type MannKendall struct {
	N            int
	S, Var, Z, P float64
	Tau          float64
	Slope        float64
}

// MannKendallShare computes the MannKendall test of theme's share in s. It returns
// ErrNoTrend if fewer than three months have data. It panics if theme is out of range.
func MannKendallShare(s *Series, theme int) (*MannKendall, error) {
	if theme < 0 || theme >= s.Themes {
		panic("trend: theme out of range")
	}
	var t, x []float64
	for i, mi := range s.Months {
		if !mi.Gap {
			t = append(t, float64(mi.Month-s.Months[0].Month)/12)
			x = append(x, s.Cells[i][theme].Share)
		}
	}
	return mannKendall(t, x)
}

func mannKendall(t, x []float64) (*MannKendall, error) {
	n := len(x)
	if n < 3 {
		return nil, ErrNoTrend
	}
	r := &MannKendall{N: n}
	var slopes []float64
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			switch {
			case x[j] > x[i]:
				r.S++
			case x[j] < x[i]:
				r.S--
			}
			slopes = append(slopes, (x[j]-x[i])/(t[j]-t[i]))
		}
	}
	sorted := append([]float64(nil), x...)
	sort.Float64s(sorted)
	nf := float64(n)
	v := nf * (nf - 1) * (2*nf + 5)
	n1 := 0.0
	for i := 0; i < n; {
		j := i
		for j < n && sorted[j] == sorted[i] {
			j++
		}
		g := float64(j - i)
		v -= g * (g - 1) * (2*g + 5)
		n1 += g * (g - 1) / 2
		i = j
	}
	r.Var = v / 18
	switch {
	case r.S > 0:
		r.Z = (r.S - 1) / math.Sqrt(r.Var)
	case r.S < 0:
		r.Z = (r.S + 1) / math.Sqrt(r.Var)
	}
	if r.Var == 0 {
		r.Z = 0
	}
	r.P = twoSided(r.Z)
	n0 := nf * (nf - 1) / 2
	r.Tau = math.NaN()
	if n0 > n1 {
		r.Tau = r.S / math.Sqrt(n0*(n0-n1))
	}
	sort.Float64s(slopes)
	m := len(slopes)
	if m%2 == 1 {
		r.Slope = slopes[m/2]
	} else {
		r.Slope = (slopes[m/2-1] + slopes[m/2]) / 2
	}
	return r, nil
}
