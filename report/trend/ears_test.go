package trend

import (
	"math"
	"strings"
	"testing"
)

// seriesOf builds a two-theme Series from monthly totals and counts of theme
// 0 (theme 1 takes the rest); a negative total marks a gap month.
func seriesOf(t *testing.T, start string, totals, counts []int) *Series {
	t.Helper()
	m0, err := ParseMonth(start)
	if err != nil {
		t.Fatal(err)
	}
	s := &Series{Themes: 2, Confidence: 0.95}
	for i, n := range totals {
		mi := MonthInfo{Month: m0 + Month(i), Total: n, Coverage: 1}
		cells := make([]Cell, 2)
		if n < 0 {
			mi.Total, mi.Gap = 0, true
			for k := range cells {
				cells[k] = Cell{Share: math.NaN(), Low: math.NaN(), High: math.NaN()}
			}
		} else {
			for k, c := range []int{counts[i], n - counts[i]} {
				l, h := Wilson(c, n, 0.95)
				cells[k] = Cell{Count: c, Expected: float64(c), Share: float64(c) / float64(n), Low: l, High: h}
			}
		}
		s.Months = append(s.Months, mi)
		s.Cells = append(s.Cells, cells)
	}
	return s
}

type earsFixture struct {
	Start          string
	Totals, Counts []*int
	C1, C2         []*struct {
		Value, Mean, SD float64
		Floored         bool
	}
	C3 []*float64
}

func loadEARS(t *testing.T) (*Series, earsFixture) {
	var fx earsFixture
	readFixture(t, "ears.json", &fx)
	var totals, counts []int
	for i := range fx.Totals {
		if fx.Totals[i] == nil {
			totals, counts = append(totals, -1), append(counts, 0)
		} else {
			totals, counts = append(totals, *fx.Totals[i]), append(counts, *fx.Counts[i])
		}
	}
	return seriesOf(t, fx.Start, totals, counts), fx
}

func TestEARSFixture(t *testing.T) {
	// Expected values: testdata/ears.json, computed independently with numpy by
	// testdata/gen_ears.py from the formulas in the Method doc comment.
	s, fx := loadEARS(t)
	for _, tc := range []struct {
		m    Method
		want []*struct {
			Value, Mean, SD float64
			Floored         bool
		}
	}{{C1, fx.C1}, {C2, fx.C2}} {
		got := EARS(s, 0, tc.m, ChangeSettings{})
		for i, w := range tc.want {
			g := got[i]
			if w == nil {
				if !math.IsNaN(g.Value) {
					t.Errorf("%v %s = %v, want none", tc.m, s.Months[i].Month, g.Value)
				}
				continue
			}
			if !close(g.Value, w.Value, 1e-12) || !close(g.Mean, w.Mean, 1e-12) || !close(g.SD, w.SD, 1e-12) || g.Floored != w.Floored {
				t.Errorf("%v %s = %+v, numpy %+v", tc.m, s.Months[i].Month, g, *w)
			}
		}
	}
	got := EARS(s, 0, C3, ChangeSettings{})
	for i, w := range fx.C3 {
		if (w == nil) != math.IsNaN(got[i].Value) || (w != nil && !close(got[i].Value, *w, 1e-12)) {
			t.Errorf("C3 %s = %v, numpy %v", s.Months[i].Month, got[i].Value, w)
		}
	}
}

func TestChanges(t *testing.T) {
	s, _ := loadEARS(t)
	flags := Changes(s, ChangeSettings{Methods: []Method{C1, C2, C3}})
	var got []string
	for _, f := range flags {
		if f.Theme != 0 {
			continue
		}
		got = append(got, f.Month.String()+" "+f.Method.String())
		if strings.Contains(strings.ToLower(f.Explanation), "finding") {
			t.Errorf("explanation calls the flag a finding: %s", f.Explanation)
		}
		if !strings.HasPrefix(f.Explanation, "In "+f.Month.String()+" this theme's share (") {
			t.Errorf("explanation %q", f.Explanation)
		}
	}
	// From the numpy fixture: C1 > 3 in 2022-05 and 2023-04, C2 > 3 in 2022-05 and
	// 2023-05, C3 > 2 in 2022-05..07 and 2023-05..06; 2023-05 has a count of 2, below
	// MinCount, so it is not flagged.
	want := "2022-05 C1,2022-05 C2,2022-05 C3,2022-06 C3,2022-07 C3,2023-04 C1,2023-06 C3"
	if strings.Join(got, ",") != want {
		t.Errorf("flags\n got %s\nwant %s", strings.Join(got, ","), want)
	}
	f := flags[0]
	wantText := "In 2022-05 this theme's share (30.0%) was above the upper limit expected from the previous 7 months with data (2021-10 to 2022-04: mean 9.8%, sd 3.6% (the binomial floor for the month's number of narratives); C1 = 5.62 > 3)."
	if !strings.HasPrefix(f.Explanation, wantText) {
		t.Errorf("explanation\n got %s\nwant %s", f.Explanation, wantText)
	}
}
