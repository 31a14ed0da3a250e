package text

import (
	"fmt"
	"unicode"
	"unicode/utf8"
)

// Kind says what a token is. Kinds other than Word are decided by the token's shape alone.
type Kind uint8

const (
	Word   Kind = iota // letters, possibly with digits, apostrophes or a "w/"-style slash
	Number             // digits, possibly with inner ',' or '.': 12, 1,250, 3.5; ordinals 1st, 10th
	Time               // digits with ':' (9:45, 14:30:05), with an absorbed "a.m."/"pm"
	Date               // digit groups joined by '/' (8/10/2017) or three '-' groups (2017-08-10)
	Code               // two or more than three digit groups joined by '-' (10-50, 11-99)
	Phrase             // a collocation joined by the phrase step ("traffic_stop")
)

var kindNames = [...]string{"word", "number", "time", "date", "code", "phrase"}

func (k Kind) String() string {
	if int(k) < len(kindNames) {
		return kindNames[k]
	}
	return fmt.Sprintf("Kind(%d)", k)
}

// MarshalText writes the kind's name.
func (k Kind) MarshalText() ([]byte, error) { return []byte(k.String()), nil }

// UnmarshalText reads a kind's name.
func (k *Kind) UnmarshalText(b []byte) error {
	for i, n := range kindNames {
		if n == string(b) {
			*k = Kind(i)
			return nil
		}
	}
	return fmt.Errorf("text: unknown token kind %q", b)
}

// Token is one word of a narrative as the models see it. Start and End are byte offsets into
// the ORIGINAL raw narrative (raw[Start:End] is what the writer typed, before normalisation);
// Text is the normalised form, which can differ from raw[Start:End] (case, entities,
// hyphenation, abbreviation expansion: "veh" gives Text "vehicle" with the span of "veh").
// Tokens expanded from one abbreviation share its span. Protected tokens are never repaired,
// stopped or stemmed (codes and placeholders).
type Token struct {
	Text       string
	Start, End int
	Kind       Kind
	Protected  bool
}

// rawTok is a token as scanned: its text is scanner.text[a:b], its span [s,e) is in the
// normalised text, brk says a punctuation break separates it from the previous token.
type rawTok struct {
	a, b int32
	s, e int32
	kind Kind
	brk  bool
}

// scanner is the byte-level tokenizer. It reuses its buffers between narratives, so the hot
// path allocates nothing once the buffers have grown.
type scanner struct {
	nb   normBuf
	text []byte
	toks []rawTok

	// Fused mode (Build's first pass), when in is not nil: each token is interned into in as
	// it is scanned, a new text gets a surface in surfs, and its id is appended to ids (-1
	// for a break between two tokens of the narrative); no rawTok is recorded and toks stays
	// empty. idStart is where the narrative's ids begin, ntok counts its tokens.
	in      *internTable
	surfs   []surface
	ids     []int32
	idStart int
	ntok    int
}

const (
	classLetter = 1 << iota
	classDigit
	classUpper
)

// asciiClass classifies ASCII letters and digits for the tokenizer's fast path.
var asciiClass = func() (t [256]uint8) {
	for c := 'a'; c <= 'z'; c++ {
		t[c] = classLetter
		t[c-'a'+'A'] = classLetter | classUpper
	}
	for c := '0'; c <= '9'; c++ {
		t[c] = classDigit
	}
	return
}()

func isLetterASCII(c byte) bool { return (c|0x20) >= 'a' && (c|0x20) <= 'z' }
func isDigitASCII(c byte) bool  { return c >= '0' && c <= '9' }

func isLetterAt(x []byte, j int) bool {
	if j >= len(x) {
		return false
	}
	if x[j] < utf8.RuneSelf {
		return isLetterASCII(x[j])
	}
	r, _ := utf8.DecodeRune(x[j:])
	return unicode.IsLetter(r)
}

// scan normalises raw and splits it into tokens (sc.toks, texts in sc.text).
//
// Rules (our own, written for incident narratives):
//   - A token starts at a letter or digit and runs over letters, digits and combining marks.
//   - An apostrophe between letters stays inside ("don't", "driver's"); a possessive "'s" is
//     then stripped unless keepPossessive ("driver's" → "driver", "it's" → "it").
//   - A hyphen between digits stays inside (codes "10-50", dates "2017-08-10"); a hyphen that
//     ends a line inside a word is removed and the word rejoined ("resi-\ndence"); any other
//     hyphen separates words ("self-inflicted" → "self", "inflicted").
//   - ':' '/' '.' ',' between digits stay inside (times, dates, numbers); "a.m."/"pm" after a
//     time is absorbed into the time token.
//   - A one- or two-letter word followed by '/' and at most two letters ("w/", "w/o", "n/a")
//     is one token.
//   - Letters are lowercased (Unicode simple lowercase).
//   - Other punctuation, and two or more line breaks, set a break before the next token
//     (phrases and split-word joins never cross a break); spaces, single line breaks, quotes,
//     '/', '&' and '+' do not.
func (sc *scanner) scan(raw string, keepPossessive bool) {
	sc.nb.normalize(raw)
	x := sc.nb.bytes()
	sc.text = sc.text[:0]
	sc.toks = sc.toks[:0]
	sc.idStart, sc.ntok = len(sc.ids), 0
	brk, nl := false, 0
	for i := 0; i < len(x); {
		c := x[i]
		if c < utf8.RuneSelf {
			switch {
			case isLetterASCII(c) || isDigitASCII(c):
				i = sc.word(x, i, brk, keepPossessive)
				brk, nl = false, 0
			case c == ' ' || c == '\t' || c == '\r':
				i++
			case c == '\n':
				nl++
				if nl >= 2 {
					brk = true
				}
				i++
			case c == '\'' || c == '"' || c == '/' || c == '&' || c == '+':
				i++
			default:
				brk = true
				i++
			}
			continue
		}
		r, n := utf8.DecodeRune(x[i:])
		switch {
		case unicode.IsLetter(r) || unicode.IsDigit(r):
			i = sc.word(x, i, brk, keepPossessive)
			brk, nl = false, 0
			continue
		case unicode.IsSpace(r):
		default:
			brk = true
		}
		i += n
	}
}

func (sc *scanner) appendLower(r rune) {
	if r < utf8.RuneSelf {
		c := byte(r)
		if c >= 'A' && c <= 'Z' {
			c += 'a' - 'A'
		}
		sc.text = append(sc.text, c)
		return
	}
	sc.text = utf8.AppendRune(sc.text, unicode.ToLower(r))
}

// flush copies a token's pending first run x[i:*pend] to sc.text (see word).
func (sc *scanner) flush(x []byte, i int, pend *int) {
	if *pend >= 0 {
		sc.text = append(sc.text, x[i:*pend]...)
		*pend = -1
	}
}

// word scans one token starting at x[i] and returns the index after it.
//
// A token that is one run of lower-case ASCII letters and digits (most tokens) is not copied:
// while pend >= 0 its text is x[i:pend], and it is copied to sc.text (flush) only when
// something else is added to it.
func (sc *scanner) word(x []byte, i int, brk, keepPossessive bool) int {
	a := len(sc.text)
	hasL, hasD, slashWord := false, false, false
	colon, slash, hyph := 0, 0, 0
	pend := -1
	j := i
loop:
	for j < len(x) {
		c := x[j]
		if c < utf8.RuneSelf {
			if cls := asciiClass[c]; cls != 0 {
				k, seen := j, uint8(0)
				for k < len(x) && asciiClass[x[k]] != 0 {
					seen |= asciiClass[x[k]]
					k++
				}
				hasL = hasL || seen&classLetter != 0
				hasD = hasD || seen&classDigit != 0
				if j == i && seen&classUpper == 0 {
					pend, j = k, k
					continue
				}
				sc.flush(x, i, &pend)
				base := len(sc.text)
				sc.text = append(sc.text, x[j:k]...)
				if seen&classUpper != 0 {
					for p := base; p < len(sc.text); p++ {
						if b := sc.text[p]; b >= 'A' && b <= 'Z' {
							sc.text[p] = b + ('a' - 'A')
						}
					}
				}
				j = k
				continue
			}
			if j == i {
				break
			}
			prev := x[j-1]
			var nx byte
			if j+1 < len(x) {
				nx = x[j+1]
			}
			digits := isDigitASCII(prev) && isDigitASCII(nx) && !hasL
			switch c {
			case '\'':
				if hasL && isLetterAt(x, j+1) && (isLetterASCII(prev) || prev >= utf8.RuneSelf) {
					sc.flush(x, i, &pend)
					sc.text = append(sc.text, '\'')
					j++
					continue
				}
			case '-':
				if digits {
					sc.flush(x, i, &pend)
					sc.text = append(sc.text, '-')
					hyph++
					j++
					continue
				}
				if hasL {
					if skip := hyphenBreak(x, j); skip > 0 {
						j += skip
						continue
					}
				}
			case ':':
				if digits {
					sc.flush(x, i, &pend)
					sc.text = append(sc.text, ':')
					colon++
					j++
					continue
				}
			case '.', ',':
				if digits {
					sc.flush(x, i, &pend)
					sc.text = append(sc.text, c)
					j++
					continue
				}
			case '/':
				if digits && colon == 0 {
					sc.flush(x, i, &pend)
					sc.text = append(sc.text, '/')
					slash++
					j++
					continue
				}
				sc.flush(x, i, &pend) // (the length test below reads sc.text)
				if hasL && !hasD && len(sc.text)-a <= 2 && (i == 0 || x[i-1] != '/') {
					k := j + 1
					for k < len(x) && k-j-1 < 3 && isLetterASCII(x[k]) {
						k++
					}
					if k-j-1 <= 2 && (k >= len(x) || (x[k] < utf8.RuneSelf && !isDigitASCII(x[k]) && !isLetterASCII(x[k]) && x[k] != '/')) {
						sc.text = append(sc.text, '/')
						for _, b := range x[j+1 : k] {
							sc.appendLower(rune(b))
						}
						j = k
						slashWord = true
						break loop
					}
				}
			}
			break
		}
		r, n := utf8.DecodeRune(x[j:])
		sc.flush(x, i, &pend)
		switch {
		case unicode.IsLetter(r) || (unicode.IsMark(r) && j > i):
			sc.appendLower(r)
			hasL = true
		case unicode.IsDigit(r):
			sc.text = utf8.AppendRune(sc.text, r)
			hasD = true
		default:
			break loop
		}
		j += n
	}
	var kind Kind
	switch {
	case hasL || slashWord:
		kind = Word
	case colon > 0:
		kind = Time
	case slash > 0, hyph == 2:
		kind = Date
	case hyph > 0:
		kind = Code
	default:
		kind = Number
	}
	if pend >= 0 {
		// One lower-case run: no apostrophe (no possessive) and no colon (not a Time).
		if kind == Word && hasD && isOrdinal(x[i:pend]) {
			kind = Number
		}
		if sc.in != nil {
			sc.emit(x[i:pend], kind, brk)
			return j
		}
		sc.text = append(sc.text, x[i:pend]...)
	} else {
		if kind == Word && hasD && isOrdinal(sc.text[a:]) {
			kind = Number
		}
		if kind == Time {
			j = sc.meridiem(x, j)
		}
		if kind == Word && !keepPossessive {
			if t := sc.text[a:]; len(t) > 2 && t[len(t)-2] == '\'' && t[len(t)-1] == 's' {
				sc.text = sc.text[:len(sc.text)-2]
			}
		}
		if sc.in != nil {
			sc.emit(sc.text[a:], kind, brk)
			sc.text = sc.text[:a]
			return j
		}
	}
	sc.toks = append(sc.toks, rawTok{a: int32(a), b: int32(len(sc.text)), s: int32(i), e: int32(j), kind: kind, brk: brk})
	return j
}

// emit interns one token in fused mode (see scanner).
func (sc *scanner) emit(t []byte, kind Kind, brk bool) {
	if brk && len(sc.ids) > sc.idStart && sc.ids[len(sc.ids)-1] != -1 {
		sc.ids = append(sc.ids, -1)
	}
	id := sc.in.id(t)
	if int(id) == len(sc.surfs) {
		sc.surfs = append(sc.surfs, surface{sc.in.strs[id], kind, 0})
	}
	sc.surfs[id].count++
	sc.ids = append(sc.ids, id)
	sc.ntok++
}

// isOrdinal reports whether t is digits followed by st, nd, rd or th ("1st", "22nd", "10th"),
// which the tokenizer counts as numbers.
func isOrdinal(t []byte) bool {
	n := len(t)
	if n < 3 || !isDigitASCII(t[n-3]) {
		return false
	}
	for _, c := range t[:n-2] {
		if !isDigitASCII(c) {
			return false
		}
	}
	switch string(t[n-2:]) {
	case "st", "nd", "rd", "th":
		return true
	}
	return false
}

// meridiem absorbs " a.m.", "am", " p.m." or "pm" (any case) after a time at x[j].
func (sc *scanner) meridiem(x []byte, j int) int {
	k := j
	if k < len(x) && x[k] == ' ' {
		k++
	}
	if k >= len(x) {
		return j
	}
	m := x[k] | 0x20
	if m != 'a' && m != 'p' {
		return j
	}
	k++
	dots := k < len(x) && x[k] == '.'
	if dots {
		k++
	}
	if k >= len(x) || x[k]|0x20 != 'm' {
		return j
	}
	k++
	if dots {
		if k >= len(x) || x[k] != '.' {
			return j
		}
		k++
	} else if isLetterAt(x, k) || (k < len(x) && isDigitASCII(x[k])) {
		return j
	}
	sc.text = append(sc.text, m, 'm')
	return k
}
