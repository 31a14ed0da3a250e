package trend

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestLongRunFixture(t *testing.T) {
	// Expected values: testdata/longrun.json, made by testdata/gen_longrun.py with
	// Debian's python3-statsmodels (GLM Poisson with log(total) offset; scale="X2" for
	// the quasi-Poisson se; get_prediction for the fitted first and last shares) and python3-scipy (kendalltau, theilslopes), plus a hand
	// Mann–Kendall with tie and continuity corrections.
	var fx struct {
		Cases []struct {
			Name                              string
			Totals, Counts                    []*int
			Beta, SE                          []float64
			P, Z, Deviance, Null_deviance     float64
			Lr_p, Dispersion, Quasi_se        float64
			Quasi_p, Mk_s, Mk_var, Mk_z, Mk_p float64
			Scipy_tau, Sen_slope              float64
			Fitted_first, Fitted_last         []float64
		}
	}
	readFixture(t, "longrun.json", &fx)
	if len(fx.Cases) != 3 {
		t.Fatalf("%d cases", len(fx.Cases))
	}
	for _, c := range fx.Cases {
		var totals, counts []int
		for i := range c.Totals {
			if c.Totals[i] == nil {
				totals, counts = append(totals, -1), append(counts, 0)
			} else {
				totals, counts = append(totals, *c.Totals[i]), append(counts, *c.Counts[i])
			}
		}
		s := seriesOf(t, "2021-01", totals, counts)
		r, err := Poisson(s, 0, 0.95)
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		const tol = 1e-10
		for _, chk := range []struct {
			name      string
			got, want float64
		}{
			{"beta0", r.Beta[0], c.Beta[0]}, {"beta1", r.Beta[1], c.Beta[1]},
			{"se0", r.SE[0], c.SE[0]}, {"se1", r.SE[1], c.SE[1]},
			{"z", r.Z, c.Z}, {"p", r.P, c.P},
			{"deviance", r.Deviance, c.Deviance}, {"null deviance", r.NullDeviance, c.Null_deviance},
			{"LR p", r.LRP, c.Lr_p}, {"dispersion", r.Dispersion, c.Dispersion},
			{"quasi se", r.QuasiSE, c.Quasi_se}, {"quasi p", r.QuasiP, c.Quasi_p},
			{"rate ratio", r.RateRatio, math.Exp(c.Beta[1])},
			{"first share", r.FirstShare, c.Fitted_first[0]}, {"first low", r.FirstLow, c.Fitted_first[1]},
			{"first high", r.FirstHigh, c.Fitted_first[2]}, {"last share", r.LastShare, c.Fitted_last[0]},
			{"last low", r.LastLow, c.Fitted_last[1]}, {"last high", r.LastHigh, c.Fitted_last[2]},
		} {
			if !close(chk.got, chk.want, tol) {
				t.Errorf("%s %s = %v, statsmodels %v", c.Name, chk.name, chk.got, chk.want)
			}
		}
		se := c.SE[1]
		if c.Dispersion > 1 {
			se = c.Quasi_se
		}
		if !close(r.Low, math.Exp(c.Beta[1]-1.959963984540054*se), tol) || !close(r.High, math.Exp(c.Beta[1]+1.959963984540054*se), tol) {
			t.Errorf("%s rate ratio interval %v–%v", c.Name, r.Low, r.High)
		}
		mk, err := MannKendallShare(s, 0)
		if err != nil {
			t.Fatal(err)
		}
		for _, chk := range []struct {
			name      string
			got, want float64
		}{
			{"S", mk.S, c.Mk_s}, {"Var", mk.Var, c.Mk_var}, {"Z", mk.Z, c.Mk_z}, {"p", mk.P, c.Mk_p},
			{"tau (scipy)", mk.Tau, c.Scipy_tau}, {"Sen slope (scipy)", mk.Slope, c.Sen_slope},
		} {
			if !close(chk.got, chk.want, 1e-12) {
				t.Errorf("%s Mann–Kendall %s = %v, want %v", c.Name, chk.name, chk.got, chk.want)
			}
		}
	}
}

func TestLongRunTooLittle(t *testing.T) {
	for name, s := range map[string]*Series{
		"two months": seriesOf(t, "2021-01", []int{10, 10}, []int{1, 2}),
		"never":      seriesOf(t, "2021-01", []int{10, 10, 10}, []int{0, 0, 0}),
		"always":     seriesOf(t, "2021-01", []int{10, 10, 10}, []int{10, 10, 10}),
	} {
		if _, err := Poisson(s, 0, 0); !errors.Is(err, ErrNoTrend) {
			t.Errorf("%s: Poisson error %v", name, err)
		}
	}
	if _, err := MannKendallShare(seriesOf(t, "2021-01", []int{10, -1, 10}, []int{1, 0, 2}), 0); !errors.Is(err, ErrNoTrend) {
		t.Errorf("two months with data: Mann–Kendall error %v", err)
	}
}

func TestPoissonNoFiniteEstimate(t *testing.T) {
	// All of the theme in the last month: the maximum-likelihood slope is infinite.
	s := seriesOf(t, "2021-01", []int{20, 20, 20, 20}, []int{0, 0, 0, 5})
	if _, err := Poisson(s, 0, 0); !errors.Is(err, ErrNoTrend) {
		t.Errorf("error %v, want ErrNoTrend", err)
	}
	tb := TrendTable(s, nil, 0, Publish{Everything: true})
	if ex := tb.Rows[0][len(tb.Columns)-1]; !strings.Contains(ex, "No Poisson trend") {
		t.Errorf("explanation %q", ex)
	}
	// Equal shares: no Mann–Kendall trend, p = 1.
	mk, err := MannKendallShare(seriesOf(t, "2021-01", []int{10, 20, 30}, []int{1, 2, 3}), 0)
	if err != nil || mk.S != 0 || mk.P != 1 || !math.IsNaN(mk.Tau) {
		t.Errorf("equal shares: %+v, %v", mk, err)
	}
}
