package trend

import (
	"math/rand/v2"
	"testing"
)

func TestSuppressHand(t *testing.T) {
	// Worked by hand: cells A = 12 3 20 (35), B = 15 11 14 (40), columns 27 14 34, total 75.
	// 3 < 10 is withheld; row A then loses 12 (its smallest shown member); column 1
	// loses 11, column 0 loses 15; every relation then has 0 or 2 withheld members.
	values := []float64{12, 3, 20, 35, 15, 11, 14, 40, 27, 14, 34, 75}
	rels := [][]int{{0, 1, 2, 3}, {4, 5, 6, 7}, {0, 4, 8}, {1, 5, 9}, {2, 6, 10}, {8, 9, 10, 11}, {3, 7, 11}}
	got := Suppress(nil, values, rels, 10)
	want := []bool{true, true, false, false, true, true, false, false, false, false, false, false}
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("withheld %v, want %v", got, want)
		}
	}
	if !panics(func() { Suppress(make([]bool, 2), values, rels, 10) }) {
		t.Error("length mismatch: no panic")
	}
}

func TestSuppressNoLoneCell(t *testing.T) {
	// Property: after suppression no relation has exactly one withheld member and every
	// value below the threshold is withheld (random tables, seeded).
	rng := rand.New(rand.NewPCG(1, 7))
	for trial := 0; trial < 200; trial++ {
		R, C := 2+rng.IntN(6), 2+rng.IntN(6)
		counts := make([][]int, R)
		expected := make([][]float64, R)
		totals := make([]int, R)
		for i := range counts {
			counts[i], expected[i] = make([]int, C), make([]float64, C)
			for k := range counts[i] {
				counts[i][k] = rng.IntN(40)
				expected[i][k] = float64(counts[i][k]) + rng.Float64()*4 - 2
				totals[i] += counts[i][k]
			}
		}
		m := suppressTable(counts, expected, totals, nil, C, Publish{})
		check := func(what string, members []bool) {
			n := 0
			for _, b := range members {
				if b {
					n++
				}
			}
			if n == 1 {
				t.Fatalf("trial %d: %s has one withheld member: %v", trial, what, members)
			}
		}
		colTot := make([]int, C)
		for i := range counts {
			check("row", append(append([]bool(nil), m.Count[i]...), m.RowTotal[i]))
			check("row expected", append(append([]bool(nil), m.Expected[i]...), m.RowTotal[i]))
			for k, c := range counts[i] {
				colTot[k] += c
				if c < 10 && !m.Count[i][k] {
					t.Fatalf("trial %d: count %d shown", trial, c)
				}
				if m.Share[i][k] != (m.Count[i][k] || m.RowTotal[i]) {
					t.Fatalf("trial %d: share mask", trial)
				}
			}
		}
		for k := 0; k < C; k++ {
			var col []bool
			for i := range counts {
				col = append(col, m.Count[i][k])
			}
			check("column", append(col, m.ThemeCount[k]))
			if colTot[k] < 10 && !m.ThemeCount[k] {
				t.Fatalf("trial %d: theme total %d shown", trial, colTot[k])
			}
		}
		check("theme totals", append(append([]bool(nil), m.ThemeCount...), m.Grand))
		check("row totals", append(append([]bool(nil), m.RowTotal...), m.Grand))
	}
}

func TestSuppressSeriesGapsAndEverything(t *testing.T) {
	s := seriesOf(t, "2023-01", []int{30, -1, 40}, []int{4, 0, 25})
	m := SuppressSeries(s, Publish{})
	// Month 0: 4 withheld, so is 26 (the only other cell smaller than the total 30).
	if !m.Count[0][0] || !m.Count[0][1] || m.RowTotal[0] || !m.Share[0][0] {
		t.Errorf("month 0 mask %+v", m)
	}
	if m.Count[1][0] || m.RowTotal[1] {
		t.Error("gap month withheld")
	}
	// Column 0: 4 (withheld) and 25 → 25 withheld too; then month 2 has 25 withheld and
	// 15 is withheld to go with it.
	if !m.Count[2][0] || !m.Count[2][1] {
		t.Errorf("month 2 mask %v", m.Count[2])
	}
	all := SuppressSeries(s, Publish{Everything: true})
	for i := range all.Count {
		for k := range all.Count[i] {
			if all.Count[i][k] || all.Expected[i][k] {
				t.Fatal("Everything withheld a count")
			}
		}
	}
	if (Publish{}).Withheld() != "<10" || (Publish{Threshold: 5}).Withheld() != "<5" {
		t.Error("Withheld text")
	}
}
