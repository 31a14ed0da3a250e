package redact

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Counts tallies spans per type. Index it with a Type; Counts[0] is unused.
type Counts [numTypes]int

// Add counts spans into c.
func (c *Counts) Add(spans []Span) {
	for _, s := range spans {
		if s.Type > 0 && s.Type < numTypes {
			c[s.Type]++
		}
	}
}

// Total returns the number of spans counted.
func (c *Counts) Total() int {
	n := 0
	for _, v := range c[1:] {
		n += v
	}
	return n
}

// Of returns the count for t.
func (c *Counts) Of(t Type) int {
	if t == 0 || t >= numTypes {
		return 0
	}
	return c[t]
}

// String lists the non-zero counts in type order, such as "name=3 phone=1".
func (c *Counts) String() string {
	var b strings.Builder
	for _, t := range AllTypes() {
		if c[t] == 0 {
			continue
		}
		if b.Len() > 0 {
			b.WriteByte(' ')
		}
		fmt.Fprintf(&b, "%s=%d", t, c[t])
	}
	return b.String()
}

// IsPrivateName reports whether the file name of path (its last element) contains
// "private", ignoring case: the test a caller applies before writing raw or review text to
// path, and before publishing anything.
func IsPrivateName(path string) bool {
	base := path
	if i := strings.LastIndexAny(base, `/\`); i >= 0 {
		base = base[i+1:]
	}
	return strings.Contains(strings.ToLower(base), "private")
}

// ContextBytes is how much text each side of a redaction the review file shows.
const ContextBytes = 40

// ReviewWriter writes the private review file: one CSV row per redaction with the text it
// replaced and ContextBytes of original text either side, so that a person can check each
// one.
//
// The review file holds the very information redaction removes. Give it a file name that
// contains "private" (for example "incidents.private-review.csv"; see IsPrivateName), keep
// it off anything published or shared, and delete it when the check is done.
// NewReviewWriter does not choose or check the name; callers that publish files must refuse
// to publish such a file.
//
// Columns: record, type, start, end, placeholder, before, text, after. Start and end are
// byte offsets into the original narrative. Like csv.Writer, errors are reported by Flush
// and Error.
type ReviewWriter struct {
	w      *csv.Writer
	header bool
}

// NewReviewWriter returns a ReviewWriter writing to w.
func NewReviewWriter(w io.Writer) *ReviewWriter { return &ReviewWriter{w: csv.NewWriter(w)} }

// Write writes one row per span of one narrative. record names the narrative (a row
// number or ID); text is the original narrative the spans refer to.
func (rw *ReviewWriter) Write(record, text string, spans []Span) error {
	if !rw.header {
		rw.header = true
		if err := rw.w.Write([]string{"record", "type", "start", "end", "placeholder", "before", "text", "after"}); err != nil {
			return err
		}
	}
	for _, s := range spans {
		if s.Start < 0 || s.End > len(text) || s.Start > s.End {
			return fmt.Errorf("redact: span %d-%d outside narrative %q of %d bytes", s.Start, s.End, record, len(text))
		}
		a := runeFloor(text, s.Start-ContextBytes)
		b := runeCeil(text, s.End+ContextBytes)
		row := []string{record, s.Type.String(), strconv.Itoa(s.Start), strconv.Itoa(s.End), s.Placeholder,
			oneLine(text[a:s.Start]), oneLine(text[s.Start:s.End]), oneLine(text[s.End:b])}
		if err := rw.w.Write(row); err != nil {
			return err
		}
	}
	return nil
}

// Flush writes buffered rows and returns any error.
func (rw *ReviewWriter) Flush() error {
	rw.w.Flush()
	return rw.w.Error()
}

// Error returns any error from an earlier Write or Flush.
func (rw *ReviewWriter) Error() error { return rw.w.Error() }

func oneLine(s string) string {
	return strings.Map(func(r rune) rune {
		if r == '\n' || r == '\r' || r == '\t' {
			return ' '
		}
		return r
	}, s)
}

// runeFloor moves i (clamped to [0,len]) back to a rune start.
func runeFloor(s string, i int) int {
	if i <= 0 {
		return 0
	}
	if i >= len(s) {
		return len(s)
	}
	for i > 0 && !utf8.RuneStart(s[i]) {
		i--
	}
	return i
}

// runeCeil moves i (clamped to [0,len]) forward to a rune start.
func runeCeil(s string, i int) int {
	if i >= len(s) {
		return len(s)
	}
	if i < 0 {
		return 0
	}
	for i < len(s) && !utf8.RuneStart(s[i]) {
		i++
	}
	return i
}
