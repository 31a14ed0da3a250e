package trend

import (
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"
)

// sharedCorpora finds the team's shared/corpora folder (SOURCES.md there names the
// datasets): $UNDERCURRENT_SHARED/corpora, else the nearest parent folder holding
// shared/corpora. It fails the test when there is none, so that a check on real data never
// passes by being skipped.
func sharedCorpora(tb testing.TB) string {
	tb.Helper()
	if d := os.Getenv("UNDERCURRENT_SHARED"); d != "" {
		return filepath.Join(d, "corpora")
	}
	wd, _ := os.Getwd()
	for d := wd; ; d = filepath.Dir(d) {
		c := filepath.Join(d, "shared", "corpora")
		if st, err := os.Stat(c); err == nil && st.IsDir() {
			return c
		}
		if filepath.Dir(d) == d {
			break
		}
	}
	tb.Fatal("shared/corpora not found: set UNDERCURRENT_SHARED or put shared/ beside the repository")
	return ""
}

// TestSAFENETCorpus runs the monthly series and the Farrington limits on 23 years of
// real, seasonal reports: each report's "Event Incident Type" labels stand in for themes
// (θ = 1/k over its k labels). Expected values: testdata/safenet.json, made from the same
// files by testdata/gen_safenet.py (monthly figures by hand; Farrington limits by
// gen_farrington.py around Debian's python3-statsmodels). Fails when the corpus is not
// found.
func TestSAFENETCorpus(t *testing.T) {
	dir := filepath.Join(sharedCorpora(t), "safenet")
	files, _ := filepath.Glob(filepath.Join(dir, "SAFENET_*.csv"))
	if len(files) == 0 {
		t.Fatalf("%s: no SAFENET_*.csv", dir)
	}
	var fx struct {
		Names       []string
		Blank_dates int
		Reports     int
		Months      []string
		Totals      []int
		Counts      [][]int
		Expected    [][]float64
		Farrington  map[string][]*struct {
			Expected, Upper float64
			Score           *float64
			Phi             float64
			Trend           bool
			Baseline        int
		}
	}
	readFixture(t, "safenet.json", &fx)
	slices.Sort(files)
	var docs []Doc
	blank := 0
	for _, path := range files {
		f, err := os.Open(path)
		if err != nil {
			t.Fatal(err)
		}
		r := csv.NewReader(f)
		r.TrimLeadingSpace = true // fields are separated by ", " (SOURCES.md)
		recs, err := r.ReadAll()
		f.Close()
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		di, ti := slices.Index(recs[0], "Event Start Date"), slices.Index(recs[0], "Event Incident Type")
		for line, rec := range recs[1:] {
			date := strings.TrimSpace(rec[di])
			if date == "" {
				blank++
				continue
			}
			d, err := time.Parse("01/02/2006", strings.Fields(date)[0])
			if err != nil {
				t.Fatalf("%s: record %d: %v", path, line+2, err)
			}
			var labels []string
			for _, l := range strings.Split(rec[ti], ";") {
				if l = strings.TrimSpace(l); l != "" && !slices.Contains(labels, l) {
					labels = append(labels, l)
				}
			}
			if len(labels) == 0 {
				labels = []string{"(none)"}
			}
			theta := make([]float64, len(fx.Names))
			for _, l := range labels {
				k := slices.Index(fx.Names, l)
				if k < 0 {
					t.Fatalf("%s: record %d: label %q not in fixture", path, line+2, l)
				}
				theta[k] = 1 / float64(len(labels))
			}
			// 1/3 three times sums to 1 within rounding; Monthly accepts 1e-6.
			docs = append(docs, Doc{Date: d, Theta: theta})
		}
	}
	if blank != fx.Blank_dates || len(docs) != fx.Reports {
		t.Fatalf("%d reports, %d blank dates; want %d, %d", len(docs), blank, fx.Reports, fx.Blank_dates)
	}
	s, err := Monthly(docs, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Months) != len(fx.Months) {
		t.Fatalf("%d months, want %d", len(s.Months), len(fx.Months))
	}
	for i, mi := range s.Months {
		if mi.Month.String() != fx.Months[i] || mi.Total != fx.Totals[i] || mi.Gap != (fx.Totals[i] == 0) {
			t.Fatalf("month %d: %s %d, want %s %d", i, mi.Month, mi.Total, fx.Months[i], fx.Totals[i])
		}
		for k := range fx.Names {
			if c := s.Cells[i][k]; c.Count != fx.Counts[i][k] || !close(c.Expected, fx.Expected[i][k], 1e-12) {
				t.Errorf("%s %s: %d %v, want %d %v", mi.Month, fx.Names[k], c.Count, c.Expected, fx.Counts[i][k], fx.Expected[i][k])
			}
		}
	}
	names := make([]string, 0, len(fx.Farrington))
	for n := range fx.Farrington {
		names = append(names, n)
	}
	slices.Sort(names)
	compared := 0
	for _, name := range names {
		want := fx.Farrington[name]
		got := FarringtonLimits(s, slices.Index(fx.Names, name), FarringtonSettings{})
		for i, w := range want {
			g := got[i]
			if w == nil {
				if g.OK {
					t.Errorf("%s %s: limit %+v, want none", name, s.Months[i].Month, g)
				}
				continue
			}
			compared++
			score := math.NaN()
			if w.Score != nil {
				score = *w.Score
			}
			if !g.OK || g.Trend != w.Trend || g.Baseline != w.Baseline || !close(g.Expected, w.Expected, 1e-8) ||
				!close(g.Upper, w.Upper, 1e-8) || !close(g.Dispersion, w.Phi, 1e-8) || (w.Score != nil && !close(g.Score, score, 1e-8)) {
				t.Errorf("%s %s: %+v; want μ0 %v U %v score %v φ %v trend %v baseline %d", name, s.Months[i].Month, g, w.Expected, w.Upper, score, w.Phi, w.Trend, w.Baseline)
			}
		}
	}
	if compared < 400 {
		t.Errorf("only %d limits compared", compared)
	}
	t.Logf("%d reports, %d months, %d Farrington limits compared", len(docs), len(s.Months), compared)
}
