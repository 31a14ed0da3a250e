package text

import (
	"strings"

	"github.com/kljensen/snowball/english"
)

// StemWord returns the English (Porter2) Snowball stem of a lowercased word, with a trailing
// possessive "'s" stripped first. The kljensen/snowball stemmer checks Porter2's exception
// words before it strips "'s" (earring's → ear), so we strip it ourselves (see LIBNOTES).
// english.Stem is called with stemStopWords=true: stopwords are removed by our own step.
// Lower-case ASCII words go through stemASCII, a byte-level copy of the library's rules that
// gives the same stems without its rune conversions (porter2.go).
func StemWord(w string) string {
	if len(w) > 2 && strings.HasSuffix(w, "'s") {
		w = w[:len(w)-2]
	}
	if st, ok := stemASCII(w); ok {
		return st
	}
	return english.Stem(w, true)
}

// stemCache memoises StemWord: base is a shared read-only table (may be nil), own the
// cache's private additions. Forks share base, so stemming may run on several goroutines,
// each with its own stemCache.
type stemCache struct {
	base, own map[string]string
}

func newStemCache(size int) *stemCache { return &stemCache{own: make(map[string]string, size)} }

func (c *stemCache) stem(w string) string {
	if s, ok := c.base[w]; ok {
		return s
	}
	if s, ok := c.own[w]; ok {
		return s
	}
	s := StemWord(w)
	c.own[w] = s
	return s
}

// stemRaw is the library call without our possessive step (tests only compare with it).
func stemRaw(w string) string { return english.Stem(w, true) }
