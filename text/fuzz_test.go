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

// fusedMatches checks that the scanner's fused mode (Build's first pass: intern while
// scanning) gives the same token texts, kinds and breaks as the plain scan that Analyze and
// Transform read.
func fusedMatches(t *testing.T, raw string, keepPossessive bool) {
	var plain, fused scanner
	plain.scan(raw, keepPossessive)
	var want []string
	for _, tk := range plain.toks {
		if tk.brk && len(want) > 0 && want[len(want)-1] != "|" {
			want = append(want, "|")
		}
		want = append(want, string(plain.text[tk.a:tk.b]))
	}
	fused.in = newInternTable(16)
	fused.scan(raw, keepPossessive)
	if fused.ntok != len(plain.toks) || len(fused.ids) != len(want) {
		t.Fatalf("%q: fused %d tokens %d ids, plain %d tokens %v", raw, fused.ntok, len(fused.ids), len(plain.toks), want)
	}
	for i, id := range fused.ids {
		if id < 0 {
			if want[i] != "|" {
				t.Fatalf("%q: fused break at %d, plain %v", raw, i, want)
			}
			continue
		}
		sf := fused.surfs[id]
		if sf.text != want[i] {
			t.Fatalf("%q: fused token %d %q, plain %q", raw, i, sf.text, want[i])
		}
		if want := firstKind(plain, sf.text); sf.kind != want {
			t.Fatalf("%q: fused kind %v for %q, plain %v", raw, sf.kind, sf.text, want)
		}
	}
}

// firstKind is the kind of the first plain token with text w (a surface keeps the kind of its
// first occurrence).
func firstKind(sc scanner, w string) Kind {
	for _, tk := range sc.toks {
		if string(sc.text[tk.a:tk.b]) == w {
			return tk.kind
		}
	}
	return Kind(255)
}

// FuzzFusedScan: the fused scan agrees with the plain scan on any input.
func FuzzFusedScan(f *testing.F) {
	for _, s := range []string{"", "a", "resi-\ndence", "9:45 a.m. 10th 1st", "w/ w/o n/a", "don't driver's",
		"RP's veh w/ GOA&nbsp;<br />OK", "Ab-\ncD e\u0301 ﬁ 10-50 8/10/2017 3.5 1,250 x.y a--b"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, raw string) {
		fusedMatches(t, raw, false)
		fusedMatches(t, raw, true)
	})
}

// TestFusedScanCorpora runs the fused-scan check on the generated corpus and the OSHA
// abstracts.
func TestFusedScanCorpora(t *testing.T) {
	docs := genCorpus(2000, 5)
	if oshaPath != "" {
		docs = append(docs, loadOSHA(t, 2000)...)
	}
	for _, d := range docs {
		fusedMatches(t, d, false)
	}
}
