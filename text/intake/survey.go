package intake

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"time"
	"unicode"
	"unicode/utf8"
)

// SurveyOptions tunes Survey. The zero value is usable.
type SurveyOptions struct {
	// Top is how many opening words and bigrams to list; 0 means 20.
	Top int
	// CommonShare: words found in more than this share of narratives are listed as
	// stopword candidates; 0 means 0.5. A share >= 1 lists none.
	CommonShare float64
}

// Quartiles summarise a distribution: minimum, the three quartiles and maximum.
type Quartiles struct {
	Min, Q1, Median, Q3, Max float64
}

// MonthCount is the number of kept, dated records in one calendar month. Months with
// no records are included between the first and last month, with Empty set.
type MonthCount struct {
	Month string // "2006-01"
	N     int
	Empty bool
}

// TermCount is a term and how often it was seen.
type TermCount struct {
	Term string
	N    int
}

// WordShare is a word and the number and share of narratives holding it.
type WordShare struct {
	Word  string
	Docs  int
	Share float64
}

// ColumnValues is a column, how many distinct non-empty values it has among the kept
// records, how many records leave it empty, and its most frequent values (by count,
// then value; at most SurveyOptions.Top).
type ColumnValues struct {
	Name     string
	Distinct int
	Empty    int
	Top      []TermCount
}

// SurveyResult describes a Set without modelling. Every list is in a fixed order.
type SurveyResult struct {
	Files                    []FileInfo
	IDName, DateName         string
	DateRead                 string
	TextNames, GroupNames    []string
	Read, Kept, Rejected     int
	Rejects                  []ReasonCount  // by count, then reason
	Dated                    int            // kept records with a date
	First, Last              time.Time      // date span of the dated records
	Months                   []MonthCount   // from First's month to Last's month
	Chars, Words             Quartiles      // narrative length in characters (runes) and words
	DuplicateTexts           int            // kept records whose narrative equals an earlier one's
	DuplicateShare           float64        // DuplicateTexts / Kept
	Openings, OpeningBigrams []TermCount    // by count, then term
	CommonWords              []WordShare    // by share, then word
	Groups                   []ColumnValues // the group columns, their values by count
	GroupCandidates          []ColumnValues // passed-through columns that look like groups
	CommonShare              float64
	Notes                    []string
}

// Survey computes the description of s. Narrative lengths count runes and
// whitespace-separated words (strings.Fields). Quartiles use linear interpolation
// between order statistics, definition 7 of Hyndman and Fan (1996), "Sample quantiles
// in statistical packages", The American Statistician 50(4) (R's and NumPy's default):
//
//	h = (n-1)p,  Q(p) = x[floor h] + (h - floor h)(x[floor h + 1] - x[floor h])
//
// with x sorted and 0-based. Opening words and common words use a simple
// tokenization: maximal runs of letters, lowercased.
func Survey(s *Set, opt SurveyOptions) *SurveyResult {
	if opt.Top <= 0 {
		opt.Top = 20
	}
	if opt.CommonShare == 0 {
		opt.CommonShare = 0.5
	}
	r := &SurveyResult{
		Files: s.Files, IDName: s.IDName, DateName: s.DateName, DateRead: s.DateRead,
		TextNames: s.TextNames, GroupNames: s.GroupNames,
		Read: s.Read, Kept: len(s.Records), Rejected: len(s.Rejects),
		Rejects: RejectCounts(s.Rejects), CommonShare: opt.CommonShare, Notes: s.Notes,
	}
	months := map[string]int{}
	chars := make([]float64, 0, len(s.Records))
	words := make([]float64, 0, len(s.Records))
	seenText := make(map[string]struct{}, len(s.Records))
	open1, open2, df := map[string]int{}, map[string]int{}, map[string]int{}
	for _, rec := range s.Records {
		if rec.HasDate {
			if r.Dated == 0 || rec.Date.Before(r.First) {
				r.First = rec.Date
			}
			if r.Dated == 0 || rec.Date.After(r.Last) {
				r.Last = rec.Date
			}
			r.Dated++
			months[rec.Date.Format("2006-01")]++
		}
		chars = append(chars, float64(utf8.RuneCountInString(rec.Text)))
		words = append(words, float64(len(strings.Fields(rec.Text))))
		if _, ok := seenText[rec.Text]; ok {
			r.DuplicateTexts++
		} else {
			seenText[rec.Text] = struct{}{}
		}
		toks := letterWords(rec.Text)
		if len(toks) > 0 {
			open1[toks[0]]++
		}
		if len(toks) > 1 {
			open2[toks[0]+" "+toks[1]]++
		}
		uniq := map[string]bool{}
		for _, w := range toks {
			if !uniq[w] {
				uniq[w] = true
				df[w]++
			}
		}
	}
	if r.Kept > 0 {
		r.DuplicateShare = float64(r.DuplicateTexts) / float64(r.Kept)
	}
	if r.Dated > 0 {
		y, m := r.First.Year(), r.First.Month()
		last := r.Last.Format("2006-01")
		for {
			k := time.Date(y, m, 1, 0, 0, 0, 0, time.UTC).Format("2006-01")
			r.Months = append(r.Months, MonthCount{Month: k, N: months[k], Empty: months[k] == 0})
			if k >= last {
				break
			}
			if m++; m > 12 {
				m, y = 1, y+1
			}
		}
	}
	r.Chars, r.Words = quartiles(chars), quartiles(words)
	r.Openings, r.OpeningBigrams = topTerms(open1, opt.Top), topTerms(open2, opt.Top)
	for w, n := range df {
		if sh := float64(n) / float64(r.Kept); sh > opt.CommonShare {
			r.CommonWords = append(r.CommonWords, WordShare{w, n, sh})
		}
	}
	values := func(name string, get func(Record) string) ColumnValues {
		m := map[string]int{}
		cv := ColumnValues{Name: name}
		for _, rec := range s.Records {
			if v := strings.TrimSpace(get(rec)); v != "" {
				m[v]++
			} else {
				cv.Empty++
			}
		}
		cv.Distinct = len(m)
		cv.Top = topTerms(m, opt.Top)
		return cv
	}
	for i, g := range s.GroupNames {
		r.Groups = append(r.Groups, values(g, func(rec Record) string { return rec.Groups[i] }))
	}
	// A passed-through column looks like a group when it has 2 to 50 distinct values and
	// at most a tenth of the kept records leave it empty.
	for i, x := range s.ExtraNames {
		cv := values(x, func(rec Record) string { return rec.Extra[i] })
		if cv.Distinct >= 2 && cv.Distinct <= 50 && 10*cv.Empty <= r.Kept {
			r.GroupCandidates = append(r.GroupCandidates, cv)
		}
	}
	sort.Slice(r.CommonWords, func(i, j int) bool {
		a, b := r.CommonWords[i], r.CommonWords[j]
		if a.Docs != b.Docs {
			return a.Docs > b.Docs
		}
		return a.Word < b.Word
	})
	return r
}

// letterWords splits s into maximal runs of letters, lowercased.
func letterWords(s string) []string {
	return strings.FieldsFunc(strings.ToLower(s), func(r rune) bool { return !unicode.IsLetter(r) })
}

func topTerms(m map[string]int, n int) []TermCount {
	out := make([]TermCount, 0, len(m))
	for k, v := range m {
		out = append(out, TermCount{k, v})
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].N != out[j].N {
			return out[i].N > out[j].N
		}
		return out[i].Term < out[j].Term
	})
	if len(out) > n {
		out = out[:n]
	}
	return out
}

// quantile7 is definition 7 of Hyndman and Fan on sorted x.
func quantile7(x []float64, p float64) float64 {
	h := float64(len(x)-1) * p
	lo := math.Floor(h)
	i := int(lo)
	if i+1 >= len(x) {
		return x[len(x)-1]
	}
	return x[i] + (h-lo)*(x[i+1]-x[i])
}

func quartiles(x []float64) Quartiles {
	if len(x) == 0 {
		return Quartiles{}
	}
	sort.Float64s(x)
	return Quartiles{x[0], quantile7(x, 0.25), quantile7(x, 0.5), quantile7(x, 0.75), x[len(x)-1]}
}

// WriteText writes r as plain text, one fact a line, for a terminal.
func (r *SurveyResult) WriteText(w io.Writer) error {
	var b strings.Builder
	p := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	p("files:\n")
	for _, f := range r.Files {
		p("  %s: %s, %s", f.Path, f.Format, f.Encoding)
		if f.Delimiter != "" {
			p(", delimiter %q", f.Delimiter)
		}
		if f.Sheet != "" {
			p(", sheet %q", f.Sheet)
		}
		p(", %d rows", f.Rows)
		if f.InvalidLines > 0 {
			p(", %d lines not valid in that encoding", f.InvalidLines)
		}
		p("\n")
	}
	none := func(s string) string {
		if s == "" {
			return "(none)"
		}
		return fmt.Sprintf("%q", s)
	}
	p("columns: id %s, date %s", none(r.IDName), none(r.DateName))
	if r.DateName != "" {
		p(" (%s)", r.DateRead)
	}
	p(", narrative %s", quoteList(r.TextNames))
	if len(r.GroupNames) > 0 {
		p(", groups %s", quoteList(r.GroupNames))
	}
	p("\nrows: read %d, kept %d, rejected %d\n", r.Read, r.Kept, r.Rejected)
	for _, c := range r.Rejects {
		p("  %s: %d\n", c.Reason, c.N)
	}
	if r.Dated > 0 {
		p("dates: %d of %d kept records, %s to %s\n", r.Dated, r.Kept, r.First.Format("2006-01-02"), r.Last.Format("2006-01-02"))
		for _, m := range r.Months {
			mark := ""
			if m.Empty {
				mark = "  (empty)"
			}
			p("  %s %6d%s\n", m.Month, m.N, mark)
		}
	} else {
		p("dates: none\n")
	}
	q := func(name string, x Quartiles) {
		p("%s: min %g, q1 %g, median %g, q3 %g, max %g\n", name, x.Min, x.Q1, x.Median, x.Q3, x.Max)
	}
	q("narrative characters", r.Chars)
	q("narrative words", r.Words)
	p("exact-duplicate narratives: %d of %d (%.1f%%)\n", r.DuplicateTexts, r.Kept, 100*r.DuplicateShare)
	terms := func(name string, t []TermCount) {
		p("%s:", name)
		for _, x := range t {
			p(" %s (%d);", x.Term, x.N)
		}
		p("\n")
	}
	terms("opening words", r.Openings)
	terms("opening bigrams", r.OpeningBigrams)
	p("words in more than %.0f%% of narratives (stopword candidates):", 100*r.CommonShare)
	for _, x := range r.CommonWords {
		p(" %s (%.0f%%);", x.Word, 100*x.Share)
	}
	p("\n")
	cols := func(name string, cs []ColumnValues) {
		if len(cs) == 0 {
			return
		}
		p("%s:\n", name)
		for _, c := range cs {
			p("  %q: %d values", c.Name, c.Distinct)
			if c.Empty > 0 {
				p(", %d empty", c.Empty)
			}
			p(";")
			for _, x := range c.Top {
				p(" %s (%d);", x.Term, x.N)
			}
			p("\n")
		}
	}
	cols("groups", r.Groups)
	cols("columns that could serve as groups", r.GroupCandidates)
	if len(r.Notes) > 0 {
		p("notes:\n")
		for _, n := range r.Notes {
			p("  %s\n", n)
		}
	}
	_, err := io.WriteString(w, b.String())
	return err
}
