package trend

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

func TestChiSquareFixture(t *testing.T) {
	// Expected values: testdata/chisq.json, made by testdata/gen_chisq.py with Debian's
	// python3-scipy chi2_contingency(correction=False) and python3-statsmodels
	// Table.standardized_resids (the adjusted residuals of Agresti).
	var fx struct {
		Cases []struct {
			Name               string
			Counts             [][]int
			Stat, P            float64
			DF                 int
			Expected, Residual [][]float64
		}
	}
	readFixture(t, "chisq.json", &fx)
	for _, c := range fx.Cases {
		cs, err := ChiSquareTest(c.Counts, 0, false)
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		if !close(cs.Stat, c.Stat, 1e-12) || !close(cs.P, c.P, 1e-10) || cs.DF != c.DF {
			t.Errorf("%s: X² = %v, p = %v, df %d; scipy %v, %v, %d", c.Name, cs.Stat, cs.P, cs.DF, c.Stat, c.P, c.DF)
		}
		for i := range c.Counts {
			for j := range c.Counts[i] {
				if !close(cs.Expected[i][j], c.Expected[i][j], 1e-12) || !close(cs.Residual[i][j], c.Residual[i][j], 1e-12) {
					t.Errorf("%s cell %d,%d: e %v r %v; scipy/statsmodels %v %v", c.Name, i, j, cs.Expected[i][j], cs.Residual[i][j], c.Expected[i][j], c.Residual[i][j])
				}
				if cs.StandsOut[i][j] != (math.Abs(c.Residual[i][j]) > cs.Critical) {
					t.Errorf("%s cell %d,%d: stands out %v", c.Name, i, j, cs.StandsOut[i][j])
				}
			}
		}
		// Bonferroni: z_{1−0.05/(2m)}; for the 3×4 table m = 12, z = 2.8653 (normal table).
		if want := distuv.UnitNormal.Quantile(1 - 0.05/(2*float64(len(c.Counts)*len(c.Counts[0])))); !close(cs.Critical, want, 1e-15) {
			t.Errorf("%s: critical %v, want %v", c.Name, cs.Critical, want)
		}
	}
	cs, _ := ChiSquareTest(fx.Cases[0].Counts, 0, true)
	if math.Abs(cs.Critical-1.959964) > 1e-6 {
		t.Errorf("unadjusted critical %v, want 1.959964 (normal table)", cs.Critical)
	}
	cs, _ = ChiSquareTest(fx.Cases[0].Counts, 0, false)
	if math.Abs(cs.Critical-2.8653) > 1e-4 {
		t.Errorf("Bonferroni critical for 12 cells %v, want 2.8653", cs.Critical)
	}
}

func TestChiSquareEmptyAndErrors(t *testing.T) {
	// An all-zero column is left out: same statistic as without it.
	with, err := ChiSquareTest([][]int{{12, 0, 5}, {3, 0, 17}}, 0, false)
	if err != nil {
		t.Fatal(err)
	}
	without, _ := ChiSquareTest([][]int{{12, 5}, {3, 17}}, 0, false)
	if !close(with.Stat, without.Stat, 1e-15) || with.DF != 1 || with.Cells != 4 || !math.IsNaN(with.Residual[0][1]) {
		t.Errorf("empty column: X² %v df %d cells %d", with.Stat, with.DF, with.Cells)
	}
	if _, err := ChiSquareTest([][]int{{1, 2}}, 0, false); err == nil {
		t.Error("one row: no error")
	}
	if !panics(func() { ChiSquareTest([][]int{{1, 2}, {1}}, 0, false) }) {
		t.Error("ragged: no panic")
	}
}

func TestGroups(t *testing.T) {
	docs := []Doc{
		{Group: "north", Theta: []float64{0.9, 0.1}},
		{Group: "north", Theta: []float64{0.8, 0.2}},
		{Group: "north", Theta: []float64{0.3, 0.7}},
		{Group: "east", Theta: []float64{0.1, 0.9}},
		{Group: "east", Theta: []float64{0.4, 0.6}},
	}
	g, err := Groups(docs, GroupSettings{})
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(g.Groups, ",") != "east,north" || g.Totals[0] != 2 || g.Totals[1] != 3 {
		t.Fatalf("groups %v totals %v", g.Groups, g.Totals)
	}
	if g.Counts[0][1] != 2 || g.Counts[1][0] != 2 || !close(g.Expected[1][0], 2.0, 1e-12) {
		t.Errorf("counts %v expected %v", g.Counts, g.Expected)
	}
	if l, h := Wilson(2, 3, 0.95); g.Low[1][0] != l || g.High[1][0] != h || g.Share[1][0] != 2.0/3 {
		t.Errorf("north theme 0 share %v [%v, %v]", g.Share[1][0], g.Low[1][0], g.High[1][0])
	}
	if g.Test == nil || g.Test.DF != 1 {
		t.Errorf("test %+v", g.Test)
	}
}

func TestGroupTestTableWithheld(t *testing.T) {
	var docs []Doc
	add := func(g string, n int, theta []float64) {
		for i := 0; i < n; i++ {
			docs = append(docs, Doc{Group: g, Theta: theta})
		}
	}
	add("east", 30, []float64{1, 0})
	add("east", 4, []float64{0, 1})
	add("west", 20, []float64{1, 0})
	add("west", 25, []float64{0, 1})
	g, err := Groups(docs, GroupSettings{})
	if err != nil {
		t.Fatal(err)
	}
	row := GroupTestTable(g, GroupSettings{}, Publish{}).Rows[0]
	if row[2] != Hidden || row[4] != pBand(g.Test.P) || row[3] != "1" {
		t.Errorf("published test row %v", row)
	}
	row = GroupTestTable(g, GroupSettings{}, Publish{Everything: true}).Rows[0]
	if row[2] != fmtFloat(g.Test.Stat) || row[4] != fmtP(g.Test.P) {
		t.Errorf("private test row %v", row)
	}
}

func TestGroupsBadSettings(t *testing.T) {
	docs := []Doc{{Group: "a", Theta: []float64{1}}}
	for _, gs := range []GroupSettings{{Confidence: 1.5}, {Alpha: -0.1}} {
		if _, err := Groups(docs, gs); err == nil {
			t.Errorf("%+v: no error", gs)
		}
	}
	if _, err := Groups(nil, GroupSettings{}); err == nil {
		t.Error("no docs: no error")
	}
}

func TestGroupsAgainstRest(t *testing.T) {
	// 56 of 70 narratives of "north" against 48 of the other 80: the NewcombeDiff
	// example (statsmodels fixture in TestNewcombeDiff).
	var docs []Doc
	add := func(g string, n int, theta []float64) {
		for i := 0; i < n; i++ {
			docs = append(docs, Doc{Group: g, Theta: theta})
		}
	}
	add("north", 56, []float64{1, 0})
	add("north", 14, []float64{0, 1})
	add("south", 30, []float64{1, 0})
	add("south", 20, []float64{0, 1})
	add("west", 18, []float64{1, 0})
	add("west", 12, []float64{0, 1})
	g, err := Groups(docs, GroupSettings{})
	if err != nil {
		t.Fatal(err)
	}
	i := 0 // north
	d, l, h := NewcombeDiff(56, 70, 48, 80, 0.95)
	if g.Groups[i] != "north" || g.Rest[i][0] != 48.0/80 || g.Diff[i][0] != d || g.DiffLow[i][0] != l || g.DiffHigh[i][0] != h {
		t.Errorf("north against the rest: %v %v [%v, %v]", g.Rest[i][0], g.Diff[i][0], g.DiffLow[i][0], g.DiffHigh[i][0])
	}
	row := g.Table(nil, Publish{}).Rows[0]
	if len(row) != 16 || row[13] != fmtFloat(d) || row[14] != fmtFloat(l) {
		t.Errorf("row %v", row)
	}
}
