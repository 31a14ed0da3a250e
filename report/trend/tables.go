package trend

import (
	"fmt"
	"strconv"
	"strings"
)

// SeriesTable is the tidy long table of s: one row per month and theme, months in order,
// themes by index. labels, if not nil, names the themes (index k → labels[k]). Columns:
//
//	month     "YYYY-MM"
//	theme     theme index, 0-based as in the model
//	label     theme label ("" without labels)
//	count     narratives whose dominant theme it is
//	expected  sum of the theme's shares θ over the month's narratives
//	total     narratives in the month
//	share     count / total
//	low       lower end of the Wilson interval of share (Series.Confidence, 95% by default)
//	high      upper end
//	coverage  fraction of the month's days inside the data's date range
//	partial   true if coverage < 1 (first or last month)
//	gap       true if the month has no narratives: numbers are empty, not zero
//	flag      change flags of the month ("C1", "C1+C3" ...; see FlagTable), "" for none
//
// Counts below p's threshold are shown as "<10" (Publish.Withheld); counts withheld with
// them so that they cannot be recovered, and shares and intervals computed from a
// withheld count or total, are shown as "withheld" (Hidden). The flag column is shown
// even where the cell's numbers are withheld: Changes flags only counts of at least
// ChangeSettings.MinCount (3), so a flag says no more than that.
func SeriesTable(s *Series, flags []Flag, labels []string, p Publish) *Table {
	t := newTable("series", p, Column{"month", Text}, Column{"theme", Number}, Column{"label", Text},
		Column{"count", Number}, Column{"expected", Number}, Column{"total", Number}, Column{"share", Number},
		Column{"low", Number}, Column{"high", Number}, Column{"coverage", Number}, Column{"partial", Bool},
		Column{"gap", Bool}, Column{"flag", Text})
	m := SuppressSeries(s, p)
	type key struct {
		m Month
		k int
	}
	fl := map[key][]string{}
	for _, f := range flags {
		fl[key{f.Month, f.Theme}] = append(fl[key{f.Month, f.Theme}], f.Method.String())
	}
	for i, mi := range s.Months {
		for k := 0; k < s.Themes; k++ {
			c := s.Cells[i][k]
			row := []string{mi.Month.String(), strconv.Itoa(k), label(labels, k), "", "", "", "", "", "",
				fmtFloat(mi.Coverage), fmtBool(mi.Partial), fmtBool(mi.Gap), strings.Join(fl[key{mi.Month, k}], "+")}
			if !mi.Gap {
				row[3] = withheld(m.Count[i][k], p.mark(float64(c.Count)), strconv.Itoa(c.Count))
				row[4] = withheld(m.Expected[i][k], p.mark(c.Expected), fmtFloat(c.Expected))
				row[5] = withheld(m.RowTotal[i], p.mark(float64(mi.Total)), strconv.Itoa(mi.Total))
				row[6] = withheld(m.Share[i][k], Hidden, fmtFloat(c.Share))
				row[7] = withheld(m.Share[i][k], Hidden, fmtFloat(c.Low))
				row[8] = withheld(m.Share[i][k], Hidden, fmtFloat(c.High))
			}
			t.Rows = append(t.Rows, row)
		}
	}
	return t
}

// inSeasonalBaseline reports whether month m is one of t − 12y + j, y = 1..b,
// j = −w..w (the baseline of FarringtonLimits).
func inSeasonalBaseline(t, m Month, b, w int) bool {
	d := int(t - m)
	return d >= 12-w && d <= 12*b+w && ((d+w)%12) <= 2*w
}

// pct0 formats a share as a whole percentage, "12%".
func pct0(x float64) string { return strconv.FormatFloat(100*x, 'f', 0, 64) + "%" }

// pBand returns the band of p-value x: "<0.001", "<0.01", "<0.05" or ">=0.05".
func pBand(x float64) string {
	switch {
	case x < 0.001:
		return "<0.001"
	case x < 0.01:
		return "<0.01"
	case x < 0.05:
		return "<0.05"
	}
	return ">=0.05"
}

// pText turns a formatted p-value or band into words after "p": "= 0.012345", "< 0.01".
func pText(v string) string {
	switch {
	case strings.HasPrefix(v, "<"):
		return "< " + v[1:]
	case strings.HasPrefix(v, ">="):
		return "≥ " + v[2:]
	}
	return "= " + v
}

func withheld(hide bool, w, v string) string {
	if hide {
		return w
	}
	return v
}

// withheldNote replaces a flag's explanation when numbers behind it are withheld.
const withheldNote = "Details withheld: some of the counts behind this flag are below the publication threshold."

// FlagTable lists flags (from Changes on s, with cs its settings), one row per flag in
// the order given. Columns:
//
//	month           "YYYY-MM"
//	theme, label    as in SeriesTable
//	method          "C1", "C2" or "C3"
//	share           the month's share
//	baseline_first  first baseline month (C3: first of the three months summed)
//	baseline_last   last baseline month (C3: the flagged month)
//	baseline_mean   mean baseline share (C3: of the month's C2)
//	baseline_sd     sd used, after the binomial floor
//	sd_floored      true if the floor was used
//	statistic       value of the statistic (Farrington: the exceedance score)
//	threshold       its threshold (Farrington: the z of the limit)
//	count           Farrington only: the month's count
//	expected_count  Farrington only: the predicted count μ̂0
//	upper_limit     Farrington only: the upper limit U
//	explanation     the flag in plain words
//
// For Farrington flags, baseline_first and baseline_last span the seasonal baseline
// months and baseline_mean and baseline_sd are empty. When any share in the window of
// months behind an EARS flag, or in the month or its seasonal baseline months for a
// Farrington flag, is withheld, the numbers are "withheld" and the explanation says the
// details are withheld.
func FlagTable(s *Series, flags []Flag, cs ChangeSettings, labels []string, p Publish) *Table {
	t := newTable("flags", p, Column{"month", Text}, Column{"theme", Number}, Column{"label", Text},
		Column{"method", Text}, Column{"share", Number}, Column{"baseline_first", Text}, Column{"baseline_last", Text},
		Column{"baseline_mean", Number}, Column{"baseline_sd", Number}, Column{"sd_floored", Bool},
		Column{"statistic", Number}, Column{"threshold", Number}, Column{"count", Number},
		Column{"expected_count", Number}, Column{"upper_limit", Number}, Column{"explanation", Text})
	m := SuppressSeries(s, p)
	b := cs.baseline()
	fb, fw, _, _ := cs.Farrington.norm()
	for _, f := range flags {
		from, to := f.First, f.Month
		switch f.Method {
		case C3:
			from -= Month(b + 2)
		}
		hide := false
		for i, mi := range s.Months {
			in := mi.Month >= from && mi.Month <= to
			if f.Method == Farrington {
				// The month and its seasonal baseline months: with weights near 1 the
				// fitted rate is a weighted sum of the baseline counts.
				in = mi.Month == f.Month || inSeasonalBaseline(f.Month, mi.Month, fb, fw)
			}
			if in && !mi.Gap && m.Share[i][f.Theme] {
				hide = true
			}
		}
		ex := f.Explanation
		if hide {
			ex = withheldNote
		}
		count, exp, upper := "", "", ""
		if f.Method == Farrington {
			count = withheld(hide, p.mark(float64(f.Limit.Count)), strconv.Itoa(f.Limit.Count))
			exp = withheld(hide, Hidden, fmtFloat(f.Limit.Expected))
			upper = withheld(hide, Hidden, fmtFloat(f.Limit.Upper))
		}
		t.Rows = append(t.Rows, []string{f.Month.String(), strconv.Itoa(f.Theme), label(labels, f.Theme),
			f.Method.String(), withheld(hide, Hidden, fmtFloat(f.Share)), f.First.String(), f.Last.String(),
			withheld(hide, Hidden, fmtFloat(f.Mean)), withheld(hide, Hidden, fmtFloat(f.SD)), fmtBool(f.Floored),
			withheld(hide, Hidden, fmtFloat(f.Value)), fmtFloat(f.Threshold), count, exp, upper, ex})
	}
	return t
}

// TrendTable has one row per theme with its long-run trend tests (Poisson and
// MannKendallShare) at confidence level conf (0 means 0.95). Columns:
//
//	theme, label        as in SeriesTable
//	months              months with data used
//	count               the theme's narratives over all months
//	rate_ratio          exp(β1): factor by which the theme's share changes per year
//	rate_ratio_low      lower end of its interval (quasi-Poisson se when dispersion > 1)
//	rate_ratio_high     upper end
//	wald_z, wald_p      Poisson Wald test of β1 = 0
//	lr_stat, lr_p       likelihood-ratio test of β1 = 0
//	dispersion          Pearson X²/(n−2)
//	quasi_z, quasi_p    dispersion-adjusted Wald test
//	mk_s, mk_z, mk_p    Mann–Kendall S, Z and two-sided p on the monthly share
//	kendall_tau         Kendall's τ_b of share against time
//	sen_slope           Theil–Sen slope of the share per year
//	first_share         the Poisson model's fitted share in the first month with data
//	first_low           lower end of its interval
//	first_high          upper end
//	last_share          fitted share in the last month with data
//	last_low, last_high its interval
//	explanation         the result in plain words, or why there is none
//
// p-values below 0.0001 are in e notation. A theme whose total count is withheld has
// only its months and a note.
//
// Coarsening: the fitted trend satisfies Σ_t x_t·count_t = Σ_t x_t·μ_t, so exact
// estimates together with the shown monthly counts and the theme's total could give
// back withheld monthly counts. For a theme with any withheld monthly count (unless
// p.Everything) the table therefore shows the rate ratio and its interval to 2
// decimals, p-values only as a band ("<0.001", "<0.01", "<0.05" or ">=0.05"), and the
// other statistics as "withheld". This makes exact recovery impractical; it does not
// rule out a rough estimate.
func TrendTable(s *Series, labels []string, conf float64, p Publish) *Table {
	t := newTable("trends", p, Column{"theme", Number}, Column{"label", Text}, Column{"months", Number},
		Column{"count", Number}, Column{"rate_ratio", Number}, Column{"rate_ratio_low", Number},
		Column{"rate_ratio_high", Number}, Column{"wald_z", Number}, Column{"wald_p", Number},
		Column{"lr_stat", Number}, Column{"lr_p", Number}, Column{"dispersion", Number},
		Column{"quasi_z", Number}, Column{"quasi_p", Number}, Column{"mk_s", Number}, Column{"mk_z", Number},
		Column{"mk_p", Number}, Column{"kendall_tau", Number}, Column{"sen_slope", Number},
		Column{"first_share", Number}, Column{"first_low", Number}, Column{"first_high", Number},
		Column{"last_share", Number}, Column{"last_low", Number}, Column{"last_high", Number},
		Column{"explanation", Text})
	m := SuppressSeries(s, p)
	if conf == 0 {
		conf = 0.95
	}
	months := 0
	var first, last Month
	for _, mi := range s.Months {
		if !mi.Gap {
			if months == 0 {
				first = mi.Month
			}
			last = mi.Month
			months++
		}
	}
	for k := 0; k < s.Themes; k++ {
		total := 0
		for i := range s.Months {
			total += s.Cells[i][k].Count
		}
		row := make([]string, len(t.Columns))
		row[0], row[1], row[2] = strconv.Itoa(k), label(labels, k), strconv.Itoa(months)
		if m.ThemeCount[k] {
			row[3] = p.mark(float64(total))
			row[len(row)-1] = "Withheld: the theme's count is below the publication threshold or withheld with one."
			t.Rows = append(t.Rows, row)
			continue
		}
		row[3] = strconv.Itoa(total)
		coarse := false
		for i := range s.Months {
			coarse = coarse || m.Count[i][k]
		}
		num, pval, stat := fmtFloat, fmtP, fmtFloat
		mkS := func(x float64) string { return strconv.Itoa(int(x)) }
		if coarse {
			num = func(x float64) string { return strconv.FormatFloat(x, 'f', 2, 64) }
			pval = pBand
			stat = func(float64) string { return Hidden }
			mkS = stat
		}
		pt, err := Poisson(s, k, conf)
		mk, err2 := MannKendallShare(s, k)
		var ex []string
		if err != nil {
			ex = append(ex, "No Poisson trend: "+strings.TrimPrefix(err.Error(), "trend: ")+".")
		} else {
			row[4], row[5], row[6], row[7] = num(pt.RateRatio), num(pt.Low), num(pt.High), stat(pt.Z)
			row[8], row[9], row[10] = pval(pt.P), stat(pt.LR), pval(pt.LRP)
			row[11], row[12], row[13] = stat(pt.Dispersion), stat(pt.QuasiZ), pval(pt.QuasiP)
			test, pv := "Poisson Wald", pt.P
			if pt.Dispersion > 1 {
				test, pv = "quasi-Poisson Wald", pt.QuasiP
			}
			row[19], row[20], row[21] = num(pt.FirstShare), num(pt.FirstLow), num(pt.FirstHigh)
			row[22], row[23], row[24] = num(pt.LastShare), num(pt.LastLow), num(pt.LastHigh)
			ex = append(ex, fmt.Sprintf("From %s to %s this theme's fitted share of narratives went from about %s (%g%% interval %s to %s) to about %s (%s to %s), a factor of %.2f per year (%.2f to %.2f; %s test p %s).",
				first, last, pct0(pt.FirstShare), 100*conf, pct0(pt.FirstLow), pct0(pt.FirstHigh),
				pct0(pt.LastShare), pct0(pt.LastLow), pct0(pt.LastHigh), pt.RateRatio, pt.Low, pt.High, test, pText(pval(pv))))
		}
		if err2 == nil {
			row[14], row[15], row[16] = mkS(mk.S), stat(mk.Z), pval(mk.P)
			row[17], row[18] = stat(mk.Tau), stat(mk.Slope)
			if coarse {
				ex = append(ex, fmt.Sprintf("Mann–Kendall test of the monthly share: p %s.", pText(pval(mk.P))))
			} else {
				ex = append(ex, fmt.Sprintf("Mann–Kendall test of the monthly share: p = %s, Theil–Sen slope %+.1f percentage points per year.", fmtP(mk.P), 100*mk.Slope))
			}
		}
		if coarse {
			ex = append(ex, "Some monthly counts of this theme are withheld, so these results are rounded.")
		}
		ex = append(ex, "This describes what the narratives were written about, not how often anything happened.")
		row[len(row)-1] = strings.Join(ex, " ")
		t.Rows = append(t.Rows, row)
	}
	return t
}

// Table is the per-group long table of g: one row per group and theme, groups sorted,
// themes by index. Columns:
//
//	group           the group value
//	theme, label    as in SeriesTable
//	count           the group's narratives whose dominant theme it is
//	expected        sum of the theme's shares θ over the group's narratives
//	group_total     the group's narratives
//	share           count / group_total
//	low, high       its Wilson interval
//	chisq_expected  count expected if group and dominant theme were independent
//	adj_residual    adjusted standardised residual (see ChiSquare)
//	stands_out      true if |adj_residual| exceeds the test's critical value
//	rest_share      the theme's share among the narratives of all other groups
//	diff            share − rest_share
//	diff_low        lower end of the hybrid score interval of diff (NewcombeDiff)
//	diff_high       upper end
//
// Withholding as in SeriesTable; residuals and stands_out of withheld cells are
// "withheld" and "", and chisq_expected, rest_share and the diff columns are "withheld"
// when the cell or a total behind them is withheld.
func (g *GroupTable) Table(labels []string, p Publish) *Table {
	t := newTable("groups", p, Column{"group", Text}, Column{"theme", Number}, Column{"label", Text},
		Column{"count", Number}, Column{"expected", Number}, Column{"group_total", Number}, Column{"share", Number},
		Column{"low", Number}, Column{"high", Number}, Column{"chisq_expected", Number},
		Column{"adj_residual", Number}, Column{"stands_out", Bool}, Column{"rest_share", Number},
		Column{"diff", Number}, Column{"diff_low", Number}, Column{"diff_high", Number})
	m := SuppressGroups(g, p)
	for i, name := range g.Groups {
		for k := 0; k < g.Themes; k++ {
			row := []string{name, strconv.Itoa(k), label(labels, k),
				withheld(m.Count[i][k], p.mark(float64(g.Counts[i][k])), strconv.Itoa(g.Counts[i][k])),
				withheld(m.Expected[i][k], p.mark(g.Expected[i][k]), fmtFloat(g.Expected[i][k])),
				withheld(m.RowTotal[i], p.mark(float64(g.Totals[i])), strconv.Itoa(g.Totals[i])),
				withheld(m.Share[i][k], Hidden, fmtFloat(g.Share[i][k])),
				withheld(m.Share[i][k], Hidden, fmtFloat(g.Low[i][k])),
				withheld(m.Share[i][k], Hidden, fmtFloat(g.High[i][k])), "", "", ""}
			margins := m.RowTotal[i] || m.ThemeCount[k] || m.Grand
			for _, v := range []float64{g.Rest[i][k], g.Diff[i][k], g.DiffLow[i][k], g.DiffHigh[i][k]} {
				row = append(row, withheld(margins || m.Count[i][k], Hidden, fmtFloat(v)))
			}
			if g.Test != nil {
				row[9] = withheld(m.RowTotal[i] || m.ThemeCount[k] || m.Grand, Hidden, fmtFloat(g.Test.Expected[i][k]))
				row[10] = withheld(m.Share[i][k], Hidden, fmtFloat(g.Test.Residual[i][k]))
				if !m.Share[i][k] {
					row[11] = fmtBool(g.Test.StandsOut[i][k])
				}
			}
			t.Rows = append(t.Rows, row)
		}
	}
	return t
}

// GroupTestTable is the one-row summary of g's chi-square test. Columns:
//
//	groups, themes   groups and themes in the table
//	chi_square       Pearson X²
//	df               degrees of freedom
//	p                p-value
//	critical         |adjusted residual| above which a cell stands out
//	adjustment       "bonferroni" or "none"
//	cells            cells tested (m)
//	small_expected   cells with an expected count below 5
//
// Without a test (fewer than two groups or themes with narratives) the test columns are
// empty. When any cell of the table is withheld, chi_square is "withheld" and p is only
// a band ("<0.001", "<0.01", "<0.05", ">=0.05"): X² and the shown cells together could
// otherwise give back the withheld ones (withheld cells come in linked sets whose sums
// are known, and X² pins the free part to one or two values).
func GroupTestTable(g *GroupTable, gs GroupSettings, p Publish) *Table {
	t := newTable("group_test", p, Column{"groups", Number}, Column{"themes", Number}, Column{"chi_square", Number},
		Column{"df", Number}, Column{"p", Number}, Column{"critical", Number}, Column{"adjustment", Text},
		Column{"cells", Number}, Column{"small_expected", Number})
	row := []string{strconv.Itoa(len(g.Groups)), strconv.Itoa(g.Themes), "", "", "", "", "", "", ""}
	if c := g.Test; c != nil {
		adj := "bonferroni"
		if gs.Unadjusted {
			adj = "none"
		}
		row[2], row[3], row[4], row[5] = fmtFloat(c.Stat), strconv.Itoa(c.DF), fmtP(c.P), fmtFloat(c.Critical)
		if !p.Everything {
			m := SuppressGroups(g, p)
			for i := range m.Count {
				for k := range m.Count[i] {
					if m.Count[i][k] {
						row[2], row[4] = Hidden, pBand(c.P)
					}
				}
			}
		}
		row[6], row[7], row[8] = adj, strconv.Itoa(c.Cells), strconv.Itoa(c.SmallExpected)
	}
	t.Rows = append(t.Rows, row)
	return t
}

// WordTable lists word scores (from LogOdds or GroupWords) comparing side a with side
// b: the top words of each side (the top highest and the top lowest z; top = 0 keeps
// all), highest z first. Columns:
//
//	group_a, group_b  the names of the two sides (for example a group and "rest")
//	word              the word
//	count_a, count_b  its count on each side
//	delta             weighted log-odds ratio δ_w
//	se                its standard error
//	z                 δ_w / se: positive when typical of side a
//
// Unless p.Everything, a word is left out when its counts add up to less than the
// threshold or either count is between 1 and the threshold − 1: rare words such as names
// can point to one narrative, and delta, se and z would give such a count back exactly
// (se = sqrt(1/(y_a+α) + 1/(y_b+α)) with α known). A count of 0 is shown as 0: the
// absence of a word points to no narrative, and z would reveal it anyway.
func WordTable(scores []WordScore, a, b string, top int, p Publish) *Table {
	t := newTable("words", p, Column{"group_a", Text}, Column{"group_b", Text}, Column{"word", Text},
		Column{"count_a", Number}, Column{"count_b", Number}, Column{"delta", Number}, Column{"se", Number}, Column{"z", Number})
	thr := p.threshold()
	var kept []WordScore
	small := func(c int) bool { return c > 0 && c < thr }
	for _, s := range scores {
		if p.Everything || (s.CountA+s.CountB >= thr && !small(s.CountA) && !small(s.CountB)) {
			kept = append(kept, s)
		}
	}
	if top > 0 && len(kept) > 2*top {
		kept = append(kept[:top:top], kept[len(kept)-top:]...)
	}
	for _, s := range kept {
		t.Rows = append(t.Rows, []string{a, b, s.Word, strconv.Itoa(s.CountA), strconv.Itoa(s.CountB),
			fmtFloat(s.Delta), fmtFloat(s.SE), fmtFloat(s.Z)})
	}
	return t
}
