package redact

import (
	"strings"
	"testing"
	"unicode/utf8"
)

// leaks returns the span texts still present in out, outside placeholders, as whole words.
func leaks(out string, spans []Span) []string {
	stripped := placeholderRe.ReplaceAllString(out, "\x00")
	var bad []string
	for _, s := range spans {
		if len(s.Text) < 2 {
			continue
		}
		for i := 0; ; {
			j := strings.Index(stripped[i:], s.Text)
			if j < 0 {
				break
			}
			at := i + j
			if boundedAt(stripped, at, at+len(s.Text)) {
				bad = append(bad, s.Text)
				break
			}
			i = at + 1
		}
	}
	return bad
}

// FuzzRedact checks that Redact never panics, returns well-formed spans, never leaves a
// replaced text in its output, and is idempotent.
func FuzzRedact(f *testing.F) {
	docs, listed := generate(3, 40)
	for _, d := range docs {
		f.Add(d.text)
	}
	for _, s := range []string{
		"", "[NAME-1]", "Mr. [NAME-1] Quosby", "Victim Ann Lee, DOB 1/2/90", "plate 12 [NAME-12]",
		"Smith Smith Smith", "call 555-555-0123x", "VIN 1M8GDM9AXKP042788", "Mr. NAME", "ssn 123456789",
		"123 Elm St and 4th Ave / Oak Rd", "a.k.a. Zed", "\xff\xfe Mr. \xff", "Dr. Dr. Dr.",
	} {
		f.Add(s)
	}
	r := mustNew(f, Options{Names: append(listed[:5:5], "Tobin Marsh"), Allow: []string{"Elm"}})
	f.Fuzz(func(t *testing.T, in string) {
		out, spans := r.Redact(in)
		prev := 0
		for _, s := range spans {
			if s.Start < prev || s.End > len(in) || s.Start >= s.End || in[s.Start:s.End] != s.Text {
				t.Fatalf("bad span %+v in %q", s, in)
			}
			prev = s.End
		}
		if bad := leaks(out, spans); len(bad) > 0 && utf8.ValidString(in) {
			t.Fatalf("leaked %q\nin:  %q\nout: %q", bad, in, out)
		}
		if again, sp := r.Redact(out); again != out {
			t.Fatalf("not idempotent\nin:  %q\nout: %q\nout2: %q (%v)", in, out, again, sp)
		}
	})
}
