package intake

import (
	"fmt"
	"sort"
	"strings"
	"unicode"
	"unicode/utf8"
)

// headerWords splits a column name into lowercase words at non-alphanumerics and at
// lower-to-upper case changes ("caseNumber" -> case, number).
func headerWords(h string) []string {
	var words []string
	var cur []rune
	var prev rune
	flush := func() {
		if len(cur) > 0 {
			words = append(words, strings.ToLower(string(cur)))
			cur = cur[:0]
		}
	}
	for _, r := range h {
		switch {
		case unicode.IsLetter(r) || unicode.IsDigit(r):
			if unicode.IsUpper(r) && unicode.IsLower(prev) {
				flush()
			}
			cur = append(cur, r)
		default:
			flush()
		}
		prev = r
	}
	flush()
	return words
}

var (
	textWords = set("narrative", "narratives", "description", "descr", "desc", "summary", "abstract", "synopsis",
		"details", "detail", "remarks", "remark", "comments", "comment", "text", "notes", "note", "story", "statement")
	idWords       = set("id", "nr", "no", "num", "number", "key", "uid", "guid")
	dateWords     = set("date", "datetime", "time", "timestamp", "dt", "day", "when", "occurred", "reported")
	strongDate    = set("occurred", "occurrence", "occur", "event", "incident", "start", "offense", "offence", "call", "reported", "report")
	weakDate      = set("create", "created", "creation", "entered", "entry", "modified", "updated", "update", "stop", "end", "closed", "close", "birth", "dob", "due", "review", "approved")
	unwantedDates = set("dob", "birth")
)

func set(w ...string) map[string]bool {
	m := make(map[string]bool, len(w))
	for _, x := range w {
		m[x] = true
	}
	return m
}

// hintID scores a header as an id column: 3 for a bare "id", 2 when its last word is an
// id word (report_no, Case Number, SAFENET ID), 0 otherwise.
func hintID(h string) float64 {
	w := headerWords(h)
	if len(w) == 0 {
		return 0
	}
	if len(w) == 1 && w[0] == "id" {
		return 3
	}
	if idWords[w[len(w)-1]] || strings.HasSuffix(strings.TrimSpace(h), "#") {
		return 2
	}
	return 0
}

// hintText reports whether a header names a narrative (and not an id: "summary_nr").
func hintText(h string) bool {
	w := headerWords(h)
	if len(w) == 0 || idWords[w[len(w)-1]] {
		return false
	}
	for _, x := range w {
		if textWords[x] {
			return true
		}
	}
	return false
}

// hintDate scores a header as a date column: 0 no date word; 0.5 a date of record
// keeping (created, updated, stop, birth); 1 a date word; 2 a date word with an event
// word (Event Start Date, Occurred Date).
func hintDate(h string) float64 {
	w := headerWords(h)
	has, strong, weak := false, false, false
	for _, x := range w {
		has = has || dateWords[x] || unwantedDates[x]
		strong = strong || strongDate[x]
		weak = weak || weakDate[x]
	}
	switch {
	case !has:
		return 0
	case weak:
		return 0.5
	case strong:
		return 2
	}
	return 1
}

// levenshtein is the edit distance (insertions, deletions, substitutions, each 1)
// between a and b, counted in runes.
func levenshtein(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			c := prev[j-1]
			if ra[i-1] != rb[j-1] {
				c++
			}
			c = min(c, prev[j]+1, cur[j-1]+1)
			cur[j] = c
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// findColumn finds a named column: the exact name, else the one name equal to it
// ignoring case. Failing both, the error lists the columns and the closest name
// (Levenshtein distance, case-insensitive; ties: the earlier column).
func findColumn(file, role, name string, header []string) (int, error) {
	for i, h := range header {
		if h == name {
			return i, nil
		}
	}
	found := -1
	for i, h := range header {
		if strings.EqualFold(h, name) {
			if found >= 0 {
				found = -2
				break
			}
			found = i
		}
	}
	if found >= 0 {
		return found, nil
	}
	best, bestD := "", -1
	for _, h := range header {
		d := levenshtein(strings.ToLower(h), strings.ToLower(name))
		if bestD < 0 || d < bestD {
			best, bestD = h, d
		}
	}
	return -1, &PosError{File: file, Err: fmt.Errorf("%w: %s column %q; did you mean %q? columns are: %s",
		ErrNoColumn, role, name, best, quoteList(header))}
}

// colStats are statistics of one column over a sample of rows.
type colStats struct {
	nonEmpty  int
	meanRunes float64
	parsed    int // values that read as dates
}

func statsOf(rows []rowRef, col int, dateHint bool, serialOK bool, fixed *dateReading, opt *Options) colStats {
	var s colStats
	var total int
	for _, r := range rows {
		v := strings.TrimSpace(r.f[col])
		if v == "" {
			continue
		}
		s.nonEmpty++
		total += utf8.RuneCountInString(v)
		if len(v) > 64 {
			continue
		}
		digits := strings.Trim(v, "0123456789.") == ""
		if digits && !dateHint {
			continue
		}
		if fixed != nil {
			if _, err := fixed.parse(v); err == nil {
				s.parsed++
			}
		} else if _, err := parseDate(v, opt.DateOrder, serialOK && digits, opt.Now); err == nil {
			s.parsed++
		}
	}
	if s.nonEmpty > 0 {
		s.meanRunes = float64(total) / float64(s.nonEmpty)
	}
	return s
}

// chooseColumns fills in the roles the options left open and returns notes on each
// automatic choice, from the survey of the rows (its sample, and the distinct values of
// the id-like columns over all rows). idCol and dateCol are -1 when there is none.
func chooseColumns(file string, header []string, sv *survey, xlsx bool, opt *Options) (idCol, dateCol int, textCols, groupCols []int, notes []string, err error) {
	idCol, dateCol = -1, -1
	used := map[int]bool{}
	named := func(role, name string) (int, error) {
		i, err := findColumn(file, role, name, header)
		if err == nil {
			used[i] = true
		}
		return i, err
	}
	if opt.ID != "" && opt.ID != "-" {
		if idCol, err = named("id", opt.ID); err != nil {
			return
		}
	}
	if opt.Date != "" && opt.Date != "-" {
		if dateCol, err = named("date", opt.Date); err != nil {
			return
		}
	}
	if opt.Time != "" {
		if _, err = named("time", opt.Time); err != nil {
			return
		}
	}
	for _, n := range opt.Text {
		var i int
		if i, err = named("narrative", n); err != nil {
			return
		}
		textCols = append(textCols, i)
	}
	for _, n := range opt.Groups {
		var i int
		if i, err = named("group", n); err != nil {
			return
		}
		groupCols = append(groupCols, i)
	}
	sample := sv.sample
	var fixed *dateReading // an explicit DateFormat also guides the choice of the date column
	if opt.DateFormat != "" {
		if fixed, _, err = decideReading("", nil, opt, xlsx, opt.Now); err != nil {
			return
		}
	}
	stats := make([]colStats, len(header))
	for c := range header {
		stats[c] = statsOf(sample, c, hintDate(header[c]) > 0, xlsx || hintDate(header[c]) > 0, fixed, opt)
	}
	if opt.ID == "" {
		type cand struct {
			c    int
			hint float64
			uniq float64
		}
		var cs []cand
		for c, h := range header {
			if used[c] || hintID(h) == 0 || stats[c].meanRunes > 64 || stats[c].nonEmpty == 0 {
				continue
			}
			u := float64(sv.distinct(c)) / float64(sv.n)
			if u < 0.5 {
				continue
			}
			cs = append(cs, cand{c, hintID(h), u})
		}
		sort.SliceStable(cs, func(i, j int) bool {
			if cs[i].hint != cs[j].hint {
				return cs[i].hint > cs[j].hint
			}
			return cs[i].uniq > cs[j].uniq
		})
		if len(cs) > 0 {
			idCol = cs[0].c
			used[idCol] = true
			nt := fmt.Sprintf("id column: %q (header looks like an id; %.1f%% of rows have distinct values)", header[idCol], 100*cs[0].uniq)
			if len(cs) > 1 {
				var o []string
				for _, x := range cs[1:] {
					o = append(o, fmt.Sprintf("%q", header[x.c]))
				}
				nt += "; other candidates: " + strings.Join(o, ", ")
			}
			notes = append(notes, nt)
		} else {
			notes = append(notes, "id column: none found; ids are file:line")
		}
	}
	if len(textCols) == 0 {
		best := -1
		var hinted []int
		for c, h := range header {
			if !used[c] && hintText(h) && stats[c].nonEmpty > 0 {
				hinted = append(hinted, c)
			}
		}
		pool := hinted
		why := "header looks like a narrative"
		if len(pool) == 0 {
			why = "no narrative-like header; the column with the longest mean text"
			for c := range header {
				if !used[c] && c != dateCol && stats[c].nonEmpty > 0 {
					pool = append(pool, c)
				}
			}
		}
		for _, c := range pool {
			if best < 0 || stats[c].meanRunes > stats[best].meanRunes {
				best = c
			}
		}
		if len(hinted) > 0 {
			// A far longer column beats a short narrative-like one ("Call Description"
			// of a few words beside a free-text log): 3 times the mean and 200 characters.
			long := -1
			for c := range header {
				if !used[c] && !hintText(header[c]) && (long < 0 || stats[c].meanRunes > stats[long].meanRunes) {
					long = c
				}
			}
			if long >= 0 && stats[long].meanRunes >= 200 && stats[long].meanRunes > 3*stats[best].meanRunes {
				why = fmt.Sprintf("its mean text is over 3 times that of the narrative-like %q", header[best])
				pool = append(pool, long)
				best = long
			}
		}
		if best < 0 && sv.n == 0 {
			// Every row was rejected while parsing; nothing to choose from.
			notes = append(notes, "narrative column: none chosen, no row could be parsed")
			return
		}
		if best < 0 {
			err = &PosError{File: file, Err: fmt.Errorf("%w: every column is empty; columns are: %s", ErrNoNarrative, quoteList(header))}
			return
		}
		textCols = []int{best}
		used[best] = true
		nt := fmt.Sprintf("narrative column: %q (%s; mean %.0f characters)", header[best], why, stats[best].meanRunes)
		var o []string
		for _, c := range pool {
			if c != best {
				o = append(o, fmt.Sprintf("%q %.0f", header[c], stats[c].meanRunes))
			}
		}
		if len(o) > 0 && len(o) <= 5 {
			nt += "; other candidates: " + strings.Join(o, ", ")
		}
		notes = append(notes, nt)
	}
	if opt.Date == "" {
		type cand struct {
			c    int
			hint float64
			rate float64
			cov  float64
		}
		var cs []cand
		var weakOnes []string
		for c, h := range header {
			if used[c] || stats[c].nonEmpty == 0 {
				continue
			}
			rate := float64(stats[c].parsed) / float64(stats[c].nonEmpty)
			hint := hintDate(h)
			if rate >= 0.8 || (hint > 0 && rate >= 0.5) {
				cs = append(cs, cand{c, hint, rate, float64(stats[c].nonEmpty) / float64(len(sample))})
			} else if hint > 0 {
				weakOnes = append(weakOnes, fmt.Sprintf("%q (%.0f%% parse)", h, 100*rate))
			}
		}
		sort.SliceStable(cs, func(i, j int) bool {
			if cs[i].hint != cs[j].hint {
				return cs[i].hint > cs[j].hint
			}
			return cs[i].rate*cs[i].cov > cs[j].rate*cs[j].cov
		})
		if len(cs) > 0 {
			dateCol = cs[0].c
			used[dateCol] = true
			nt := fmt.Sprintf("date column: %q (%.1f%% of non-empty sampled values read as dates", header[dateCol], 100*cs[0].rate)
			if cs[0].hint > 0 {
				nt += ", header looks like a date"
			}
			nt += ")"
			if len(cs) > 1 {
				var o []string
				for _, x := range cs[1:] {
					o = append(o, fmt.Sprintf("%q", header[x.c]))
				}
				nt += "; other candidates: " + strings.Join(o, ", ")
			}
			notes = append(notes, nt)
		} else {
			nt := "date column: none found; records have no dates"
			if len(weakOnes) > 0 {
				nt += "; date-like headers whose values mostly do not parse: " + strings.Join(weakOnes, ", ") + " (name one to use it anyway)"
			}
			notes = append(notes, nt)
		}
	}
	return
}
