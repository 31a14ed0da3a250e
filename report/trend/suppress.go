package trend

import "strconv"

// Publish controls the withholding of small counts in the exported tables. The zero
// value withholds counts below 10.
//
// Small counts can identify people. Every count below Threshold (including 0: a count
// that is shown as 0 says that nobody is in that cell) is withheld and shown as "<10"
// (primary suppression; see Withheld). So that a withheld count cannot be recovered by subtracting the
// shown counts from a shown total, every sum relation of the table (the cells of a month
// or group with its total, the cells of a theme with the theme's total, the totals with
// the grand total) that has exactly one withheld member gets a second one: the smallest
// shown member, the first in table order on ties (complementary suppression). This is
// repeated until no relation has exactly one withheld member. Expected counts (sums of
// θ) add up to the same totals, so they are treated the same way, sharing the totals.
// Shares, intervals and residuals computed from a withheld count or total are withheld
// too. Withheld numbers that are not below the threshold are shown as Hidden.
//
// Limits: this stops recovery by one subtraction within one relation. It does not stop
// a determined reader from solving several relations at once (a linear-programming
// attack) on a table with few withheld cells, and it does not look at other tables
// published from the same data. Ask a disclosure-control specialist before publishing
// small areas or rare categories.
type Publish struct {
	// Threshold is the smallest count shown; 0 means 10 (a threshold common among
	// statistical agencies for published tables; from memory, not from one standard).
	// A negative value is a caller bug and panics.
	Threshold int
	// Everything shows every count. Tables made with it are private: WriteFiles writes
	// them only to a file whose name contains "private", and WriteCSV and WriteJSON
	// refuse them.
	Everything bool
}

func (p Publish) threshold() int {
	switch {
	case p.Threshold == 0:
		return 10
	case p.Threshold < 0:
		panic("trend: negative suppression threshold")
	}
	return p.Threshold
}

// Withheld returns the text shown for a count below the threshold: "<" and the
// threshold, "<10" by default.
func (p Publish) Withheld() string { return "<" + strconv.Itoa(p.threshold()) }

// Hidden is the text shown for a withheld number that is not itself below the
// threshold: a count withheld so that another cannot be recovered (complementary
// suppression), or a share, interval, residual or statistic computed from a withheld
// count. Showing "<10" for those would be false.
const Hidden = "withheld"

// mark returns the text for withheld value v: Withheld if v is below the threshold,
// Hidden otherwise.
func (p Publish) mark(v float64) string {
	if v < float64(p.threshold()) {
		return p.Withheld()
	}
	return Hidden
}

// Suppress returns which values to withhold: those below threshold, and then, going
// through relations in order again and again until nothing changes, in every relation
// (a list of indices into values whose members add up) that has exactly one withheld
// member, also the smallest shown member (lowest index on ties). The result is
// deterministic for a given order of relations. dst, if not nil, must have len(values)
// and receives the result; it panics otherwise or on an index out of range.
func Suppress(dst []bool, values []float64, relations [][]int, threshold float64) []bool {
	if dst == nil {
		dst = make([]bool, len(values))
	}
	if len(dst) != len(values) {
		panic("trend: slice lengths do not match")
	}
	for i, v := range values {
		dst[i] = v < threshold
	}
	for changed := true; changed; {
		changed = false
		for _, rel := range relations {
			n, pick := 0, -1
			for _, i := range rel {
				if dst[i] {
					n++
				} else if pick < 0 || values[i] < values[pick] || (values[i] == values[pick] && i < pick) {
					pick = i
				}
			}
			if n == 1 && pick >= 0 {
				dst[pick] = true
				changed = true
			}
		}
	}
	return dst
}

// Mask says which numbers of a two-way table (rows × themes) are withheld. Rows are
// months (SuppressSeries) or groups (SuppressGroups).
type Mask struct {
	// Count and Expected are per cell, RowTotal per row, ThemeCount and ThemeExpected the
	// theme totals of counts and of expected counts, Grand the grand total.
	Count, Expected           [][]bool
	RowTotal                  []bool
	ThemeCount, ThemeExpected []bool
	Grand                     bool
	// Share is Count or RowTotal: the share, its interval and anything computed from it
	// are withheld.
	Share [][]bool
}

// suppressTable builds the items and relations of a table with counts, expected counts
// and row totals; skip[i] leaves row i out (a gap month).
func suppressTable(counts [][]int, expected [][]float64, totals []int, skip []bool, themes int, p Publish) *Mask {
	R := len(counts)
	var vals []float64
	add := func(v float64) int { vals = append(vals, v); return len(vals) - 1 }
	ci := make([][]int, R)
	ei := make([][]int, R)
	ti := make([]int, R)
	themeC := make([]float64, themes)
	themeE := make([]float64, themes)
	grand := 0.0
	for i := 0; i < R; i++ {
		if skip != nil && skip[i] {
			continue
		}
		ci[i], ei[i] = make([]int, themes), make([]int, themes)
		for k := 0; k < themes; k++ {
			ci[i][k] = add(float64(counts[i][k]))
			ei[i][k] = add(expected[i][k])
			themeC[k] += float64(counts[i][k])
			themeE[k] += expected[i][k]
		}
		ti[i] = add(float64(totals[i]))
		grand += float64(totals[i])
	}
	tc, te := make([]int, themes), make([]int, themes)
	for k := 0; k < themes; k++ {
		tc[k], te[k] = add(themeC[k]), add(themeE[k])
	}
	gi := add(grand)
	var rels [][]int
	var rowTotals []int
	for i := 0; i < R; i++ {
		if ci[i] == nil {
			continue
		}
		rels = append(rels, append(append([]int(nil), ci[i]...), ti[i]))
		rels = append(rels, append(append([]int(nil), ei[i]...), ti[i]))
		rowTotals = append(rowTotals, ti[i])
	}
	for k := 0; k < themes; k++ {
		var cc, ee []int
		for i := 0; i < R; i++ {
			if ci[i] != nil {
				cc, ee = append(cc, ci[i][k]), append(ee, ei[i][k])
			}
		}
		rels = append(rels, append(cc, tc[k]), append(ee, te[k]))
	}
	rels = append(rels, append(append([]int(nil), tc...), gi), append(append([]int(nil), te...), gi), append(rowTotals, gi))
	thr := float64(p.threshold())
	var sup []bool
	if p.Everything {
		sup = make([]bool, len(vals))
	} else {
		sup = Suppress(nil, vals, rels, thr)
	}
	m := &Mask{Count: make([][]bool, R), Expected: make([][]bool, R), Share: make([][]bool, R), RowTotal: make([]bool, R),
		ThemeCount: make([]bool, themes), ThemeExpected: make([]bool, themes), Grand: sup[gi]}
	for i := 0; i < R; i++ {
		m.Count[i], m.Expected[i], m.Share[i] = make([]bool, themes), make([]bool, themes), make([]bool, themes)
		if ci[i] == nil {
			continue
		}
		m.RowTotal[i] = sup[ti[i]]
		for k := 0; k < themes; k++ {
			m.Count[i][k], m.Expected[i][k] = sup[ci[i][k]], sup[ei[i][k]]
			m.Share[i][k] = m.Count[i][k] || m.RowTotal[i]
		}
	}
	for k := 0; k < themes; k++ {
		m.ThemeCount[k], m.ThemeExpected[k] = sup[tc[k]], sup[te[k]]
	}
	return m
}

// SuppressSeries returns what to withhold from s under p (rows are s.Months; gap months
// have nothing to withhold). With p.Everything nothing is withheld.
func SuppressSeries(s *Series, p Publish) *Mask {
	counts := make([][]int, len(s.Months))
	expected := make([][]float64, len(s.Months))
	totals := make([]int, len(s.Months))
	skip := make([]bool, len(s.Months))
	for i, mi := range s.Months {
		counts[i], expected[i] = make([]int, s.Themes), make([]float64, s.Themes)
		for k, c := range s.Cells[i] {
			counts[i][k], expected[i][k] = c.Count, c.Expected
		}
		totals[i], skip[i] = mi.Total, mi.Gap
	}
	return suppressTable(counts, expected, totals, skip, s.Themes, p)
}

// SuppressGroups returns what to withhold from t under p (rows are t.Groups).
func SuppressGroups(t *GroupTable, p Publish) *Mask {
	return suppressTable(t.Counts, t.Expected, t.Totals, nil, t.Themes, p)
}
