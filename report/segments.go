package report

import (
	"cmp"
	"fmt"
	"slices"
	"unicode/utf8"
)

// Span is a byte range [Start, End) of a narrative, e.g. a token's offsets from the
// text pipeline.
type Span struct {
	Start, End int
}

// Highlight cuts text into segments, marking the bytes inside spans as hits (the theme's
// words). Spans may come in any order and may overlap or touch; they are merged. Joining
// the segments' Text gives text back. It returns an error when a span lies outside text,
// is reversed, or does not start and end on a UTF-8 character boundary.
func Highlight(text string, spans []Span) ([]Segment, error) {
	sp := slices.Clone(spans)
	slices.SortFunc(sp, func(a, b Span) int {
		if c := cmp.Compare(a.Start, b.Start); c != 0 {
			return c
		}
		return cmp.Compare(a.End, b.End)
	})
	boundary := func(i int) bool {
		return i == 0 || i == len(text) || utf8.RuneStart(text[i])
	}
	var out []Segment
	at := 0
	for _, s := range sp {
		if s.Start < 0 || s.End > len(text) || s.Start > s.End {
			return nil, fmt.Errorf("report: span %d..%d outside the text (%d bytes) or reversed", s.Start, s.End, len(text))
		}
		if !boundary(s.Start) || !boundary(s.End) {
			return nil, fmt.Errorf("report: span %d..%d cuts a UTF-8 character", s.Start, s.End)
		}
		if s.Start == s.End {
			continue
		}
		start := max(s.Start, at)
		if start >= s.End {
			continue // inside the previous span
		}
		if start > at {
			out = append(out, Segment{Text: text[at:start]})
		}
		if n := len(out); n > 0 && out[n-1].Hit && start == at {
			out[n-1].Text += text[start:s.End] // touching or overlapping: extend
		} else {
			out = append(out, Segment{Text: text[start:s.End], Hit: true})
		}
		at = s.End
	}
	if at < len(text) {
		out = append(out, Segment{Text: text[at:]})
	}
	return out, nil
}
