package redact

import "strings"

// Blank returns text with every placeholder this package writes ([NAME-1], [PHONE] ...)
// replaced by as many spaces as it has bytes. Byte offsets into the result are offsets into
// text, so a model can read redacted narratives without learning the placeholders as words
// while highlights still point into the text people read.
func Blank(text string) string {
	locs := placeholderRe.FindAllStringIndex(text, -1)
	if len(locs) == 0 {
		return text
	}
	var b strings.Builder
	b.Grow(len(text))
	prev := 0
	for _, l := range locs {
		b.WriteString(text[prev:l[0]])
		b.WriteString(strings.Repeat(" ", l[1]-l[0]))
		prev = l[1]
	}
	b.WriteString(text[prev:])
	return b.String()
}
