package text

import (
	"testing"
	"unicode/utf8"
)

// FuzzAnalyze: normalisation and tokenizing never panic, every token's offsets index the
// original text (0 <= Start <= End <= len(raw)) in order, and token texts are valid UTF-8.
func FuzzAnalyze(f *testing.F) {
	seeds := []string{
		"", "a", "&", "&#", "&#x;", "&#99999999;", "&amp;nbsp;", "<", "<b", "<!--", "<!-- x -->y",
		"resi-\ndence", "a-\r\n b", "-\n", "9:45 a.m.", "9:4", "1,", "1,2,3", "10-50-", "8/10/",
		"w/", "w/o", "n/a/b", "don't'", "''s", "x's", "\xff\xfe", "e\u0301", "\u0301x", "ﬁ", "ｆ",
		"\u00ad\u200b", "“Don’t” — x", "A\u2028B", "RP's veh w/ GOA&nbsp;<br />OK",
		"At 9:00 a.m. on August 10, 2017, an employee's hand was caught.",
		"ﬁw/:<ṕ-&é:", // once panicked: the NFKC iterator emitted a segment without advancing
	}
	for _, s := range seeds {
		f.Add(s)
	}
	s := DefaultSettings()
	s.Tokens.Numbers, s.Tokens.Times, s.Tokens.Dates, s.Tokens.Codes = Keep, Placeholder, Keep, Keep
	f.Fuzz(func(t *testing.T, raw string) {
		toks := Analyze(raw, s)
		prev := 0
		for _, tk := range toks {
			if tk.Start < 0 || tk.End > len(raw) || tk.Start > tk.End {
				t.Fatalf("token %+v outside [0,%d] of %q", tk, len(raw), raw)
			}
			if tk.Start < prev {
				t.Fatalf("token %+v starts before the previous one (%d) in %q", tk, prev, raw)
			}
			prev = tk.Start
			if tk.Text == "" || !utf8.ValidString(tk.Text) {
				t.Fatalf("bad token text %q in %q", tk.Text, raw)
			}
		}
		_ = Normalize(raw)
	})
}
