package trend

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/stat/distuv"
)

// GroupSettings controls Groups. The zero value is ready to use.
type GroupSettings struct {
	// Confidence is the level of the Wilson intervals; 0 means 0.95.
	Confidence float64
	// Alpha is the significance level for a cell to stand out; 0 means 0.05.
	Alpha float64
	// Unadjusted compares each adjusted residual with z_{1−α/2} (1.96 at α = 0.05). By
	// default (false) the threshold is Bonferroni-adjusted for the number m of cells
	// tested: z_{1−α/(2m)}, because a table of many groups and themes has many cells and
	// some would pass 1.96 by chance alone.
	Unadjusted bool
}

// GroupTable holds theme shares per group and the chi-square test of group × dominant
// theme. Groups are sorted by their value (byte order).
type GroupTable struct {
	Groups []string
	Themes int
	// Counts[g][k] is the number of narratives of group g whose dominant theme is k;
	// Expected[g][k] the sum of their θ_k; Totals[g] the group's narratives.
	Counts   [][]int
	Expected [][]float64
	Totals   []int
	// Share[g][k] = Counts[g][k]/Totals[g], with Wilson interval Low, High.
	Share, Low, High [][]float64
	// Rest[g][k] is the share of theme k among the narratives of all other groups, and
	// Diff = Share − Rest with its hybrid score interval DiffLow, DiffHigh (see
	// NewcombeDiff): "group g has more of theme k than the rest" when DiffLow > 0.
	// NaN when there is no other group.
	Rest, Diff, DiffLow, DiffHigh [][]float64
	Confidence                    float64
	// Test is the chi-square test of Counts; nil when fewer than two groups or two
	// themes have narratives.
	Test *ChiSquare
}

// Groups tabulates docs by Group and dominant theme and runs ChiSquareTest on the table.
// It returns the same errors as Monthly for malformed θ; dates are not used.
func Groups(docs []Doc, gs GroupSettings) (*GroupTable, error) {
	themes, err := checkDocs(docs)
	if err != nil {
		return nil, err
	}
	conf := gs.Confidence
	if conf == 0 {
		conf = 0.95
	}
	if !(conf > 0 && conf < 1) {
		return nil, fmt.Errorf("trend: confidence level %v is not between 0 and 1", gs.Confidence)
	}
	if a := gs.Alpha; a != 0 && !(a > 0 && a < 1) {
		return nil, fmt.Errorf("trend: significance level %v is not between 0 and 1", a)
	}
	index := map[string]int{}
	for _, d := range docs {
		index[d.Group] = 0
	}
	t := &GroupTable{Themes: themes, Confidence: conf}
	for g := range index {
		t.Groups = append(t.Groups, g)
	}
	sort.Strings(t.Groups)
	for i, g := range t.Groups {
		index[g] = i
	}
	G := len(t.Groups)
	t.Counts, t.Expected, t.Totals = make([][]int, G), make([][]float64, G), make([]int, G)
	t.Share, t.Low, t.High = make([][]float64, G), make([][]float64, G), make([][]float64, G)
	for g := range t.Groups {
		t.Counts[g], t.Expected[g] = make([]int, themes), make([]float64, themes)
		t.Share[g], t.Low[g], t.High[g] = make([]float64, themes), make([]float64, themes), make([]float64, themes)
	}
	t.Rest, t.Diff, t.DiffLow, t.DiffHigh = make([][]float64, G), make([][]float64, G), make([][]float64, G), make([][]float64, G)
	for g := range t.Groups {
		t.Rest[g], t.Diff[g], t.DiffLow[g], t.DiffHigh[g] = make([]float64, themes), make([]float64, themes), make([]float64, themes), make([]float64, themes)
	}
	for _, d := range docs {
		g := index[d.Group]
		t.Totals[g]++
		t.Counts[g][Dominant(d.Theta)]++
		for k, v := range d.Theta {
			t.Expected[g][k] += v
		}
	}
	themeTotal := make([]int, themes)
	for g := range t.Groups {
		for k := 0; k < themes; k++ {
			themeTotal[k] += t.Counts[g][k]
		}
	}
	for g := range t.Groups {
		for k := 0; k < themes; k++ {
			t.Share[g][k] = float64(t.Counts[g][k]) / float64(t.Totals[g])
			t.Low[g][k], t.High[g][k] = Wilson(t.Counts[g][k], t.Totals[g], conf)
			rx, rn := themeTotal[k]-t.Counts[g][k], len(docs)-t.Totals[g]
			t.Rest[g][k] = math.NaN()
			if rn > 0 {
				t.Rest[g][k] = float64(rx) / float64(rn)
			}
			t.Diff[g][k], t.DiffLow[g][k], t.DiffHigh[g][k] = NewcombeDiff(t.Counts[g][k], t.Totals[g], rx, rn, conf)
		}
	}
	t.Test, err = ChiSquareTest(t.Counts, gs.Alpha, gs.Unadjusted)
	if err != nil {
		t.Test = nil
	}
	return t, nil
}

// ChiSquare is Pearson's chi-square test of independence of the rows and columns of a
// table of counts, with adjusted standardised residuals (Agresti 2013, Categorical Data
// Analysis, 3rd ed., the section on residuals for contingency tables; section number
// not given because it is from memory):
//
//	e_ij = n_i. n_.j / n
//	X²   = Σ (o_ij − e_ij)² / e_ij,   df = (r−1)(c−1),   p = P(χ²_df ≥ X²)
//	r_ij = (o_ij − e_ij) / sqrt(e_ij (1 − p_i.)(1 − p_.j)),   p_i. = n_i./n, p_.j = n_.j/n
//
// Under independence each r_ij is approximately standard normal, so a cell stands out
// when |r_ij| exceeds Critical. Rows and columns whose total is 0 are left out of the
// test (their residuals are NaN and they do not count in df or m). The chi-square
// approximation is poor when expected counts are small; SmallExpected counts the cells
// with e_ij < 5 (the common rule of thumb is that at most 20% of cells should be).
type ChiSquare struct {
	Stat float64
	DF   int
	P    float64
	// Expected and Residual are e_ij and r_ij, NaN for left-out rows and columns.
	Expected, Residual [][]float64
	// Critical is the |r| threshold; Cells the number m of cells tested.
	Critical float64
	Cells    int
	// StandsOut[i][j] is |r_ij| > Critical.
	StandsOut     [][]bool
	SmallExpected int
}

// ChiSquareTest runs the test on counts (rows × columns, all rows the same length) at
// significance level alpha (0 means 0.05), Bonferroni-adjusting the residual threshold
// for the number of cells tested unless unadjusted. It returns an error when fewer than
// two rows or two columns have a non-zero total. It panics on ragged or negative counts.
func ChiSquareTest(counts [][]int, alpha float64, unadjusted bool) (*ChiSquare, error) {
	if alpha == 0 {
		alpha = 0.05
	}
	if !(alpha > 0 && alpha < 1) {
		panic("trend: alpha not in (0, 1)")
	}
	R := len(counts)
	C := 0
	if R > 0 {
		C = len(counts[0])
	}
	rows, cols := make([]float64, R), make([]float64, C)
	n := 0.0
	for i := range counts {
		if len(counts[i]) != C {
			panic("trend: ragged table")
		}
		for j, o := range counts[i] {
			if o < 0 {
				panic("trend: negative count")
			}
			rows[i] += float64(o)
			cols[j] += float64(o)
			n += float64(o)
		}
	}
	r, c := 0, 0
	for _, v := range rows {
		if v > 0 {
			r++
		}
	}
	for _, v := range cols {
		if v > 0 {
			c++
		}
	}
	if r < 2 || c < 2 {
		return nil, fmt.Errorf("trend: chi-square test needs at least two non-empty rows and columns, have %d and %d", r, c)
	}
	cs := &ChiSquare{DF: (r - 1) * (c - 1), Cells: r * c}
	cs.Expected, cs.Residual, cs.StandsOut = make([][]float64, R), make([][]float64, R), make([][]bool, R)
	if unadjusted {
		cs.Critical = distuv.UnitNormal.Quantile(1 - alpha/2)
	} else {
		cs.Critical = distuv.UnitNormal.Quantile(1 - alpha/(2*float64(cs.Cells)))
	}
	for i := range counts {
		cs.Expected[i], cs.Residual[i], cs.StandsOut[i] = make([]float64, C), make([]float64, C), make([]bool, C)
		for j, o := range counts[i] {
			if rows[i] == 0 || cols[j] == 0 {
				cs.Expected[i][j], cs.Residual[i][j] = math.NaN(), math.NaN()
				continue
			}
			e := rows[i] * cols[j] / n
			d := float64(o) - e
			cs.Expected[i][j] = e
			cs.Stat += d * d / e
			cs.Residual[i][j] = d / math.Sqrt(e*(1-rows[i]/n)*(1-cols[j]/n))
			cs.StandsOut[i][j] = math.Abs(cs.Residual[i][j]) > cs.Critical
			if e < 5 {
				cs.SmallExpected++
			}
		}
	}
	cs.P = distuv.ChiSquared{K: float64(cs.DF)}.Survival(cs.Stat)
	return cs, nil
}
