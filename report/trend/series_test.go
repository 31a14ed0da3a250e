package trend

import (
	"math"
	"strconv"
	"strings"
	"testing"
	"time"
)

func day(s string) time.Time {
	t, err := time.Parse(time.DateOnly, s)
	if err != nil {
		panic(err)
	}
	return t
}

func TestMonthly(t *testing.T) {
	// Hand-made: data 2023-01-10 .. 2023-04-20, nothing in March.
	docs := []Doc{
		{Date: day("2023-01-10"), Theta: []float64{0.7, 0.3}},
		{Date: day("2023-01-31"), Theta: []float64{0.2, 0.8}},
		{Date: day("2023-02-01"), Theta: []float64{0.5, 0.5}}, // tie: lowest index wins
		{Date: day("2023-02-28"), Theta: []float64{0.9, 0.1}},
		{Date: day("2023-02-14"), Theta: []float64{0.4, 0.6}},
		{Date: day("2023-04-20"), Theta: []float64{1, 0}},
	}
	s, err := Monthly(docs, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	want := []MonthInfo{
		{Month: MonthFor(2023, 1), Total: 2, Coverage: 22.0 / 31, Partial: true},
		{Month: MonthFor(2023, 2), Total: 3, Coverage: 1},
		{Month: MonthFor(2023, 3), Total: 0, Coverage: 1, Gap: true},
		{Month: MonthFor(2023, 4), Total: 1, Coverage: 20.0 / 30, Partial: true},
	}
	if len(s.Months) != len(want) {
		t.Fatalf("%d months, want %d", len(s.Months), len(want))
	}
	for i, w := range want {
		if g := s.Months[i]; g.Month != w.Month || g.Total != w.Total || !close(g.Coverage, w.Coverage, 1e-15) || g.Partial != w.Partial || g.Gap != w.Gap {
			t.Errorf("month %d = %+v, want %+v", i, g, w)
		}
	}
	counts := [][]int{{1, 1}, {2, 1}, {0, 0}, {1, 0}}
	expected := [][]float64{{0.9, 1.1}, {1.8, 1.2}, {0, 0}, {1, 0}}
	for i := range counts {
		for k := range counts[i] {
			c := s.Cells[i][k]
			if c.Count != counts[i][k] || !close(c.Expected, expected[i][k], 1e-12) {
				t.Errorf("cell %d,%d = %d, %v; want %d, %v", i, k, c.Count, c.Expected, counts[i][k], expected[i][k])
			}
			if s.Months[i].Gap {
				if !math.IsNaN(c.Share) || !math.IsNaN(c.Low) {
					t.Errorf("gap cell %d,%d has share %v", i, k, c.Share)
				}
				continue
			}
			l, h := Wilson(c.Count, s.Months[i].Total, 0.95)
			if c.Share != float64(c.Count)/float64(s.Months[i].Total) || c.Low != l || c.High != h {
				t.Errorf("cell %d,%d share %v [%v, %v]", i, k, c.Share, c.Low, c.High)
			}
		}
	}

	// A stated range makes January and April whole.
	s, err = Monthly(docs, Settings{From: day("2023-01-01"), To: day("2023-04-30")})
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range s.Months {
		if m.Partial || m.Coverage != 1 {
			t.Errorf("%s partial with stated range", m.Month)
		}
	}
}

func TestMonthlyErrors(t *testing.T) {
	ok := []float64{0.5, 0.5}
	for _, tc := range []struct {
		name string
		docs []Doc
		set  Settings
		want string
	}{
		{"empty", nil, Settings{}, "no narratives"},
		{"no date", []Doc{{Theta: ok}}, Settings{}, "doc 0: no date"},
		{"length", []Doc{{Date: day("2023-01-01"), Theta: ok}, {Date: day("2023-01-01"), Theta: []float64{1}}}, Settings{}, "doc 1: 1 theme shares"},
		{"sum", []Doc{{Date: day("2023-01-01"), Theta: []float64{0.5, 0.6}}}, Settings{}, "sum to"},
		{"negative", []Doc{{Date: day("2023-01-01"), Theta: []float64{1.5, -0.5}}}, Settings{}, "theme 1 share"},
		{"nan", []Doc{{Date: day("2023-01-01"), Theta: []float64{math.NaN(), 1}}}, Settings{}, "theme 0 share"},
		{"outside", []Doc{{Date: day("2023-03-01"), Theta: ok}, {Date: day("2023-01-01"), Theta: ok}}, Settings{From: day("2023-02-01")}, "outside the covered range"},
		{"confidence", []Doc{{Date: day("2023-01-05"), Theta: ok}}, Settings{Confidence: 95}, "confidence level 95"},
		{"reversed", []Doc{{Date: day("2023-01-05"), Theta: ok}}, Settings{From: day("2023-01-05"), To: day("2023-01-01")}, "ends"},
	} {
		_, err := Monthly(tc.docs, tc.set)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want %q", tc.name, err, tc.want)
		}
	}
}

func TestMonthlyMonthOnly(t *testing.T) {
	// Data with months only, as documented on Doc.Date.
	var docs []Doc
	for _, s := range []string{"2023-01", "2023-03", "2023-03"} {
		m, _ := ParseMonth(s)
		docs = append(docs, Doc{Date: m.Start(), Theta: []float64{1}})
	}
	first, _ := ParseMonth("2023-01")
	last, _ := ParseMonth("2023-03")
	s, err := Monthly(docs, Settings{From: first.Start(), To: last.End()})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Months) != 3 || s.Months[0].Partial || s.Months[2].Partial || !s.Months[1].Gap || s.Months[2].Total != 2 {
		t.Errorf("months %+v", s.Months)
	}
}

func BenchmarkMonthly(b *testing.B) {
	for _, n := range []int{1000, 100000} {
		docs := make([]Doc, n)
		for i := range docs {
			theta := make([]float64, 20)
			theta[i%20] = 0.5
			theta[(i+7)%20] += 0.5
			docs[i] = Doc{Date: day("2020-01-01").AddDate(0, 0, i%1500), Theta: theta}
		}
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			for b.Loop() {
				s, _ := Monthly(docs, Settings{})
				Changes(s, ChangeSettings{})
				SeriesTable(s, nil, nil, Publish{})
			}
		})
	}
}
