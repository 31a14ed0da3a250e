package redact

import (
	"strings"
	"sync"
	"unicode"
	"unicode/utf8"
)

type tokKind uint8

const (
	tWord  tokKind = iota + 1 // letters, with inner apostrophes or hyphens
	tNum                      // digits
	tPunct                    // one other non-space character
)

type tok struct {
	start, end int
	kind       tokKind
	nl         int // newlines between the previous token and this one
}

// doc is one narrative being scanned.
type doc struct {
	text      string // the narrative as detectors read it (see htmlView)
	orig      string // the narrative as given
	r         *Redactor
	masks     [][]int
	toks      []tok
	lower     []string         // lower-case text of each word token ("" for others)
	flags     []lexFlag        // lexicon flags of each word token
	wordIndex map[string][]int // maximal letter-or-digit runs → their starts; see index
	runs17    []int            // starts of letter-or-digit runs of exactly 17 bytes (VIN-shaped)
	caps      bool             // the narrative is written mostly in capitals
	allowIv   intervals
	memo      *scanMemo // pattern matches of earlier passes; may be nil
	scratch   []int     // see shifted
	bufs      *docBufs  // arrays to reuse for toks, lower and flags; may be nil
	valid     uint8     // 1: text is valid UTF-8, 2: it is not, 0: not yet known
}

// docBufs holds the token arrays of a finished pass for the next one (of any narrative):
// a pass allocates them in proportion to the text, and that was most of the bytes Redact
// allocated. Nothing a pass returns refers to them.
type docBufs struct {
	toks  []tok
	lower []string
	flags []lexFlag
}

var docPool = sync.Pool{New: func() any { return new(docBufs) }}

// release gives d's token arrays back to docPool; d must not be used after it.
func (d *doc) release() {
	b := d.bufs
	if b == nil {
		return
	}
	d.bufs = nil
	// keep arrays of ordinary size only, so one huge narrative does not pin its arrays.
	if cap(d.toks) <= 1<<14 && cap(d.lower) <= 1<<14 {
		clear(d.lower) // drop references to the text
		b.toks, b.lower, b.flags = d.toks[:0], d.lower[:0], d.flags[:0]
		docPool.Put(b)
	}
}

func (d *doc) tokenize() {
	text := d.text
	upper, letters := 0, 0
	nl := 0
	if d.toks == nil {
		if d.bufs != nil && cap(d.bufs.toks) > 0 {
			d.toks = d.bufs.toks[:0]
		} else {
			d.toks = make([]tok, 0, len(text)/4+1)
		}
	}
	for i := 0; i < len(text); {
		// ASCII fast path; the same classes as the unicode tests below.
		if c := text[i]; c < utf8.RuneSelf {
			switch {
			case c == '\n':
				nl++
				i++
				continue
			case c == ' ' || c == '\t' || c == '\v' || c == '\f' || c == '\r':
				i++
				continue
			case isDigitByte(c):
				j := i + 1
				for j < len(text) && isDigitByte(text[j]) {
					j++
				}
				if j == len(text) || text[j] < utf8.RuneSelf {
					d.toks = append(d.toks, tok{i, j, tNum, nl})
					nl = 0
					i = j
					continue
				}
			case (c < 'A' || c > 'Z') && (c < 'a' || c > 'z'):
				d.toks = append(d.toks, tok{i, i + 1, tPunct, nl})
				nl = 0
				i++
				continue
			}
		}
		r, n := utf8.DecodeRuneInString(text[i:])
		switch {
		case r == '\n':
			nl++
			i += n
		case unicode.IsSpace(r):
			i += n
		case unicode.IsLetter(r):
			j := i
			for j < len(text) {
				if c := text[j]; c < utf8.RuneSelf {
					if c >= 'a' && c <= 'z' {
						letters++
						j++
						continue
					}
					if c >= 'A' && c <= 'Z' {
						letters++
						upper++
						j++
						continue
					}
					if c != '\'' && c != '-' {
						break
					}
				}
				r2, n2 := utf8.DecodeRuneInString(text[j:])
				if unicode.IsLetter(r2) {
					letters++
					if unicode.IsUpper(r2) {
						upper++
					}
					j += n2
					continue
				}
				if r2 == '\'' || r2 == '’' || r2 == '-' {
					r3, _ := utf8.DecodeRuneInString(text[j+n2:])
					if unicode.IsLetter(r3) {
						j += n2
						continue
					}
				}
				break
			}
			d.toks = append(d.toks, tok{i, j, tWord, nl})
			nl = 0
			i = j
		case unicode.IsDigit(r):
			j := i
			for j < len(text) {
				r2, n2 := utf8.DecodeRuneInString(text[j:])
				if !unicode.IsDigit(r2) {
					break
				}
				j += n2
			}
			d.toks = append(d.toks, tok{i, j, tNum, nl})
			nl = 0
			i = j
		default:
			d.toks = append(d.toks, tok{i, i + n, tPunct, nl})
			nl = 0
			i += n
		}
	}
	// letter-or-digit runs of 17 bytes are VIN-shaped.
	for i := 0; i < len(d.toks); {
		j, n := i, 0
		for j < len(d.toks) && d.toks[j].kind != tPunct && (j == i || d.toks[j].start == d.toks[j-1].end) {
			n += d.toks[j].end - d.toks[j].start
			j++
		}
		if j == i {
			i++
			continue
		}
		if n == 17 && d.toks[j-1].end-d.toks[i].start == 17 && isASCII(text[d.toks[i].start:d.toks[j-1].end]) {
			d.runs17 = append(d.runs17, d.toks[i].start)
		}
		i = j
	}
	if b := d.bufs; b != nil && cap(b.lower) >= len(d.toks) && cap(b.flags) >= len(d.toks) {
		d.lower, d.flags = b.lower[:len(d.toks)], b.flags[:len(d.toks)]
		clear(d.lower)
		clear(d.flags)
	} else {
		d.lower = make([]string, len(d.toks))
		d.flags = make([]lexFlag, len(d.toks))
	}
	// lower-case words: ASCII words with capitals are lowered into one buffer (one
	// allocation), words already in lower case are slices of the text, others go through
	// strings.ToLower; all equal strings.ToLower of the word.
	var buf []byte
	type lowered struct{ tok, at int }
	var lw []lowered
	for i, t := range d.toks {
		if t.kind != tWord {
			continue
		}
		w := text[t.start:t.end]
		ascii, hasUpper := true, false
		for k := 0; k < len(w); k++ {
			c := w[k]
			if c >= utf8.RuneSelf {
				ascii = false
				break
			}
			if c >= 'A' && c <= 'Z' {
				hasUpper = true
			}
		}
		switch {
		case !ascii:
			d.lower[i] = strings.ToLower(w)
		case !hasUpper:
			d.lower[i] = w
		default:
			if buf == nil {
				buf = make([]byte, 0, len(text))
			}
			lw = append(lw, lowered{i, len(buf)})
			for k := 0; k < len(w); k++ {
				c := w[k]
				if c >= 'A' && c <= 'Z' {
					c += 'a' - 'A'
				}
				buf = append(buf, c)
			}
		}
	}
	if len(lw) > 0 {
		all := string(buf)
		for _, l := range lw {
			t := d.toks[l.tok]
			d.lower[l.tok] = all[l.at : l.at+t.end-t.start]
		}
	}
	for i, t := range d.toks {
		// most words cannot be in cueFlags by their first byte and length: skip the map.
		if lw := d.lower[i]; t.kind == tWord && len(lw) <= maxCueLen && cueLens[lw[0]]&(1<<len(lw)) != 0 {
			d.flags[i] = cueFlags[lw]
		}
	}
	d.caps = letters >= 12 && upper*10 >= letters*7
	for _, a := range d.r.allow {
		d.matchWords(a, func(s, e int) { d.allowIv.add(s, e) })
	}
}

// word returns the text of token i.
func (d *doc) word(i int) string { return d.text[d.toks[i].start:d.toks[i].end] }

// isPunct reports whether token i is the punctuation s.
func (d *doc) isPunct(i int, s string) bool {
	return i >= 0 && i < len(d.toks) && d.toks[i].kind == tPunct && d.word(i) == s
}

// matchWords calls f for every run of word tokens equal, ignoring case, to ws.
func (d *doc) matchWords(ws []string, f func(s, e int)) {
	for i := range d.toks {
		if d.toks[i].kind != tWord || !strings.EqualFold(d.word(i), ws[0]) {
			continue
		}
		j, k := i, 0
		for k < len(ws) {
			if j >= len(d.toks) || d.toks[j].kind != tWord || !strings.EqualFold(d.word(j), ws[k]) {
				break
			}
			k++
			j++
			// allow one "." after an abbreviation inside a phrase.
			if k < len(ws) && d.isPunct(j, ".") {
				j++
			}
		}
		if k == len(ws) {
			f(d.toks[i].start, d.toks[j-1].end)
		}
	}
}

// allowed reports whether [s,e) overlaps an allow-listed phrase.
func (d *doc) allowed(s, e int) bool { return d.allowIv.overlaps(s, e) }

// wordsOf splits s into its words (letters with inner apostrophes or hyphens).
func wordsOf(s string) []string {
	d := &doc{text: s, r: &Redactor{}}
	d.tokenize()
	var out []string
	for i := range d.toks {
		if d.toks[i].kind == tWord {
			out = append(out, d.word(i))
		}
	}
	return out
}

// tokenAt returns the index of the first token starting at or after byte offset s.
func (d *doc) tokenAt(s int) int {
	lo, hi := 0, len(d.toks)
	for lo < hi {
		m := (lo + hi) / 2
		if d.toks[m].start < s {
			lo = m + 1
		} else {
			hi = m
		}
	}
	return lo
}

// index builds wordIndex: every maximal run of letters and digits, by its text.
func (d *doc) index() {
	if d.wordIndex != nil {
		return
	}
	d.wordIndex = make(map[string][]int)
	text := d.text
	for i := 0; i < len(text); {
		r, n := utf8.DecodeRuneInString(text[i:])
		if !isWordRune(r) {
			i += n
			continue
		}
		j := i + n
		for j < len(text) {
			r2, n2 := utf8.DecodeRuneInString(text[j:])
			if !isWordRune(r2) {
				break
			}
			j += n2
		}
		w := text[i:j]
		d.wordIndex[w] = append(d.wordIndex[w], i)
		i = j
	}
}

// lexFlag marks what a word can start: the triggers of the pattern detectors.
type lexFlag uint16

const (
	fDOB     lexFlag = 1 << iota // a date-of-birth cue word
	fAge1                        // "age", "aged"
	fAge2                        // "y/o", "yoa", "year-old" ...
	fPlate                       // a plate cue word
	fCase                        // a case-number cue word
	fCorner                      // "corner", "intersection"
	fSuffix                      // a street suffix
	fTitle                       // a title before a name (titleWords)
	fNameCue                     // the first word of a name cue (cuesByFirst)
	fAtAnd                       // a preposition before a bare street pair (atAndPreps)
)

// cueFlags maps lower-case words to their flags, so that each word is looked up once (in
// tokenize) rather than in each set by each detector.
var cueFlags = func() map[string]lexFlag {
	m := map[string]lexFlag{}
	for f, set := range map[lexFlag]map[string]bool{fDOB: dobTrig, fAge1: ageTrig1, fAge2: ageTrig2, fPlate: plateTrig, fCase: caseTrig, fCorner: cornerTrig} {
		for w := range set {
			m[w] |= f
		}
	}
	for w := range streetSuffixes {
		m[w] |= fSuffix
	}
	for w := range titleWords {
		m[w] |= fTitle
	}
	for w := range cuesByFirst {
		m[w] |= fNameCue
	}
	for w := range atAndPreps {
		m[w] |= fAtAnd
	}
	return m
}()

// cueLens has bit n of entry c set when a word of cueFlags starts with the byte c and has n
// bytes (see byFirstAndLen).
var cueLens = byFirstAndLen(cueFlags)

// maxCueLen is the length of the longest word in cueFlags.
var maxCueLen = func() int {
	n := 0
	for w := range cueFlags {
		n = max(n, len(w))
	}
	return n
}()

// flagged returns a trigger test for word tokens with flag f.
func (d *doc) flagged(f lexFlag) func(i int) bool {
	return func(i int) bool { return d.flags[i]&f != 0 }
}
