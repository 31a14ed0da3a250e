package trend

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
)

// TestOSHACorpus runs the monthly series, the Poisson trend, Mann–Kendall and the group
// chi-square on a real, open dataset: each abstract's "Event type" stands in for its
// dominant theme (one-hot θ), "Degree of Injury" is the group. Expected values:
// testdata/osha.json, made from the same CSV by testdata/gen_osha.py with Debian's
// python3-statsmodels and python3-scipy. Fails when the corpus is not found.
func TestOSHACorpus(t *testing.T) {
	oshaPath := filepath.Join(sharedCorpora(t), "osha-abstracts", "osha.csv")
	f, err := os.Open(oshaPath)
	if err != nil {
		t.Fatalf("corpus not available: %v", err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("%s: %v", oshaPath, err)
	}
	var fx struct {
		Types, Degrees                []string
		First, Last                   string
		Months                        []string
		Totals                        []int
		First_coverage, Last_coverage float64
		Series                        []struct {
			Theme int
			Name  string
			Cells []*struct {
				Count, Total int
				Low, High    float64
			}
			Beta, SE    []float64
			P, Deviance float64
			Tau         float64
		}
		Chisq struct {
			Counts   [][]int
			Stat, P  float64
			DF       int
			Residual [][]float64
		}
	}
	readFixture(t, "osha.json", &fx)
	head := recs[0]
	col := func(name string) int {
		i := slices.Index(head, name)
		if i < 0 {
			t.Fatalf("%s: no column %q", oshaPath, name)
		}
		return i
	}
	cDate, cType, cDeg := col("Event Date"), col("Event type"), col("Degree of Injury")
	var docs []Doc
	for line, r := range recs[1:] {
		p := strings.Split(r[cDate], "/")
		if len(p) != 3 {
			t.Fatalf("%s: record %d: date %q", oshaPath, line+2, r[cDate])
		}
		m, _ := strconv.Atoi(p[0])
		d, _ := strconv.Atoi(p[1])
		y, _ := strconv.Atoi(p[2])
		theta := make([]float64, len(fx.Types))
		k := slices.Index(fx.Types, r[cType])
		if k < 0 {
			t.Fatalf("record %d: event type %q not in fixture", line+2, r[cType])
		}
		theta[k] = 1
		docs = append(docs, Doc{Date: time.Date(y, time.Month(m), d, 0, 0, 0, 0, time.UTC), Theta: theta, Group: r[cDeg]})
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
			t.Errorf("month %d: %s total %d, want %s %d", i, mi.Month, mi.Total, fx.Months[i], fx.Totals[i])
		}
	}
	if first, last := s.Months[0], s.Months[len(s.Months)-1]; !close(first.Coverage, fx.First_coverage, 1e-15) || first.Partial ||
		!close(last.Coverage, fx.Last_coverage, 1e-15) || !last.Partial {
		t.Errorf("coverage first %v (partial %v), last %v (partial %v); want %v, %v", first.Coverage, first.Partial, last.Coverage, last.Partial, fx.First_coverage, fx.Last_coverage)
	}
	for _, ser := range fx.Series {
		for i, w := range ser.Cells {
			if w == nil {
				continue
			}
			c := s.Cells[i][ser.Theme]
			if c.Count != w.Count || !close(c.Low, w.Low, 1e-12) || !close(c.High, w.High, 1e-12) {
				t.Errorf("%s %s: %d [%v, %v], statsmodels %d [%v, %v]", ser.Name, s.Months[i].Month, c.Count, c.Low, c.High, w.Count, w.Low, w.High)
			}
		}
		pt, err := Poisson(s, ser.Theme, 0)
		if err != nil {
			t.Fatalf("%s: %v", ser.Name, err)
		}
		if !close(pt.Beta[0], ser.Beta[0], 1e-10) || !close(pt.Beta[1], ser.Beta[1], 1e-10) || !close(pt.SE[1], ser.SE[1], 1e-10) ||
			!relClose(pt.P, ser.P, 1e-8) || !close(pt.Deviance, ser.Deviance, 1e-10) {
			t.Errorf("%s Poisson: β %v se %v p %v D %v; statsmodels %v %v %v %v", ser.Name, pt.Beta, pt.SE, pt.P, pt.Deviance, ser.Beta, ser.SE, ser.P, ser.Deviance)
		}
		mk, err := MannKendallShare(s, ser.Theme)
		if err != nil || !close(mk.Tau, ser.Tau, 1e-12) {
			t.Errorf("%s Kendall τ %v, scipy %v (%v)", ser.Name, mk.Tau, ser.Tau, err)
		}
	}
	g, err := Groups(docs, GroupSettings{})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(g.Groups, fx.Degrees) || g.Test == nil {
		t.Fatalf("groups %v", g.Groups)
	}
	c := g.Test
	if !close(c.Stat, fx.Chisq.Stat, 1e-12) || !relClose(c.P, fx.Chisq.P, 1e-9) || c.DF != fx.Chisq.DF {
		t.Errorf("chi-square %v p %v df %d; scipy %v %v %d", c.Stat, c.P, c.DF, fx.Chisq.Stat, fx.Chisq.P, fx.Chisq.DF)
	}
	for i := range fx.Chisq.Counts {
		for j := range fx.Chisq.Counts[i] {
			if g.Counts[i][j] != fx.Chisq.Counts[i][j] || !close(c.Residual[i][j], fx.Chisq.Residual[i][j], 1e-12) {
				t.Errorf("cell %d,%d: %d r %v; statsmodels %d %v", i, j, g.Counts[i][j], c.Residual[i][j], fx.Chisq.Counts[i][j], fx.Chisq.Residual[i][j])
			}
		}
	}
}
