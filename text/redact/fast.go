package redact

import (
	"regexp"
	"unicode/utf8"
)

// Speed helpers for the pattern detectors. Nothing here changes what is found: mayMatch
// only skips windows in which a pattern provably cannot match (or whose matches every
// detector would drop), and scanMemo only reuses the matches of a pattern on a window text
// it has already searched.

// scanMemo keeps the matches the detectors' patterns found in one pass, so that the next
// pass of Redact's fixed-point loop, which reads the same narrative with placeholders in
// place of what was found, searches again only the windows that changed. A nil *scanMemo
// remembers nothing.
type scanMemo struct {
	prev map[memoKey][][]int // earlier passes' matches, by pattern and window text
	cur  []memoRec           // this pass's searches, in order
}

type memoKey struct {
	re   *regexp.Regexp
	text string
}

type memoRec struct {
	key memoKey
	ms  [][]int // matches, offsets relative to the window; nil for none
}

// get returns the matches of re in text remembered from an earlier pass.
func (m *scanMemo) get(re *regexp.Regexp, text string) ([][]int, bool) {
	if m == nil || m.prev == nil {
		return nil, false
	}
	ms, ok := m.prev[memoKey{re, text}]
	return ms, ok
}

// put records the matches of re in text, found in this pass.
func (m *scanMemo) put(re *regexp.Regexp, text string, ms [][]int) {
	if m == nil {
		return
	}
	m.cur = append(m.cur, memoRec{memoKey{re, text}, ms})
}

// next makes this pass's searches available to the next pass.
func (m *scanMemo) next() {
	if m == nil || len(m.cur) == 0 {
		return
	}
	if m.prev == nil {
		m.prev = make(map[memoKey][][]int, len(m.cur))
	}
	for _, r := range m.cur {
		m.prev[r.key] = r.ms
	}
	m.cur = m.cur[:0]
}

// mayMatch reports whether re can give a find in the window w. It answers false only when
// that is certain from the pattern (and the detector's own checks of the match):
//
//   - the date, age and plate patterns need an ASCII digit ([0-9] matches only those; a
//     plate without a digit is dropped by plates), the case-number pattern two in a row;
//   - an intersection (crossRe) has two street suffixes, each a whole run of ASCII word
//     characters after a white-space byte (the pattern's \s before the suffix, \b after
//     it); in a window with non-ASCII bytes case folding can match other runes ("ſ" for
//     "s", the Kelvin sign for "k"), so such windows are always searched;
//   - "at Main/Oak" (slashRe) needs "at" or "near" and a white-space byte after it;
//   - "the 100 block of" (blockRe) needs "block" in any case (or non-ASCII, as above).
func mayMatch(re *regexp.Regexp, w string) bool {
	switch re {
	case dobRe, dobAfterRe, ageBeforeRe, ageAfterRe, plateRe:
		return hasDigit(w)
	case caseRe:
		return hasDigitPair(w)
	case crossRe:
		return !isASCII(w) || suffixRuns(w, 2) >= 2
	case slashRe:
		return hasWordThenSpace(w, "at") || hasWordThenSpace(w, "near")
	case blockRe:
		return !isASCII(w) || containsFold(w, "block")
	}
	return true
}

func hasDigit(s string) bool {
	for i := 0; i < len(s); i++ {
		if isDigitByte(s[i]) {
			return true
		}
	}
	return false
}

func hasDigitPair(s string) bool {
	for i := 1; i < len(s); i++ {
		if isDigitByte(s[i]) && isDigitByte(s[i-1]) {
			return true
		}
	}
	return false
}

// isREWordByte reports whether b is an ASCII word character as \b sees it.
func isREWordByte(b byte) bool {
	return b == '_' || isAlnumByte(b)
}

// isRESpaceByte reports whether b matches the regexp class \s ([\t\n\f\r ]).
func isRESpaceByte(b byte) bool {
	return b == ' ' || b == '\t' || b == '\n' || b == '\f' || b == '\r'
}

// suffixRuns counts, up to limit, the runs of ASCII word characters in s that follow a
// white-space byte and are, in lower case, a street suffix.
func suffixRuns(s string, limit int) int {
	n := 0
	var buf [16]byte
	for i := 1; i < len(s) && n < limit; i++ {
		if !isRESpaceByte(s[i-1]) || !isREWordByte(s[i]) {
			continue
		}
		j := i
		for j < len(s) && isREWordByte(s[j]) {
			j++
		}
		if j-i <= len(buf) {
			b := buf[:j-i]
			for k := range b {
				c := s[i+k]
				if c >= 'A' && c <= 'Z' {
					c += 'a' - 'A'
				}
				b[k] = c
			}
			if _, ok := streetSuffixes[string(b)]; ok {
				n++
			}
		}
		i = j
	}
	return n
}

// hasWordThenSpace reports whether s holds lw (lower-case ASCII letters without a
// non-ASCII case fold: not k or s) in any case, followed by a white-space byte.
func hasWordThenSpace(s, lw string) bool {
	for i := 0; i+len(lw) < len(s); i++ {
		if isRESpaceByte(s[i+len(lw)]) && equalFoldASCII(s[i:i+len(lw)], lw) {
			return true
		}
	}
	return false
}

// containsFold reports whether s holds the lower-case ASCII word lw in any ASCII case.
func containsFold(s, lw string) bool {
	for i := 0; i+len(lw) <= len(s); i++ {
		if equalFoldASCII(s[i:i+len(lw)], lw) {
			return true
		}
	}
	return false
}

// equalFoldASCII reports whether a equals the lower-case ASCII lw ignoring ASCII case.
func equalFoldASCII(a, lw string) bool {
	for k := 0; k < len(lw); k++ {
		c := a[k]
		if c >= 'A' && c <= 'Z' {
			c += 'a' - 'A'
		}
		if c != lw[k] {
			return false
		}
	}
	return true
}

// findAll returns re.FindAllStringSubmatchIndex(win, -1), computed faster where it can be
// (see fastRe and findAllCross).
func findAll(re *regexp.Regexp, win string) [][]int {
	if re == crossRe {
		return findAllCross(win, pick(re, win, true))
	}
	return pick(re, win, false).FindAllStringSubmatchIndex(win, -1)
}

// variants are patterns that find the same matches as a detector's pattern, faster:
//
//   - at is the pattern tied to the start of its input: scanAt keeps only a match that
//     starts at 0, and the match an anchored pattern finds at 0 is the one the pattern finds
//     there (the regexp package gives the leftmost match and, at its start, the one a
//     backtracking engine would choose); an anchored search just does not try every later
//     start of a window that has none at 0.
//   - ascii and asciiAt, for windows of ASCII text, list the street suffixes in alphabetical
//     order instead of longest first, which lets the regexp package factor their common
//     prefixes ("st|sta|station|str|street|streets|strt" becomes a small trie): the
//     alternation is a third the size, and addressRe and blockRe become small enough for
//     the backtracker instead of the slower NFA. The order of an alternation decides only
//     between alternatives that match at the same place, and here each is followed by \b:
//     in ASCII text a suffix followed by \b is the whole run of letters there, so at most
//     one suffix matches and the order cannot matter. (Outside ASCII it could: (?i:s)
//     matches "ſ" and (?i:k) the Kelvin sign, which are not word characters to \b.)
type variants struct{ at, ascii, asciiAt *regexp.Regexp }

// fastRe holds the variants of addressRe, blockRe, crossRe and cornerRe, in that order.
var fastRe = func() (v [4]variants) {
	anchor := func(re *regexp.Regexp) *regexp.Regexp { return regexp.MustCompile(`^(?:` + re.String() + `)`) }
	address, block, cross, corner := compileStreetPatterns(suffixAlternation(false))
	for i, p := range [][2]*regexp.Regexp{{addressRe, address}, {blockRe, block}, {crossRe, cross}, {cornerRe, corner}} {
		v[i] = variants{at: anchor(p[0]), ascii: p[1], asciiAt: anchor(p[1])}
	}
	return v
}()

// pick returns the pattern to search window w with in place of re: its anchored variant
// when at is set (re must have one), its ASCII variant when w is ASCII.
func pick(re *regexp.Regexp, w string, at bool) *regexp.Regexp {
	var v *variants
	switch re {
	case addressRe:
		v = &fastRe[0]
	case blockRe:
		v = &fastRe[1]
	case crossRe:
		v = &fastRe[2]
	case cornerRe:
		v = &fastRe[3]
	default:
		if at {
			panic("redact: no anchored variant of " + re.String())
		}
		return re
	}
	switch {
	case isASCII(w) && at:
		return v.asciiAt
	case isASCII(w):
		return v.ascii
	case at:
		return v.at
	}
	return re
}

// findAllCross returns crossRe.FindAllStringSubmatchIndex(w, -1) by trying crossAtRe, a
// variant of crossRe anchored at the start of its input (see variants), only
// at the positions where a match of crossRe can start, instead of letting the regexp
// package's NFA (crossRe is too large for its backtracker) carry a thread from every
// position of the window.
//
// Why this gives the same matches: FindAll takes, from the end of the previous match, the
// leftmost start at which crossRe matches and, there, the match a backtracking engine
// would choose; crossAtRe on w[s:] finds exactly the match crossRe prefers at s, provided
// the two see the same context. The pattern is (?:^|[^A-Za-z0-9])(street...), and a
// street begins with an ASCII digit or capital (see streetPatWith), so a match starts either
// at 0 with such a byte (the ^ branch) or at a rune that is not an ASCII letter or digit
// and is followed by such a byte. At such an s > 0 the ^ branch of crossAtRe cannot
// match either, since w[s] is no digit or capital; nothing else in the pattern looks
// before its own start, and its end sees the same text. Positions are visited rune by
// rune as the regexp package steps through its input (invalid bytes one at a time), and
// crossRe never matches the empty string.
func findAllCross(w string, crossAtRe *regexp.Regexp) [][]int {
	var out [][]int
	for s := 0; s < len(w); {
		r, n := utf8.DecodeRuneInString(w[s:])
		try := s == 0 && isStreetStart(w[0])
		if !try && !(r < utf8.RuneSelf && isAlnumByte(byte(r))) {
			try = s+n < len(w) && isStreetStart(w[s+n])
		}
		if try {
			if m := crossAtRe.FindStringSubmatchIndex(w[s:]); m != nil {
				for i := range m {
					if m[i] >= 0 {
						m[i] += s
					}
				}
				out = append(out, m)
				s = m[1]
				continue
			}
		}
		s += n
	}
	return out
}

// isStreetStart reports whether b can begin streetPat: an ASCII digit or capital.
func isStreetStart(b byte) bool { return isDigitByte(b) || isUpperByte(b) }
