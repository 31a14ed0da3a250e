package text

import (
	"unicode/utf8"

	"undercurrent/stopwords"
)

// lexWord is one word a surface token becomes: its normalised word (after abbreviation
// expansion), its vocabulary key (the stem, or the word itself when protected) and whether it
// is protected.
type lexWord struct {
	word, stem string
	protected  bool
}

// lexer applies, to one token at a time, the per-token steps shared by Build and
// Frozen.Transform: kind policy, abbreviation expansion, stopwords, minimum length, stemming.
// It is not safe for concurrent use.
type lexer struct {
	tok     TokenSettings
	stemOff bool
	abbrev  *Abbrev
	stop    *stopwords.Set
	stems   *stemCache
	buf     []lexWord
}

func newLexer(s *Settings) (*lexer, error) {
	stop, err := stopSet(s.Stop)
	if err != nil {
		return nil, err
	}
	return &lexer{
		tok:     s.Tokens,
		stemOff: s.Stem.Off,
		abbrev:  NewAbbrev(!s.Abbrev.NoShipped, s.Abbrev.User),
		stop:    stop,
		stems:   newStemCache(0),
	}, nil
}

// Set builds the stopword set s describes: the named lists plus user words, minus keep
// words. It returns an error for an unknown list name.
func (s StopSettings) Set() (*stopwords.Set, error) { return stopSet(s) }

// fork returns a lexer for another goroutine: it shares lx's tables, reads lx's stem cache
// as a base (lx must not be used until the forks are done) and keeps its own additions.
func (lx *lexer) fork() *lexer {
	c := *lx
	c.buf = nil
	base := lx.stems.own
	if lx.stems.base != nil {
		panic("text: fork of a forked lexer")
	}
	c.stems = &stemCache{base: base, own: make(map[string]string)}
	return &c
}

// stopSet builds the stopword set of s: the named lists plus user words, minus keep words.
func stopSet(s StopSettings) (*stopwords.Set, error) {
	set := stopwords.New()
	for _, name := range s.Lists {
		l, err := stopwords.Named(name)
		if err != nil {
			return nil, err
		}
		set.Union(l)
	}
	for _, w := range s.User {
		set.Add(w)
	}
	if len(s.Keep) > 0 {
		keep := stopwords.New(s.Keep...)
		out := stopwords.New()
		for _, w := range set.Words() {
			if !keep.Has(w) {
				out.Add(w)
			}
		}
		set = out
	}
	return set, nil
}

var placeholders = [...]string{Number: "_number_", Time: "_time_", Date: "_date_", Code: "_code_"}

func (t TokenSettings) policy(k Kind) Policy {
	switch k {
	case Number:
		return t.Numbers
	case Time:
		return t.Times
	case Date:
		return t.Dates
	case Code:
		return t.Codes
	}
	return Keep
}

// expand applies the kind policy and abbreviation expansion to one token, calling emit for
// each resulting word. It reports whether an abbreviation was expanded.
func expand(tok TokenSettings, ab *Abbrev, text string, kind Kind, emit func(word string, protected bool)) bool {
	if kind != Word {
		switch tok.policy(kind) {
		case Keep:
			emit(text, true)
		case Placeholder:
			emit(placeholders[kind], true)
		}
		return false
	}
	if e, ok := ab.Lookup(text); ok {
		for _, w := range e {
			emit(w, false)
		}
		return true
	}
	emit(text, false)
	return false
}

// keepWord reports whether an unprotected word survives stopwords and the minimum length.
func keepWord(stop *stopwords.Set, minLen int, w string) bool {
	if stop.Has(w) {
		return false
	}
	return minLen <= 1 || utf8.RuneCountInString(w) >= minLen
}

// lex returns the words a token becomes (nil when it is removed) and whether an abbreviation
// was expanded. The result aliases the lexer's buffer.
func (lx *lexer) lex(text string, kind Kind) ([]lexWord, bool) { return lx.lexHint(text, kind, "") }

// lexHint is lex with the stem of text itself already known (stem, or "" when not known).
func (lx *lexer) lexHint(text string, kind Kind, stem string) ([]lexWord, bool) {
	lx.buf = lx.buf[:0]
	exp := expand(lx.tok, lx.abbrev, text, kind, func(w string, protected bool) {
		if protected {
			lx.buf = append(lx.buf, lexWord{w, w, true})
			return
		}
		if !keepWord(lx.stop, lx.tok.MinLength, w) {
			return
		}
		st := w
		if !lx.stemOff {
			if stem != "" && w == text {
				st = stem
			} else {
				st = lx.stems.stem(w)
			}
		}
		lx.buf = append(lx.buf, lexWord{w, st, false})
	})
	return lx.buf, exp
}
