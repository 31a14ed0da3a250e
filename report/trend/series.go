package trend

import (
	"fmt"
	"math"
	"time"
)

// Doc is one narrative as this package sees it. The themes model supplies Theta; the
// loader supplies Date, Group and Words.
type Doc struct {
	// Date is the narrative's date (incident or report date, as the caller chooses).
	// Only its calendar date in its own location is used. Data with months only
	// ("YYYY-MM") can use ParseMonth(s).Start() with Settings.From and To set to the
	// first month's Start and the last month's End, so no month is taken as partial.
	Date time.Time
	// Theta is the narrative's theme-share vector θ: one non-negative share per theme,
	// summing to 1 (within 1e-6). Every Doc passed together must have the same length.
	Theta []float64
	// Group is the narrative's value in the grouping column (district, call type, shift
	// ...). It is used only by the group functions; "" is a group like any other.
	Group string
	// Words holds the narrative's token counts (after cleaning, stemming and stop-word
	// removal, as the caller chooses). It is used only by GroupWords and may be nil.
	Words map[string]int
}

// Dominant returns the index of the largest share in theta, the lowest index on ties.
// It panics if theta is empty.
func Dominant(theta []float64) int {
	if len(theta) == 0 {
		panic("trend: empty theme-share vector")
	}
	best := 0
	for k, v := range theta {
		if v > theta[best] {
			best = k
		}
	}
	return best
}

// Settings controls Monthly. The zero value is ready to use.
type Settings struct {
	// From and To are the first and last days the data are meant to cover (for example
	// the extract's stated date range). They decide which months are partial. A zero
	// From means the date of the earliest Doc, a zero To the date of the latest. Docs
	// outside [From, To] are an error.
	From, To time.Time
	// Confidence is the level of the Wilson intervals; 0 means 0.95. Monthly returns
	// an error if it is not in (0, 1).
	Confidence float64
}

// MonthInfo describes one month of a Series.
type MonthInfo struct {
	Month Month
	// Total is the number of narratives dated in the month.
	Total int
	// Coverage is the fraction of the month's days that lie inside [From, To]:
	//
	//	coverage = (days of the month inside [From, To]) / (days in the month)
	Coverage float64
	// Partial is true when Coverage < 1: only the first and last months can be partial.
	Partial bool
	// Gap is true when Total is 0. A gap has no counts, shares or intervals: it is
	// missing data, not zero narratives, and Cells hold NaN shares for it.
	Gap bool
}

// Cell is one theme in one month.
type Cell struct {
	// Count is the number of the month's narratives whose dominant theme (see Dominant)
	// is this theme.
	Count int
	// Expected is the sum of the month's θ for this theme: the number of narratives the
	// theme accounts for when each narrative is shared out among its themes.
	Expected float64
	// Share is Count / Total of the month; Low and High are its Wilson interval
	// (see Wilson). All three are NaN in a gap month.
	Share, Low, High float64
}

// Series is the monthly series of every theme, from the first to the last month with
// data, with no month left out: months without narratives are present as gaps.
type Series struct {
	Themes     int
	Confidence float64
	Months     []MonthInfo
	// Cells[i][k] is theme k in Months[i].
	Cells [][]Cell
}

// Monthly builds the monthly series of docs. It returns an error naming the offending
// Doc (by 0-based index) if a date is zero or outside [From, To] or a θ is malformed,
// and an error if docs is empty.
func Monthly(docs []Doc, s Settings) (*Series, error) {
	themes, err := checkDocs(docs)
	if err != nil {
		return nil, err
	}
	from, to := s.From, s.To
	for i, d := range docs {
		if d.Date.IsZero() {
			return nil, fmt.Errorf("trend: doc %d: no date", i)
		}
		if s.From.IsZero() && (from.IsZero() || dayOf(d.Date).Before(from)) {
			from = dayOf(d.Date)
		}
		if s.To.IsZero() && (to.IsZero() || dayOf(d.Date).After(to)) {
			to = dayOf(d.Date)
		}
	}
	from, to = dayOf(from), dayOf(to)
	if to.Before(from) {
		return nil, fmt.Errorf("trend: date range ends (%s) before it starts (%s)", to.Format(time.DateOnly), from.Format(time.DateOnly))
	}
	for i, d := range docs {
		if day := dayOf(d.Date); day.Before(from) || day.After(to) {
			return nil, fmt.Errorf("trend: doc %d: date %s outside the covered range %s to %s", i, day.Format(time.DateOnly), from.Format(time.DateOnly), to.Format(time.DateOnly))
		}
	}
	first, last := MonthOf(from), MonthOf(to)
	conf := s.Confidence
	if conf == 0 {
		conf = 0.95
	}
	if !(conf > 0 && conf < 1) {
		return nil, fmt.Errorf("trend: confidence level %v is not between 0 and 1", s.Confidence)
	}
	n := int(last-first) + 1
	out := &Series{Themes: themes, Confidence: conf, Months: make([]MonthInfo, n), Cells: make([][]Cell, n)}
	for i := range out.Months {
		m := first + Month(i)
		start, end := m.Start(), m.Start().AddDate(0, 1, -1)
		if start.Before(from) {
			start = from
		}
		if end.After(to) {
			end = to
		}
		covered := int(end.Sub(start).Hours()/24+0.5) + 1
		out.Months[i] = MonthInfo{Month: m, Coverage: float64(covered) / float64(m.Days())}
		out.Months[i].Partial = covered < m.Days()
		out.Cells[i] = make([]Cell, themes)
	}
	for _, d := range docs {
		i := int(MonthOf(d.Date) - first)
		out.Months[i].Total++
		out.Cells[i][Dominant(d.Theta)].Count++
		for k, v := range d.Theta {
			out.Cells[i][k].Expected += v
		}
	}
	for i := range out.Months {
		mi := &out.Months[i]
		mi.Gap = mi.Total == 0
		for k := range out.Cells[i] {
			c := &out.Cells[i][k]
			if mi.Gap {
				c.Share, c.Low, c.High = math.NaN(), math.NaN(), math.NaN()
				continue
			}
			c.Share = float64(c.Count) / float64(mi.Total)
			c.Low, c.High = Wilson(c.Count, mi.Total, conf)
		}
	}
	return out, nil
}

// dayOf returns midnight UTC of t's calendar date in t's own location.
func dayOf(t time.Time) time.Time {
	return time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC)
}

// checkDocs checks that docs is not empty and every θ has the same length, is finite,
// non-negative and sums to 1 within 1e-6. It returns the number of themes.
func checkDocs(docs []Doc) (int, error) {
	if len(docs) == 0 {
		return 0, fmt.Errorf("trend: no narratives")
	}
	themes := len(docs[0].Theta)
	for i, d := range docs {
		if len(d.Theta) == 0 {
			return 0, fmt.Errorf("trend: doc %d: empty theme-share vector", i)
		}
		if len(d.Theta) != themes {
			return 0, fmt.Errorf("trend: doc %d: %d theme shares, doc 0 has %d", i, len(d.Theta), themes)
		}
		sum := 0.0
		for k, v := range d.Theta {
			if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
				return 0, fmt.Errorf("trend: doc %d: theme %d share %v is not a non-negative number", i, k, v)
			}
			sum += v
		}
		if math.Abs(sum-1) > 1e-6 {
			return 0, fmt.Errorf("trend: doc %d: theme shares sum to %v, not 1", i, sum)
		}
	}
	return themes, nil
}
