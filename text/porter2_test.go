package text

import (
	"bufio"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"github.com/kljensen/snowball/english"
)

// TestPorter2MatchesLibrary checks the byte-level stemmer (stemASCII) against the library it
// copies, github.com/kljensen/snowball v0.10.0 english.Stem(w, true), word for word on: the
// Snowball project's sample vocabulary (../shared/refdata/snowball-english/voc.txt, 42,649
// words), the words of the Debian python3-snowballstemmer fixture (testdata/snowball_debian.tsv),
// every word token of the OSHA abstracts and of the generated benchmark corpus, and 200,000
// seeded random strings over letters and apostrophes (suffixes are drawn from the stemmer's
// own lists so that the rare branches are reached).
func TestPorter2MatchesLibrary(t *testing.T) {
	words := map[string]bool{}
	addFile := func(path string, tsv bool) int {
		f, err := os.Open(path)
		if err != nil {
			return 0
		}
		defer f.Close()
		n := 0
		sc := bufio.NewScanner(f)
		for sc.Scan() {
			w := sc.Text()
			if tsv {
				if strings.HasPrefix(w, "#") {
					continue
				}
				w, _, _ = strings.Cut(w, "\t")
			}
			words[w] = true
			n++
		}
		return n
	}
	if p := sharedPath("refdata/snowball-english/voc.txt"); p != "" {
		if n := addFile(p, false); n != 42649 {
			t.Errorf("voc.txt: read %d words, want 42649", n)
		}
	} else {
		t.Log("Snowball sample vocabulary not found: checked without it")
	}
	if n := addFile("testdata/snowball_debian.tsv", true); n < 4000 {
		t.Errorf("Debian fixture: only %d words", n)
	}
	var sc scanner
	docs := genCorpus(3000, 1)
	if oshaPath != "" {
		docs = append(docs, loadOSHA(t, 0)...)
	}
	for _, d := range docs {
		sc.scan(d, true)
		for _, tk := range sc.toks {
			if tk.kind == Word {
				words[string(sc.text[tk.a:tk.b])] = true
			}
		}
	}
	r := rand.New(rand.NewPCG(7, 7))
	const letters = "abcdefghijklmnopqrstuvwxyyyeeaio'"
	suffixes := []string{"ational", "fulness", "iveness", "ization", "ousness", "biliti", "lessli", "tional",
		"alism", "aliti", "ation", "entli", "fulli", "iviti", "ousli", "anci", "abli", "alli", "ator", "enci",
		"izer", "bli", "ogi", "li", "alize", "icate", "ative", "iciti", "ical", "ful", "ness", "ement", "ance",
		"ence", "able", "ible", "ment", "ent", "ant", "ism", "ate", "iti", "ous", "ive", "ize", "ion", "al",
		"er", "ic", "eedly", "ingly", "edly", "ing", "eed", "ed", "sses", "ied", "ies", "us", "ss", "s",
		"'s'", "'s", "'", "y", "e", "ll", "at", "bl", "iz", "bb", "tt", "ly", "sion", "tion"}
	prefixes := []string{"", "", "gener", "commun", "arsen", "y", "ay"}
	var b strings.Builder
	for i := 0; i < 200000; i++ {
		b.Reset()
		b.WriteString(prefixes[r.IntN(len(prefixes))])
		for k := r.IntN(7); k > 0; k-- {
			b.WriteByte(letters[r.IntN(len(letters))])
		}
		for k := r.IntN(3); k > 0; k-- {
			b.WriteString(suffixes[r.IntN(len(suffixes))])
		}
		words[b.String()] = true
	}
	fast, bad := 0, 0
	for w := range words {
		got, ok := stemASCII(w)
		if !ok {
			continue
		}
		fast++
		if want := english.Stem(w, true); got != want {
			bad++
			if bad <= 20 {
				t.Errorf("stemASCII(%q) = %q, library %q", w, got, want)
			}
		}
	}
	if bad > 0 {
		t.Errorf("%d of %d words differ", bad, fast)
	}
	if fast < 200000 {
		t.Errorf("only %d words took the fast path", fast)
	}
	t.Logf("%d words, %d on the fast path, all agree", len(words), fast)
}

// Words the fast path leaves to the library (their stems are the library's by construction).
func TestPorter2Fallback(t *testing.T) {
	for _, w := range []string{"Vehicle", "café", "'tis", " ran", "naïve", strings.Repeat("a", porter2Max+1)} {
		if _, ok := stemASCII(w); ok {
			t.Errorf("stemASCII(%q): took the fast path", w)
		}
		if got, want := StemWord(w), english.Stem(w, true); got != want {
			t.Errorf("StemWord(%q) = %q, library %q", w, got, want)
		}
	}
}

func BenchmarkStem(b *testing.B) {
	var words []string
	var sc scanner
	seen := map[string]bool{}
	for _, d := range genCorpus(2000, 3) {
		sc.scan(d, false)
		for _, tk := range sc.toks {
			if w := string(sc.text[tk.a:tk.b]); tk.kind == Word && !seen[w] {
				seen[w] = true
				words = append(words, w)
			}
		}
	}
	b.Run("library", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			for _, w := range words {
				english.Stem(w, true)
			}
		}
		b.ReportMetric(float64(b.N*len(words))/b.Elapsed().Seconds(), "words/s")
	})
	b.Run("bytes", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			for _, w := range words {
				StemWord(w)
			}
		}
		b.ReportMetric(float64(b.N*len(words))/b.Elapsed().Seconds(), "words/s")
	})
}
