package sentences

import (
	"bytes"
	"hash/fnv"
	"reflect"
	"strings"
	"testing"
	"unicode"
	"unicode/utf8"
)

// toks is a stand-in tokenizer for these tests: runs of letters, digits and the inner
// characters of decimals, times and codes ("3.5", "9:45", "10-50"), plus an absorbed "a.m." or
// "p.m." after a time, as package text's tokenizer reads them.
func toks(s string) []Token {
	var out []Token
	b := []byte(s)
	isW := func(r rune) bool { return unicode.IsLetter(r) || unicode.IsDigit(r) || r == '\'' }
	for i := 0; i < len(b); {
		r, n := utf8.DecodeRune(b[i:])
		if !isW(r) {
			i += n
			continue
		}
		j := i
		for j < len(b) {
			r, n := utf8.DecodeRune(b[j:])
			if isW(r) {
				j += n
				continue
			}
			if (r == '.' || r == ':' || r == '-' || r == ',') && j > i && j+1 < len(b) && b[j-1] >= '0' && b[j-1] <= '9' && b[j+1] >= '0' && b[j+1] <= '9' {
				j++
				continue
			}
			break
		}
		if strings.Contains(string(b[i:j]), ":") {
			for _, m := range []string{" a.m.", " p.m."} {
				if strings.HasPrefix(string(b[j:]), m) {
					j += len(m)
				}
			}
		}
		out = append(out, Token{Start: i, End: j, Lower: bytes.ToLower(b[i:j])})
		i = j
	}
	return out
}

// sentencesOf cuts s with Starts and returns the sentences' texts (from a sentence's first token
// to its last).
func sentencesOf(s string) []string {
	tk := toks(s)
	st := Starts(nil, []byte(s), tk)
	var out []string
	for k, lo := range st {
		hi := len(tk)
		if k+1 < len(st) {
			hi = st[k+1]
		}
		out = append(out, s[tk[lo].Start:tk[hi-1].End])
	}
	return out
}

// TestStarts: the boundary rule of the package documentation, case by case. Expected values
// are worked by hand from that rule; which boundaries a careful reader would draw is common
// practice (English punctuation), and the cases a rule-based cutter gets wrong are marked.
func TestStarts(t *testing.T) {
	cases := []struct {
		name, in string
		want     []string
	}{
		{"full stops", "Checked the area. All clear. No further action.",
			[]string{"Checked the area", "All clear", "No further action"}},
		{"! ? ;", "Shots fired! Anyone hurt? None; units cleared",
			[]string{"Shots fired", "Anyone hurt", "None", "units cleared"}},
		{"a.m. inside a time, mid-sentence", "At 9:45 a.m. on Monday the alarm sounded.",
			[]string{"At 9:45 a.m. on Monday the alarm sounded"}},
		// The time token "9:45 a.m." ends in its own full stop, so a capital after it cuts.
		{"a.m. inside a time, end of sentence", "Arrived at 9:45 a.m. Checked the area.",
			[]string{"Arrived at 9:45 a.m.", "Checked the area"}},
		{"p.m. alone, mid-sentence", "in the p.m. hours it rained. Then cleared.",
			[]string{"in the p.m. hours it rained", "Then cleared"}},
		{"a.m. alone before a capital", "Arrived at 9 a.m. Checked the area.",
			[]string{"Arrived at 9 a.m", "Checked the area"}},
		{"approx.", "Approx. 5 ft tall. Fled north.", []string{"Approx. 5 ft tall", "Fled north"}},
		{"titles and streets", "Sgt. Vale met Ofc. Reed on Main St. near the bridge. Done.",
			[]string{"Sgt. Vale met Ofc. Reed on Main St. near the bridge", "Done"}},
		{"No. before a number", "Unit No. 5 responded. No. Nothing found.",
			[]string{"Unit No. 5 responded", "No", "Nothing found"}},
		{"decimals", "BAC was 0.08. Released.", []string{"BAC was 0.08", "Released"}},
		{"10-50 codes", "Responded to a 10-50. Code 4, 10-8. Call cleared.",
			[]string{"Responded to a 10-50", "Code 4, 10-8", "Call cleared"}},
		{"line breaks", "Checked the area\nAll clear\r\nNo further action",
			[]string{"Checked the area", "All clear", "No further action"}},
		{"no space after the stop", "see e.g.the log", []string{"see e.g.the log"}},
		{"full stop after a space", "went home . then left", []string{"went home", "then left"}},
		{"ellipsis", "He said... never mind", []string{"He said", "never mind"}},
		{"initials before a capital (a known miss: cut)", "Seen by J. Doe.", []string{"Seen by J", "Doe"}},
		{"colon and comma never cut", "Disposition: cleared, no report", []string{"Disposition: cleared, no report"}},
		{"empty", "", nil},
		{"one token", "Yes.", []string{"Yes"}},
	}
	for _, c := range cases {
		got := sentencesOf(c.in)
		if !reflect.DeepEqual(got, c.want) {
			t.Errorf("%s: %q\n got  %q\n want %q", c.name, c.in, got, c.want)
		}
	}
}

// TestHash: Hash of a key equals adding its words one by one, and is FNV-1a 64 (checked
// against the standard library's hash/fnv New64a) of the key followed by one space.
func TestHash(t *testing.T) {
	for _, key := range []string{"no further action", "employee [number] was killed", "x", ""} {
		h := Start
		for _, w := range strings.Fields(key) {
			h = Add(h, []byte(w))
		}
		ref := fnv.New64a()
		ref.Write([]byte(key + " "))
		if key == "" {
			h = Add(Start, nil)
		}
		if got := Hash(key); got != h || got != ref.Sum64() {
			t.Errorf("%q: Hash %x, words %x, hash/fnv %x", key, got, h, ref.Sum64())
		}
	}
}

// TestThreshold: the larger of the two rules, the share rounded up (worked by hand).
func TestThreshold(t *testing.T) {
	cases := []struct {
		docs, min int
		share     float64
		want      int
	}{
		{4847, 20, 0.005, 25}, // 24.235 rounds up to 25
		{2394, 20, 0.005, 20}, // 11.97 < 20
		{6000, 20, 0.005, 30}, // exactly 30
		{10, 1, 0.0001, 2},    // never below 2
		{100000, 20, 0.005, 500},
	}
	for _, c := range cases {
		if got := Threshold(c.docs, c.min, c.share); got != c.want {
			t.Errorf("Threshold(%d, %d, %v) = %d, want %d", c.docs, c.min, c.share, got, c.want)
		}
	}
}

// FuzzStarts: segmentation never panics, starts with token 0, is strictly increasing, and
// every boundary indexes the tokens (and so the text), whatever the text and spans.
func FuzzStarts(f *testing.F) {
	for _, s := range []string{"", ".", "a.", "a. B", "9:45 a.m. X", "No. 5", "Approx.", "x\ny", "é. É", "\xff. \xfe",
		"Checked the area, all clear. No further action.", "10-50. Code 4, 10-8.", "a.m.p.m..."} {
		f.Add(s, uint8(0))
	}
	f.Fuzz(func(t *testing.T, s string, skew uint8) {
		tk := toks(s)
		// Skewed spans (End past the text, Start after End) must not panic either.
		if skew > 0 && len(tk) > 0 {
			k := int(skew) % len(tk)
			tk[k].End += int(skew)
		}
		st := Starts(nil, []byte(s), tk)
		if len(tk) == 0 {
			if len(st) != 0 {
				t.Fatalf("%q: starts %v without tokens", s, st)
			}
			return
		}
		if st[0] != 0 {
			t.Fatalf("%q: first start %d", s, st[0])
		}
		for i := 1; i < len(st); i++ {
			if st[i] <= st[i-1] || st[i] >= len(tk) {
				t.Fatalf("%q: starts %v not increasing within %d tokens", s, st, len(tk))
			}
		}
		if skew == 0 {
			for _, i := range st {
				if tk[i].Start < 0 || tk[i].Start > len(s) {
					t.Fatalf("%q: boundary at byte %d outside the text", s, tk[i].Start)
				}
			}
		}
	})
}
