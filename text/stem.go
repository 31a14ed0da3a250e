package text

import (
	"strings"

	"github.com/kljensen/snowball/english"
)

// StemWord returns the English (Porter2) Snowball stem of a lowercased word, with a trailing
// possessive "'s" stripped first. The kljensen/snowball stemmer checks Porter2's exception
// words before it strips "'s" (earring's → ear), so we strip it ourselves (see LIBNOTES).
// english.Stem is called with stemStopWords=true: stopwords are removed by our own step.
func StemWord(w string) string {
	if len(w) > 2 && strings.HasSuffix(w, "'s") {
		w = w[:len(w)-2]
	}
	return english.Stem(w, true)
}

// stemCache memoises StemWord. It is not safe for concurrent use.
type stemCache map[string]string

func (c stemCache) stem(w string) string {
	if s, ok := c[w]; ok {
		return s
	}
	s := StemWord(w)
	c[w] = s
	return s
}

// stemRaw is the library call without our possessive step (tests only compare with it).
func stemRaw(w string) string { return english.Stem(w, true) }
