package report

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// The labels file lets a reviewer curate the themes without refitting the model. It is
// plain UTF-8 text, one statement per line:
//
//	# a comment: lines whose first non-blank character is '#' are ignored, as are blank lines
//	theme 3: label = Parking complaints
//	theme 3: description = Blocked driveways, cars on the pavement, tow requests
//	theme 3: note = Checked 40 narratives; mostly residential streets
//	merge 4 into 7
//	hide 9
//
// Theme numbers are the model's (0-based), as the report prints them. "label",
// "description" and "note" take the rest of the line after '=' (spaces around it are
// trimmed; it must not be empty) and may each be given once per theme. "merge A into B"
// adds theme A to theme B: in the narratives' theme shares the two columns are summed
// (see ThemeMap), and in the report A's words and examples join B's. Merges may chain
// (merge 4 into 7, merge 7 into 9 puts both into 9) but not loop. "hide N" removes a theme
// from the report's view (it is listed as hidden); its share stays in the narratives. A
// theme merged into another cannot also be labelled or hidden.
//
// Errors name the file, line and column (1-based, counted in characters), e.g.
// "labels.txt:4:7: theme number "x" is not a whole number".

// StatementKind says what a labels-file statement does.
type StatementKind int

// Statement kinds.
const (
	SetLabel StatementKind = iota
	SetDescription
	SetNote
	Merge
	Hide
)

var kindWord = map[StatementKind]string{SetLabel: "label", SetDescription: "description", SetNote: "note", Merge: "merge", Hide: "hide"}

// String returns the keyword of the statement kind.
func (k StatementKind) String() string {
	if w, ok := kindWord[k]; ok {
		return w
	}
	return "StatementKind(" + strconv.Itoa(int(k)) + ")"
}

// Pos is a position in a labels file: 1-based line and column (in characters).
type Pos struct {
	Line, Col int
}

// Statement is one line of a labels file.
type Statement struct {
	Kind StatementKind
	// Theme is the theme the statement is about: labelled, merged away or hidden.
	Theme int
	// Into is the theme Theme is merged into (Merge only).
	Into int
	// Text is the label, description or note.
	Text string
	// Pos is where the statement starts; ThemePos and IntoPos where its numbers are.
	Pos, ThemePos, IntoPos Pos
}

// Curation is a parsed labels file.
type Curation struct {
	// File is the name the file was parsed under, used in messages.
	File       string
	Statements []Statement
}

// LabelsError is a problem in a labels file, with its position.
type LabelsError struct {
	File      string
	Line, Col int
	Err       error
}

func (e *LabelsError) Error() string {
	return fmt.Sprintf("%s:%d:%d: %v", e.File, e.Line, e.Col, e.Err)
}

func (e *LabelsError) Unwrap() error { return e.Err }

// Errors wrapped by LabelsError.
var (
	// ErrLabelsSyntax marks a line that is not a statement.
	ErrLabelsSyntax = errors.New("syntax error")
	// ErrLabelsConflict marks a statement that contradicts an earlier one.
	ErrLabelsConflict = errors.New("conflicting statement")
	// ErrLabelsUnknownTheme marks a theme number the model or report does not have.
	ErrLabelsUnknownTheme = errors.New("unknown theme")
)

func lerr(file string, p Pos, sentinel error, format string, a ...any) error {
	return &LabelsError{File: file, Line: p.Line, Col: p.Col, Err: fmt.Errorf("%w: "+format, append([]any{sentinel}, a...)...)}
}

// lineScanner walks one line, keeping the column.
type lineScanner struct {
	s   string
	i   int // byte offset
	row int
}

func (l *lineScanner) col() int { return utf8.RuneCountInString(l.s[:l.i]) + 1 }
func (l *lineScanner) pos() Pos { return Pos{l.row, l.col()} }

func (l *lineScanner) skipSpace() {
	for l.i < len(l.s) {
		r, n := utf8.DecodeRuneInString(l.s[l.i:])
		if !unicode.IsSpace(r) {
			return
		}
		l.i += n
	}
}

// word returns the next run of characters that are not spaces, ':' or '='.
func (l *lineScanner) word() (string, Pos) {
	l.skipSpace()
	p := l.pos()
	start := l.i
	for l.i < len(l.s) {
		r, n := utf8.DecodeRuneInString(l.s[l.i:])
		if unicode.IsSpace(r) || r == ':' || r == '=' {
			break
		}
		l.i += n
	}
	return l.s[start:l.i], p
}

func (l *lineScanner) expect(file string, c byte, what string) error {
	l.skipSpace()
	if l.i >= len(l.s) || l.s[l.i] != c {
		return lerr(file, l.pos(), ErrLabelsSyntax, "expected %s", what)
	}
	l.i++
	return nil
}

func (l *lineScanner) end(file string) error {
	l.skipSpace()
	if l.i < len(l.s) {
		w, p := l.word()
		if w == "" {
			w = l.s[l.i : l.i+1]
		}
		return lerr(file, p, ErrLabelsSyntax, "unexpected %q at the end of the statement", w)
	}
	return nil
}

func themeNumber(file, w string, p Pos) (int, error) {
	if w == "" {
		return 0, lerr(file, p, ErrLabelsSyntax, "expected a theme number")
	}
	n, err := strconv.Atoi(w)
	if err != nil || n < 0 || strings.HasPrefix(w, "+") {
		return 0, lerr(file, p, ErrLabelsSyntax, "theme number %q is not a whole number 0 or above", w)
	}
	return n, nil
}

// ParseLabels reads a labels file (format above). name is used in error messages. It
// checks the file on its own; Curation.Map and Apply check theme numbers against the
// model and the report.
func ParseLabels(name string, r io.Reader) (*Curation, error) {
	c := &Curation{File: name}
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 64*1024), 1<<20)
	row := 0
	for sc.Scan() {
		row++
		line := sc.Text()
		if row == 1 {
			line = strings.TrimPrefix(line, "\uFEFF")
		}
		if !utf8.ValidString(line) {
			return nil, lerr(name, Pos{row, 1}, ErrLabelsSyntax, "line is not valid UTF-8")
		}
		l := &lineScanner{s: line, row: row}
		l.skipSpace()
		if l.i == len(line) || line[l.i] == '#' {
			continue
		}
		st, err := parseStatement(name, l)
		if err != nil {
			return nil, err
		}
		c.Statements = append(c.Statements, st)
	}
	if err := sc.Err(); err != nil {
		return nil, &LabelsError{File: name, Line: row + 1, Col: 1, Err: err}
	}
	if err := c.check(); err != nil {
		return nil, err
	}
	return c, nil
}

func parseStatement(file string, l *lineScanner) (Statement, error) {
	kw, kp := l.word()
	st := Statement{Pos: kp}
	switch kw {
	case "theme":
		w, p := l.word()
		n, err := themeNumber(file, w, p)
		if err != nil {
			return st, err
		}
		st.Theme, st.ThemePos = n, p
		if err := l.expect(file, ':', `":" after the theme number`); err != nil {
			return st, err
		}
		f, fp := l.word()
		switch f {
		case "label":
			st.Kind = SetLabel
		case "description":
			st.Kind = SetDescription
		case "note":
			st.Kind = SetNote
		default:
			return st, lerr(file, fp, ErrLabelsSyntax, "unknown field %q (want label, description or note)", f)
		}
		if err := l.expect(file, '=', `"=" after `+f); err != nil {
			return st, err
		}
		l.skipSpace()
		st.Text = strings.TrimRightFunc(l.s[l.i:], unicode.IsSpace)
		if st.Text == "" {
			return st, lerr(file, l.pos(), ErrLabelsSyntax, "empty %s", f)
		}
		return st, nil
	case "merge":
		st.Kind = Merge
		w, p := l.word()
		n, err := themeNumber(file, w, p)
		if err != nil {
			return st, err
		}
		st.Theme, st.ThemePos = n, p
		if w, p := l.word(); w != "into" {
			return st, lerr(file, p, ErrLabelsSyntax, `expected "into", found %q`, w)
		}
		w, p = l.word()
		if st.Into, err = themeNumber(file, w, p); err != nil {
			return st, err
		}
		st.IntoPos = p
		return st, l.end(file)
	case "hide":
		st.Kind = Hide
		w, p := l.word()
		n, err := themeNumber(file, w, p)
		if err != nil {
			return st, err
		}
		st.Theme, st.ThemePos = n, p
		return st, l.end(file)
	case "":
		return st, lerr(file, kp, ErrLabelsSyntax, "expected a statement")
	}
	return st, lerr(file, kp, ErrLabelsSyntax, "unknown statement %q (want theme, merge or hide)", kw)
}

// check finds contradictions within the file.
func (c *Curation) check() error {
	type key struct {
		theme int
		kind  StatementKind
	}
	first := map[key]Pos{}
	mergedAt := map[int]Statement{}
	for _, st := range c.Statements {
		k := key{st.Theme, st.Kind}
		if st.Kind == Merge {
			k.kind = Merge
		}
		if p, ok := first[k]; ok {
			return lerr(c.File, st.Pos, ErrLabelsConflict, "%s for theme %d already given on line %d", st.Kind, st.Theme, p.Line)
		}
		first[k] = st.Pos
		if st.Kind == Merge {
			if st.Theme == st.Into {
				return lerr(c.File, st.IntoPos, ErrLabelsConflict, "theme %d merged into itself", st.Theme)
			}
			mergedAt[st.Theme] = st
		}
	}
	for _, st := range c.Statements {
		if st.Kind == Merge {
			continue
		}
		if m, ok := mergedAt[st.Theme]; ok {
			return lerr(c.File, st.ThemePos, ErrLabelsConflict, "theme %d is merged into %d on line %d; give the %s to theme %d", st.Theme, m.Into, m.Pos.Line, st.Kind, m.Into)
		}
	}
	// Loops: follow each chain.
	for _, st := range c.Statements {
		if st.Kind != Merge {
			continue
		}
		seen := map[int]bool{st.Theme: true}
		at := st.Into
		for {
			if seen[at] {
				return lerr(c.File, st.Pos, ErrLabelsConflict, "merges starting at theme %d go round in a loop", st.Theme)
			}
			seen[at] = true
			next, ok := mergedAt[at]
			if !ok {
				break
			}
			at = next.Into
		}
	}
	return nil
}

// ThemeMap says where each of the model's themes goes after curation. It is what the
// tagger needs to apply a labels file to the narratives' theme shares.
type ThemeMap struct {
	// Into[i] is the theme that theme i's share is added to: i itself unless it was
	// merged (chains resolved).
	Into []int
	// Hidden[i] is set for a theme hidden from the report. Hiding does not change the
	// shares.
	Hidden []bool
}

// Map checks the curation against a model with k themes and returns the theme map.
func (c *Curation) Map(k int) (ThemeMap, error) {
	m := ThemeMap{Into: make([]int, k), Hidden: make([]bool, k)}
	for i := range m.Into {
		m.Into[i] = i
	}
	if c == nil {
		return m, nil
	}
	for _, st := range c.Statements {
		if st.Theme >= k {
			return ThemeMap{}, lerr(c.File, st.ThemePos, ErrLabelsUnknownTheme, "theme %d: the model has themes 0 to %d", st.Theme, k-1)
		}
		if st.Kind == Merge && st.Into >= k {
			return ThemeMap{}, lerr(c.File, st.IntoPos, ErrLabelsUnknownTheme, "theme %d: the model has themes 0 to %d", st.Into, k-1)
		}
	}
	direct := map[int]int{}
	for _, st := range c.Statements {
		switch st.Kind {
		case Merge:
			direct[st.Theme] = st.Into
		case Hide:
			m.Hidden[st.Theme] = true
		}
	}
	for i := range m.Into {
		at := i
		for {
			next, ok := direct[at]
			if !ok {
				break
			}
			at = next
		}
		m.Into[i] = at
	}
	return m, nil
}

// Fold adds each column of theta (one narrative's theme shares, length len(m.Into)) into
// the column of the theme it goes to, and returns dst. Columns of themes merged away are
// 0; the sum is unchanged. If dst is nil a new slice is made; otherwise len(dst) must
// equal len(theta). dst must not be theta.
func (m ThemeMap) Fold(dst, theta []float64) []float64 {
	if len(theta) != len(m.Into) {
		panic("report: ThemeMap.Fold: len(theta) does not match the theme map")
	}
	if dst == nil {
		dst = make([]float64, len(theta))
	} else if len(dst) != len(theta) {
		panic("report: ThemeMap.Fold: slice lengths do not match")
	} else if len(dst) > 0 && &dst[0] == &theta[0] {
		panic("report: ThemeMap.Fold: dst and theta are the same slice")
	}
	clear(dst)
	for i, v := range theta {
		dst[m.Into[i]] += v
	}
	return dst
}

// Recompute gives the monthly series, group shares and published dominant count of theme
// into after the themes in from were merged into it, computed from the folded theme
// shares (see ThemeMap.Fold). Apply calls it once per theme that received a merge.
type Recompute func(into int, from []int) (months []MonthPoint, groups []GroupShare, dominant string, err error)

// Apply applies the curation c to d in place: labels, descriptions and notes (labels
// then count as a person's), merges, and hides. Theme numbers must be themes of d.
//
// A merge moves the merged theme's words (after the target's own) and examples (up to 5
// in all, the target's first) into the target and sums the expected sizes and shares,
// which are exact because theme shares add. The monthly series, the group shares and the
// dominant count cannot be derived from the published (suppressed) values: if recompute
// is not nil Apply takes them from it; otherwise it drops them and says so on the page.
// The tree keeps every original theme and marks merged and hidden ones in its labels.
func Apply(d *Data, c *Curation, recompute Recompute) error {
	if c == nil {
		return nil
	}
	idx := map[int]int{}
	k := 0
	for i, t := range d.Themes {
		idx[t.ID] = i
		k = max(k, t.ID+1)
	}
	for _, l := range d.Tree.Leaves {
		k = max(k, l.Theme+1)
	}
	for _, st := range c.Statements {
		for _, n := range []struct {
			id int
			p  Pos
		}{{st.Theme, st.ThemePos}, {st.Into, st.IntoPos}} {
			if n.p == (Pos{}) {
				continue
			}
			if _, ok := idx[n.id]; !ok {
				return lerr(c.File, n.p, ErrLabelsUnknownTheme, "theme %d is not in the report", n.id)
			}
		}
	}
	m, err := c.Map(k)
	if err != nil {
		return err
	}
	leaf := map[int]int{}
	for i, l := range d.Tree.Leaves {
		leaf[l.Theme] = i
	}
	for _, st := range c.Statements {
		t := &d.Themes[idx[st.Theme]]
		switch st.Kind {
		case SetLabel:
			t.Label, t.LabelByPerson = st.Text, true
			if i, ok := leaf[st.Theme]; ok {
				d.Tree.Leaves[i].Label = st.Text
			}
		case SetDescription:
			t.Description = st.Text
		case SetNote:
			t.Note = st.Text
		}
	}
	// Merges, in theme order of the targets so the result does not depend on line order.
	from := map[int][]int{}
	for id := range m.Into {
		if m.Into[id] != id {
			if _, ok := idx[id]; ok {
				from[m.Into[id]] = append(from[m.Into[id]], id)
			}
		}
	}
	remove := map[int]bool{}
	targets := make([]int, 0, len(from))
	for into := range from {
		targets = append(targets, into)
	}
	slices.Sort(targets)
	for _, into := range targets {
		dst := &d.Themes[idx[into]]
		for _, id := range from[into] {
			src := &d.Themes[idx[id]]
			dst.TopWords = appendNew(dst.TopWords, src.TopWords)
			dst.RelevantWords = appendNew(dst.RelevantWords, src.RelevantWords)
			dst.DistinctiveWords = appendNew(dst.DistinctiveWords, src.DistinctiveWords)
			dst.Size.Expected += src.Size.Expected
			dst.Size.Share += src.Size.Share
			mergeCopies(dst, src)
			for _, e := range src.Examples {
				if len(dst.Examples) < 5 {
					dst.Examples = append(dst.Examples, e)
				}
			}
			dst.MergedFrom = append(dst.MergedFrom, id)
			remove[id] = true
			if i, ok := leaf[id]; ok {
				d.Tree.Leaves[i].Label = fmt.Sprintf("%s (merged into %d)", src.Label, into)
			}
		}
		if recompute != nil {
			months, groups, dom, err := recompute(into, slices.Clone(from[into]))
			if err != nil {
				return fmt.Errorf("report: recomputing merged theme %d: %w", into, err)
			}
			dst.Months, dst.Groups, dst.Size.Dominant = months, groups, dom
			if c, err1 := strconv.Atoi(dst.Copies); err1 == nil {
				if n, err2 := strconv.Atoi(dom); err2 == nil && n > 0 {
					dst.CopiesShare, dst.CopiesWithheld = float64(c)/float64(n), false
				} else {
					dst.CopiesWithheld = true
				}
			}
		} else {
			dst.Months, dst.Groups = nil, nil
			dst.Size.Dominant = "not recomputed"
			dst.SeriesNote = "Other themes were merged into this one. Its monthly series, group shares and narrative count have to be recomputed from the model, and this report was made without doing so."
		}
	}
	for _, st := range c.Statements {
		if st.Kind != Hide {
			continue
		}
		t := d.Themes[idx[st.Theme]]
		d.Hidden = append(d.Hidden, HiddenTheme{ID: t.ID, Label: t.Label, Line: fmt.Sprintf("%s:%d", c.File, st.Pos.Line), Size: t.Size})
		remove[st.Theme] = true
		if i, ok := leaf[st.Theme]; ok {
			d.Tree.Leaves[i].Label = t.Label + " (hidden)"
		}
	}
	d.Themes = slices.DeleteFunc(d.Themes, func(t Theme) bool { return remove[t.ID] })
	d.Curation = CurationNote{File: c.File, Statements: len(c.Statements)}
	return nil
}

// mergeCopies adds src's count of narratives in repeated-text groups to dst's. Both are
// published counts; when either is withheld (e.g. "<10") the sum would reveal or guess at
// it, so the merged count is withheld too. The share is set again once the merged theme's
// narrative count is known (recompute), and withheld otherwise.
func mergeCopies(dst, src *Theme) {
	if dst.Copies == "" && src.Copies == "" {
		return
	}
	a, errA := strconv.Atoi(dst.Copies)
	b, errB := strconv.Atoi(src.Copies)
	if errA != nil || errB != nil {
		dst.Copies, dst.CopiesWithheld = "withheld", true
		return
	}
	dst.Copies = strconv.Itoa(a + b)
	dst.CopiesWithheld = true // until the merged theme's count is recomputed
}

func appendNew(dst, src []string) []string {
	for _, w := range src {
		if !slices.Contains(dst, w) {
			dst = append(dst, w)
		}
	}
	return dst
}
