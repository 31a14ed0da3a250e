package trend

import (
	"fmt"
	"math"
	"sort"
)

// Method names a change-flagging statistic.
type Method int

// The EARS statistics of the CDC's Early Aberration Reporting System (Hutwagner, Thompson,
// Seeman & Treadwell 2003, "The bioterrorism preparedness and response Early Aberration
// Reporting System (EARS)", Journal of Urban Health 80(2) Suppl 1; see also Fricker,
// Hegler & Dunfee 2008, Statistics in Medicine 27). EARS was made for daily counts; here
// it is applied to a theme's monthly share p_t = count_t / total_t, so that a month with
// more narratives overall does not raise a flag by itself.
//
// With the baseline made of B months (B = 7 in EARS) before month t:
//
//	C1_t = (p_t − mean(p_{t−1} … p_{t−B})) / sd          baseline ends just before t
//	C2_t = (p_t − mean(p_{t−3} … p_{t−B−2})) / sd        a guard band of 2 months left out
//	C3_t = Σ_{j=t−2..t} max(0, C2_j − 1)                 the last three C2 values
//
// sd is the sample standard deviation of the baseline shares (divisor B−1). The usual
// thresholds are 3 for C1 and C2 and 2 for C3 (from memory of the EARS documentation and
// Fricker et al. 2008; the C3 formula is also from memory of those papers).
//
// Our adaptations, not part of EARS:
//   - Months are the periods; gap months (no narratives) are skipped, so the baseline is
//     the B most recent months with data, and C3 sums the last three months with data.
//     A month without a full baseline gets no statistic.
//   - The sd has a floor: the binomial standard error of a share in month t,
//     sqrt(q(1−q)/total_t), with q = (Σ baseline counts + 1)/(Σ baseline totals + 2). It
//     keeps a flat baseline from dividing by zero and keeps a month with few narratives,
//     whose share is noisy, from being flagged for that noise alone.
//   - Changes flags a month only when the theme's count is at least
//     ChangeSettings.MinCount (3 by default).
const (
	C1 Method = iota + 1
	C2
	C3
	// Farrington flags a month whose count is above the upper limit of
	// FarringtonLimits: a seasonal baseline from earlier years.
	Farrington
)

// String returns "C1", "C2", "C3" or "Farrington".
func (m Method) String() string {
	switch m {
	case C1:
		return "C1"
	case C2:
		return "C2"
	case C3:
		return "C3"
	case Farrington:
		return "Farrington"
	}
	return fmt.Sprintf("Method(%d)", int(m))
}

// ChangeSettings controls Changes and EARS. The zero value uses the EARS defaults.
type ChangeSettings struct {
	// Baseline is the number of baseline months B; 0 means 7. It must be at least 2.
	Baseline int
	// Threshold1, Threshold2 and Threshold3 are the flag thresholds of C1, C2 and C3;
	// 0 means 3, 3 and 2.
	Threshold1, Threshold2, Threshold3 float64
	// Methods lists the statistics Changes computes; nil means C1, C2, C3 and
	// Farrington.
	Methods []Method
	// Farrington configures the Farrington method.
	Farrington FarringtonSettings
	// MinCount is the smallest count of the theme in a month that Changes flags; 0 means
	// 3 (our choice: a share made of one or two narratives is not flagged however far it
	// is from the baseline). EARS itself still reports the statistic.
	MinCount int
}

func (cs ChangeSettings) baseline() int {
	switch {
	case cs.Baseline == 0:
		return 7
	case cs.Baseline < 2:
		panic("trend: baseline shorter than 2 months")
	}
	return cs.Baseline
}

// Threshold returns the threshold used for m (for Farrington, the z of the limit).
func (cs ChangeSettings) Threshold(m Method) float64 {
	t, def := 0.0, 0.0
	switch m {
	case Farrington:
		_, _, z, _ := cs.Farrington.norm()
		return z
	case C1:
		t, def = cs.Threshold1, 3
	case C2:
		t, def = cs.Threshold2, 3
	case C3:
		t, def = cs.Threshold3, 2
	default:
		panic("trend: unknown method")
	}
	if t == 0 {
		return def
	}
	return t
}

// Stat is one EARS statistic for one theme in one month.
type Stat struct {
	Method Method
	// Value is C1, C2 or C3; NaN where the month has no full baseline or is a gap.
	Value float64
	// Share is the month's share; Mean and SD are the baseline mean and the sd used
	// (after the floor), Floored says the floor was used. For C3 they describe C2 of
	// the month itself.
	Share, Mean, SD float64
	Floored         bool
	// First and Last are the first and last baseline months (for C3: the first and last
	// of the three months summed).
	First, Last Month
}

// EARS returns statistic m of theme for every month of s (index i is s.Months[i]).
// It panics if theme is out of range or m is unknown.
func EARS(s *Series, theme int, m Method, cs ChangeSettings) []Stat {
	if theme < 0 || theme >= s.Themes {
		panic("trend: theme out of range")
	}
	b := cs.baseline()
	out := make([]Stat, len(s.Months))
	var data []int // indices of non-gap months so far
	switch m {
	case C1, C2:
		guard := 0
		if m == C2 {
			guard = 2
		}
		for i, mi := range s.Months {
			out[i] = Stat{Method: m, Value: math.NaN(), Share: math.NaN(), Mean: math.NaN(), SD: math.NaN()}
			if mi.Gap {
				continue
			}
			out[i].Share = s.Cells[i][theme].Share
			// Baseline: the b most recent months with data, ending guard calendar months
			// before month i.
			var base []int
			for j := len(data) - 1; j >= 0 && len(base) < b; j-- {
				if int(mi.Month-s.Months[data[j]].Month) > guard {
					base = append(base, data[j])
				}
			}
			data = append(data, i)
			if len(base) < b {
				continue
			}
			var shares []float64
			xs, ns := 0, 0
			for _, j := range base {
				shares = append(shares, s.Cells[j][theme].Share)
				xs += s.Cells[j][theme].Count
				ns += s.Months[j].Total
			}
			mean, sd := meanSD(shares)
			q := float64(xs+1) / float64(ns+2)
			floor := math.Sqrt(q * (1 - q) / float64(mi.Total))
			st := &out[i]
			st.Mean, st.SD = mean, sd
			if floor > sd {
				st.SD, st.Floored = floor, true
			}
			st.Value = (st.Share - mean) / st.SD
			st.First, st.Last = s.Months[base[len(base)-1]].Month, s.Months[base[0]].Month
		}
	case C3:
		c2 := EARS(s, theme, C2, cs)
		for i, mi := range s.Months {
			out[i] = c2[i]
			out[i].Method = C3
			out[i].Value = math.NaN()
			if mi.Gap {
				continue
			}
			data = append(data, i)
			if len(data) < 3 {
				continue
			}
			sum := 0.0
			for _, j := range data[len(data)-3:] {
				sum += math.Max(0, c2[j].Value-1)
			}
			out[i].Value = sum // NaN if any of the three has no C2
			out[i].First, out[i].Last = s.Months[data[len(data)-3]].Month, mi.Month
		}
	default:
		panic("trend: unknown method")
	}
	return out
}

// meanSD returns the mean and sample standard deviation (divisor n−1) of x.
func meanSD(x []float64) (mean, sd float64) {
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	ss := 0.0
	for _, v := range x {
		ss += (v - mean) * (v - mean)
	}
	return mean, math.Sqrt(ss / float64(len(x)-1))
}

// Flag is a month in which a theme's share was unusually high by one EARS statistic,
// or its count above its Farrington limit. A flag marks a month worth a closer reading
// of its narratives; it does not say that anything happened.
type Flag struct {
	Month     Month
	Theme     int
	Threshold float64
	// Stat holds the EARS statistic; for Farrington only Method, Value (the score),
	// Share and First and Last (the span of the baseline months) are set.
	Stat
	// Limit holds the Farrington limit when Method is Farrington.
	Limit FarringtonStat
	// Explanation says in plain words what was compared, e.g. "In 2023-07 this theme's
	// share (18.0%) was above the upper limit expected from the previous 7 months with
	// data (2022-12 to 2023-06: mean 9.0%, sd 2.5%; C1 = 3.60 > 3)."
	Explanation string
}

// Changes returns the flags of every theme of s: the months whose statistic exceeds its
// threshold, sorted by month, theme and method.
func Changes(s *Series, cs ChangeSettings) []Flag {
	methods := cs.Methods
	if methods == nil {
		methods = []Method{C1, C2, C3, Farrington}
	}
	minCount := cs.MinCount
	if minCount == 0 {
		minCount = 3
	}
	var out []Flag
	for k := 0; k < s.Themes; k++ {
		for _, m := range methods {
			th := cs.Threshold(m)
			if m == Farrington {
				b, w, _, _ := cs.Farrington.norm()
				for i, st := range FarringtonLimits(s, k, cs.Farrington) {
					if st.OK && float64(st.Count) > st.Upper && st.Count >= minCount {
						mi := s.Months[i]
						f := Flag{Month: mi.Month, Theme: k, Threshold: th, Limit: st,
							Stat: Stat{Method: Farrington, Value: st.Score, Share: s.Cells[i][k].Share,
								Mean: math.NaN(), SD: math.NaN(), First: mi.Month - Month(12*b+w), Last: mi.Month - Month(12-w)}}
						f.Explanation = farringtonExplain(mi.Month, st, b)
						out = append(out, f)
					}
				}
				continue
			}
			for i, st := range EARS(s, k, m, cs) {
				if st.Value > th && s.Cells[i][k].Count >= minCount {
					f := Flag{Month: s.Months[i].Month, Theme: k, Threshold: th, Stat: st}
					f.Explanation = explain(f, cs.baseline())
					out = append(out, f)
				}
			}
		}
	}
	sort.Slice(out, func(a, b int) bool {
		x, y := out[a], out[b]
		if x.Month != y.Month {
			return x.Month < y.Month
		}
		if x.Theme != y.Theme {
			return x.Theme < y.Theme
		}
		return x.Method < y.Method
	})
	return out
}

func pct(p float64) string { return fmt.Sprintf("%.1f%%", 100*p) }

func explain(f Flag, b int) string {
	sd := "sd " + pct(f.SD)
	if f.Floored {
		sd += " (the binomial floor for the month's number of narratives)"
	}
	var s string
	switch f.Method {
	case C1:
		s = fmt.Sprintf("In %s this theme's share (%s) was above the upper limit expected from the previous %d months with data (%s to %s: mean %s, %s; C1 = %.2f > %g).",
			f.Month, pct(f.Share), b, f.First, f.Last, pct(f.Mean), sd, f.Value, f.Threshold)
	case C2:
		s = fmt.Sprintf("In %s this theme's share (%s) was above the upper limit expected from %d earlier months with data, leaving out the 2 months just before (%s to %s: mean %s, %s; C2 = %.2f > %g).",
			f.Month, pct(f.Share), b, f.First, f.Last, pct(f.Mean), sd, f.Value, f.Threshold)
	case C3:
		s = fmt.Sprintf("In %s this theme's share (%s) had been above its baseline for up to three months in a row (%s to %s: C3, the sum of the C2 excesses over 1, = %.2f > %g).",
			f.Month, pct(f.Share), f.First, f.Last, f.Value, f.Threshold)
	}
	return s + " This marks the month for a closer reading of its narratives; it does not show that anything changed in what happened."
}
