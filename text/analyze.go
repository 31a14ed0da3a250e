package text

import (
	"undercurrent/stopwords"
)

// Analyze normalises and tokenizes one narrative and applies the token policies and the
// abbreviation table of s (no stopwords, stemming, repair or phrases: those are corpus-level,
// see Build and Frozen). Every token's Start and End index raw. It never panics, whatever
// the input (see FuzzAnalyze).
func Analyze(raw string, s Settings) []Token {
	var sc scanner
	return analyze(&sc, NewAbbrev(!s.Abbrev.NoShipped, s.Abbrev.User), s.Tokens, raw, nil)
}

func analyze(sc *scanner, ab *Abbrev, ts TokenSettings, raw string, dst []Token) []Token {
	sc.scan(raw, ts.KeepPossessive)
	for _, t := range sc.toks {
		start, end := sc.nb.rawSpan(int(t.s), int(t.e))
		text := string(sc.text[t.a:t.b])
		expand(ts, ab, text, t.kind, func(w string, protected bool) {
			dst = append(dst, Token{Text: w, Start: start, End: end, Kind: t.kind, Protected: protected})
		})
	}
	return dst
}

// Filter is one step of a token pipeline. Filter may reuse and compact the slice it is given
// (as bleve's token filters do) and returns the tokens that remain.
type Filter interface {
	Filter(tokens []Token) []Token
}

// Pipeline runs filters in order.
type Pipeline []Filter

// Run applies every filter of p to tokens in turn.
func (p Pipeline) Run(tokens []Token) []Token {
	for _, f := range p {
		tokens = f.Filter(tokens)
	}
	return tokens
}

// StopFilter removes unprotected tokens found in a stopword set or shorter than MinLength
// characters.
type StopFilter struct {
	Set       *stopwords.Set
	MinLength int
}

// NewStopFilter returns a StopFilter.
func NewStopFilter(set *stopwords.Set, minLength int) *StopFilter {
	return &StopFilter{Set: set, MinLength: minLength}
}

// Filter compacts tokens in place.
func (f *StopFilter) Filter(tokens []Token) []Token {
	j := 0
	for _, t := range tokens {
		if t.Protected || keepWord(f.Set, f.MinLength, t.Text) {
			tokens[j] = t
			j++
		}
	}
	return tokens[:j]
}

// StemFilter replaces the Text of unprotected tokens by its Snowball English stem (StemWord),
// memoised. It is not safe for concurrent use.
type StemFilter struct {
	cache *stemCache
}

// NewStemFilter returns a StemFilter with an empty cache.
func NewStemFilter() *StemFilter { return &StemFilter{cache: newStemCache(0)} }

// Filter stems tokens in place.
func (f *StemFilter) Filter(tokens []Token) []Token {
	for i := range tokens {
		if !tokens[i].Protected {
			tokens[i].Text = f.cache.stem(tokens[i].Text)
		}
	}
	return tokens
}
