package trend

import (
	"math"
	"strconv"
	"strings"
	"testing"
)

func TestFarringtonFixture(t *testing.T) {
	// Expected values: testdata/farrington.json, made by testdata/gen_farrington.py:
	// the steps of the FarringtonLimits doc comment around Debian's python3-statsmodels
	// GLM fits (Poisson, offset, var_weights), hat values and covariances.
	var fx struct {
		Cases []struct {
			Name, Start    string
			Totals, Counts []*int
			Limits         []*struct {
				Expected, Upper float64
				Score           *float64
				Phi             float64
				Trend           bool
				Baseline        int
			}
		}
	}
	readFixture(t, "farrington.json", &fx)
	trendKept := 0
	for _, c := range fx.Cases {
		var totals, counts []int
		for i := range c.Totals {
			if c.Totals[i] == nil {
				totals, counts = append(totals, -1), append(counts, 0)
			} else {
				totals, counts = append(totals, *c.Totals[i]), append(counts, *c.Counts[i])
			}
		}
		s := seriesOf(t, c.Start, totals, counts)
		got := FarringtonLimits(s, 0, FarringtonSettings{})
		for i, w := range c.Limits {
			g := got[i]
			m := s.Months[i].Month
			if w == nil {
				if g.OK {
					t.Errorf("%s %s: limit %+v, want none", c.Name, m, g)
				}
				continue
			}
			if !g.OK || g.Trend != w.Trend || g.Baseline != w.Baseline {
				t.Errorf("%s %s: %+v, want trend %v baseline %d", c.Name, m, g, w.Trend, w.Baseline)
				continue
			}
			if g.Trend {
				trendKept++
			}
			if !close(g.Expected, w.Expected, 1e-9) || !close(g.Upper, w.Upper, 1e-9) || !close(g.Dispersion, w.Phi, 1e-9) ||
				(w.Score != nil && !close(g.Score, *w.Score, 1e-9)) {
				t.Errorf("%s %s: μ0 %v U %v score %v φ %v; statsmodels %v %v %v %v", c.Name, m, g.Expected, g.Upper, g.Score, g.Dispersion, w.Expected, w.Upper, w.Score, w.Phi)
			}
		}
	}
	if trendKept == 0 {
		t.Error("the fixture never keeps the trend; the trend branch is untested")
	}
}

func TestFarringtonFlags(t *testing.T) {
	var fx struct {
		Cases []struct {
			Name, Start    string
			Totals, Counts []*int
		}
	}
	readFixture(t, "farrington.json", &fx)
	c := fx.Cases[0]
	var totals, counts []int
	for i := range c.Totals {
		if c.Totals[i] == nil {
			totals, counts = append(totals, -1), append(counts, 0)
		} else {
			totals, counts = append(totals, *c.Totals[i]), append(counts, *c.Counts[i])
		}
	}
	s := seriesOf(t, c.Start, totals, counts)
	flags := Changes(s, ChangeSettings{Methods: []Method{Farrington}})
	var months []string
	for _, f := range flags {
		if f.Theme == 0 {
			months = append(months, f.Month.String())
			if !strings.HasPrefix(f.Explanation, "In "+f.Month.String()+" this theme was dominant in ") || strings.Contains(f.Explanation, "finding") {
				t.Errorf("explanation %q", f.Explanation)
			}
			if float64(f.Limit.Count) <= f.Limit.Upper || math.IsNaN(f.Value) {
				t.Errorf("flag %+v", f)
			}
		}
	}
	// The invented burst is in month 50 (2023-03) and stays high in 2023-04.
	if got := strings.Join(months, ","); !strings.Contains(got, "2023-03,2023-04") {
		t.Errorf("Farrington flags %s", got)
	}
}

func TestInSeasonalBaseline(t *testing.T) {
	// Against the enumeration t − 12y + j of the FarringtonLimits doc comment.
	for _, bw := range [][2]int{{3, 1}, {2, 0}, {5, 3}, {1, 2}} {
		b, w := bw[0], bw[1]
		want := map[Month]bool{}
		t0 := MonthFor(2024, 6)
		for y := 1; y <= b; y++ {
			for j := -w; j <= w; j++ {
				want[t0-Month(12*y)+Month(j)] = true
			}
		}
		for m := t0 - Month(12*b+w+5); m <= t0+2; m++ {
			if got := inSeasonalBaseline(t0, m, b, w); got != want[m] {
				t.Errorf("b=%d w=%d: %s in baseline of %s = %v", b, w, m, t0, got)
			}
		}
	}
}

func TestTrendTableCoarsening(t *testing.T) {
	// Monthly counts below 10 make the published trend row coarse; Everything is exact.
	s := seriesOf(t, "2021-01", []int{40, 50, 60, 70, 80, 90}, []int{5, 12, 15, 20, 25, 30})
	pt, err := Poisson(s, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	coarse := TrendTable(s, nil, 0, Publish{}).Rows[0]
	exact := TrendTable(s, nil, 0, Publish{Everything: true}).Rows[0]
	if coarse[4] != strconv.FormatFloat(pt.RateRatio, 'f', 2, 64) || coarse[7] != Hidden || coarse[8] != pBand(pt.P) {
		t.Errorf("coarse row %v", coarse)
	}
	if exact[4] != fmtFloat(pt.RateRatio) || exact[7] != fmtFloat(pt.Z) || exact[8] != fmtP(pt.P) {
		t.Errorf("exact row %v", exact)
	}
	for _, c := range []struct {
		p    float64
		want string
	}{{0.0004, "<0.001"}, {0.001, "<0.01"}, {0.049, "<0.05"}, {0.05, ">=0.05"}, {1, ">=0.05"}} {
		if got := pBand(c.p); got != c.want {
			t.Errorf("pBand(%v) = %s, want %s", c.p, got, c.want)
		}
	}
}

func TestFarringtonEmptyBaseline(t *testing.T) {
	// A theme absent from all of the seasonal baseline: limit 0, the month is flagged.
	totals := make([]int, 26)
	counts := make([]int, 26)
	for i := range totals {
		totals[i] = 50
	}
	counts[25] = 6
	s := seriesOf(t, "2021-01", totals, counts)
	st := FarringtonLimits(s, 0, FarringtonSettings{})[25]
	if !st.OK || st.Upper != 0 || !math.IsInf(st.Score, 1) || st.Baseline != 6 {
		t.Fatalf("limit %+v", st)
	}
	flags := Changes(s, ChangeSettings{Methods: []Method{Farrington}})
	if len(flags) != 1 || !strings.Contains(flags[0].Explanation, "in none of the 6 months") {
		t.Errorf("flags %+v", flags)
	}
}
