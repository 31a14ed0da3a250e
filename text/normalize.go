package text

import (
	"strings"
	"unicode"
	"unicode/utf8"
	"unsafe"

	"golang.org/x/text/unicode/norm"
)

// normBuf holds the normalised text of one narrative and, for each of its bytes, the span of
// the original bytes it came from. When ident is true the text is the raw narrative itself and
// the map is the identity (the ASCII fast path, no HTML residue).
type normBuf struct {
	ident      bool
	view       []byte // when ident: raw's own bytes, read only (never appended to)
	text       []byte
	start, end []int32 // len(text) each, unless ident

	tmp              []byte // HTML stage output
	tmpStart, tmpEnd []int32
}

// bytes returns the normalised text: raw's own bytes on the fast path (the caller must not
// write to them), else nb.text.
func (nb *normBuf) bytes() []byte {
	if nb.ident {
		return nb.view
	}
	return nb.text
}

// rawSpan maps a span [a,b) of the normalised text to the raw narrative.
func (nb *normBuf) rawSpan(a, b int) (int, int) {
	if nb.ident {
		return a, b
	}
	if b <= a {
		if a < len(nb.start) {
			return int(nb.start[a]), int(nb.start[a])
		}
		return 0, 0
	}
	return int(nb.start[a]), int(nb.end[b-1])
}

// needsSlowPath reports whether raw has non-ASCII bytes or the bytes that start HTML residue
// or a backtick apostrophe; otherwise the normalised text is raw itself.
func needsSlowPath(raw string) bool {
	if strings.IndexByte(raw, '&') >= 0 || strings.IndexByte(raw, '<') >= 0 || strings.IndexByte(raw, '`') >= 0 {
		return true
	}
	i := 0
	for ; i+8 <= len(raw); i += 8 {
		w := uint64(raw[i]) | uint64(raw[i+1])<<8 | uint64(raw[i+2])<<16 | uint64(raw[i+3])<<24 |
			uint64(raw[i+4])<<32 | uint64(raw[i+5])<<40 | uint64(raw[i+6])<<48 | uint64(raw[i+7])<<56
		if w&0x8080808080808080 != 0 {
			return true
		}
	}
	for ; i < len(raw); i++ {
		if raw[i] >= utf8.RuneSelf {
			return true
		}
	}
	return false
}

// normalize fills nb from raw: HTML residue (entities, tags, escaped tags) decoded or removed, Unicode NFKC,
// quotes, apostrophes, dashes and unusual spaces unified. Case folding, hyphenation and
// whitespace are left to the tokenizer, which needs the original case to tell a line-end
// hyphenation ("resi-\ndence") from a hyphenated name.
func (nb *normBuf) normalize(raw string) {
	if !needsSlowPath(raw) {
		nb.ident = true
		nb.view = unsafe.Slice(unsafe.StringData(raw), len(raw))
		return
	}
	nb.ident, nb.view = false, nil
	// Stage 1: HTML residue.
	src := raw
	var sStart, sEnd []int32
	if strings.IndexByte(raw, '&') >= 0 || strings.IndexByte(raw, '<') >= 0 {
		nb.html(raw)
		src = string(nb.tmp) // copy: the stage-2 iterator reads it while text is written
		sStart, sEnd = nb.tmpStart, nb.tmpEnd
	}
	// Stage 2: NFKC segment by segment, mapping each segment's runes.
	nb.text, nb.start, nb.end = nb.text[:0], nb.start[:0], nb.end[:0]
	var it norm.Iter
	it.InitString(norm.NFKC, src)
	var rs, re int32
	for !it.Done() {
		p0 := it.Pos()
		seg := it.Next()
		p1 := it.Pos()
		// The iterator can emit a segment without advancing (it buffers combining sequences);
		// such a segment is mapped to the span of the last one.
		if p1 > p0 {
			if sStart == nil {
				rs, re = int32(p0), int32(p1)
			} else {
				rs, re = sStart[p0], sEnd[p1-1]
			}
		}
		for len(seg) > 0 {
			r, n := utf8.DecodeRune(seg)
			if r == utf8.RuneError && n == 1 {
				r = ' ' // invalid byte
			}
			seg = seg[n:]
			r = mapRune(r)
			if r < 0 {
				continue
			}
			before := len(nb.text)
			nb.text = utf8.AppendRune(nb.text, r)
			for k := before; k < len(nb.text); k++ {
				nb.start = append(nb.start, rs)
				nb.end = append(nb.end, re)
			}
		}
	}
}

// mapRune unifies quotes, apostrophes, dashes and spaces; it returns -1 for runes that are
// dropped (soft hyphen, zero-width characters, byte-order mark).
func mapRune(r rune) rune {
	switch r {
	case '\u2018', '\u2019', '\u201A', '\u201B', '\u2032', '\u02BC', '\u00B4', '`':
		return '\''
	case '\u201C', '\u201D', '\u201E', '\u201F', '\u2033', '\u00AB', '\u00BB':
		return '"'
	case '\u2010', '\u2011', '\u2012', '\u2013', '\u2014', '\u2015', '\u2212', '\uFE58', '\uFE63', '\uFF0D':
		return '-'
	case '\u00AD', '\u200B', '\u200C', '\u200D', '\u2060', '\uFEFF':
		return -1
	case '\u2028', '\u2029', '\u0085':
		return '\n'
	case '\t', '\n', '\r':
		return r
	}
	if r < ' ' || r == 0x7f || (r >= 0x80 && r < 0xa0) || unicode.IsSpace(r) {
		return ' '
	}
	return r
}

// entities are the HTML character references that show up in exported narratives (common
// practice; the full list is in the WHATWG HTML standard, §13.5). Unknown names stay as text.
var entities = map[string]string{
	"nbsp": " ", "amp": "&", "lt": "<", "gt": ">", "quot": "\"", "apos": "'",
	"ndash": "-", "mdash": "-", "lsquo": "'", "rsquo": "'", "ldquo": "\"", "rdquo": "\"",
	"hellip": "...", "bull": " ", "middot": " ", "shy": "", "ensp": " ", "emsp": " ",
	"thinsp": " ", "copy": "(c)", "reg": "(r)", "deg": " degrees ", "frac12": " 1/2 ",
	"eacute": "é", "ntilde": "ñ",
}

// entityAt parses a character reference at s[i] == '&' and returns its replacement and length.
func entityAt(s string, i int) (string, int, bool) {
	j := i + 1
	if j < len(s) && s[j] == '#' {
		j++
		hex := j < len(s) && (s[j] == 'x' || s[j] == 'X')
		if hex {
			j++
		}
		k, v := j, 0
		for k < len(s) && k-j < 8 {
			c := s[k]
			var d int
			switch {
			case c >= '0' && c <= '9':
				d = int(c - '0')
			case hex && c >= 'a' && c <= 'f':
				d = int(c-'a') + 10
			case hex && c >= 'A' && c <= 'F':
				d = int(c-'A') + 10
			default:
				d = -1
			}
			if d < 0 {
				break
			}
			if hex {
				v = v*16 + d
			} else {
				v = v*10 + d
			}
			k++
		}
		if k == j {
			return "", 0, false
		}
		if k < len(s) && s[k] == ';' {
			k++
		}
		if v == 0 || v > unicode.MaxRune || (v >= 0xD800 && v <= 0xDFFF) {
			return " ", k - i, true
		}
		return string(rune(v)), k - i, true
	}
	k := j
	for k < len(s) && k-j < 10 && ((s[k] >= 'a' && s[k] <= 'z') || (s[k] >= 'A' && s[k] <= 'Z') || (s[k] >= '0' && s[k] <= '9')) {
		k++
	}
	name := strings.ToLower(s[j:k])
	rep, ok := entities[name]
	if !ok {
		return "", 0, false
	}
	if k < len(s) && s[k] == ';' {
		k++
	} else if name != "nbsp" && name != "amp" {
		return "", 0, false // only the two commonest are accepted without ';'
	}
	// Doubly escaped references ("&amp;nbsp;") are decoded in one go.
	if name == "amp" && k < len(s) && s[k-1] == ';' {
		if r2, n2, ok2 := entityAt(s, k-1); ok2 && n2 > 1 {
			return r2, k - 1 + n2 - i, true
		}
	}
	return rep, k - i, true
}

// tagAt reports the length of an HTML tag or comment at s[i] == '<', or 0.
func tagAt(s string, i int) int {
	j := i + 1
	if j >= len(s) {
		return 0
	}
	c := s[j]
	if !((c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '/' || c == '!' || c == '?') {
		return 0
	}
	if strings.HasPrefix(s[i:], "<!--") {
		rest := s[i+4:]
		if len(rest) > 4096 {
			rest = rest[:4096] // bounded, so that many unclosed comments stay linear
		}
		if k := strings.Index(rest, "-->"); k >= 0 {
			return 4 + k + 3
		}
		return 0
	}
	for k := j; k < len(s) && k-i < 512; k++ {
		switch s[k] {
		case '>':
			return k - i + 1
		case '<':
			return 0
		}
	}
	return 0
}

// escapedTagAt reports the length of an escaped tag such as "&lt;br /&gt;" at s[i] == '&'
// (exports that escape HTML twice leave these), or 0.
func escapedTagAt(s string, i int) int {
	if !strings.HasPrefix(s[i:], "&lt;") || i+4 >= len(s) {
		return 0
	}
	c := s[i+4]
	if !((c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '/' || c == '!') {
		return 0
	}
	rest := s[i+4:]
	if len(rest) > 256 {
		rest = rest[:256]
	}
	k := strings.Index(rest, "&gt;")
	if k < 0 || strings.ContainsAny(rest[:k], "<>") {
		return 0
	}
	return 4 + k + 4
}

// html decodes raw's HTML residue into nb.tmp with its byte map.
func (nb *normBuf) html(raw string) {
	nb.tmp, nb.tmpStart, nb.tmpEnd = nb.tmp[:0], nb.tmpStart[:0], nb.tmpEnd[:0]
	emit := func(s string, a, b int) {
		for k := 0; k < len(s); k++ {
			nb.tmp = append(nb.tmp, s[k])
			nb.tmpStart = append(nb.tmpStart, int32(a))
			nb.tmpEnd = append(nb.tmpEnd, int32(b))
		}
	}
	for i := 0; i < len(raw); {
		c := raw[i]
		if c == '&' {
			if n := escapedTagAt(raw, i); n > 0 {
				emit(" ", i, i+n)
				i += n
				continue
			}
			if rep, n, ok := entityAt(raw, i); ok {
				emit(rep, i, i+n)
				i += n
				continue
			}
		} else if c == '<' {
			if n := tagAt(raw, i); n > 0 {
				emit(" ", i, i+n)
				i += n
				continue
			}
		}
		nb.tmp = append(nb.tmp, c)
		nb.tmpStart = append(nb.tmpStart, int32(i))
		nb.tmpEnd = append(nb.tmpEnd, int32(i+1))
		i++
	}
}

// Normalize returns raw as the tokenizer sees it, for display and inspection: HTML residue
// removed, NFKC, case folded (Unicode simple lowercase), quotes and dashes unified, line-end
// hyphenation rejoined ("resi-\ndence" → "residence") and runs of whitespace collapsed to one
// space, trimmed.
func Normalize(raw string) string {
	var nb normBuf
	nb.normalize(raw)
	s := nb.bytes()
	var b strings.Builder
	b.Grow(len(s))
	space := false
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRune(s[i:])
		if r == '-' && i > 0 {
			if skip := hyphenBreak(s, i); skip > 0 {
				i += skip
				continue
			}
		}
		i += n
		if unicode.IsSpace(r) {
			space = true
			continue
		}
		if space && b.Len() > 0 {
			b.WriteByte(' ')
		}
		space = false
		b.WriteRune(unicode.ToLower(r))
	}
	return b.String()
}

// hyphenBreak reports how many bytes to skip when s[i] is a hyphen ending a line inside a
// word: a letter before, optional spaces, a line break, optional spaces, then a lowercase
// letter. It returns 0 otherwise.
func hyphenBreak(s []byte, i int) int {
	if i == 0 {
		return 0
	}
	p, _ := utf8.DecodeLastRune(s[:i])
	if !unicode.IsLetter(p) {
		return 0
	}
	j := i + 1
	for j < len(s) && (s[j] == ' ' || s[j] == '\t') {
		j++
	}
	if j < len(s) && s[j] == '\r' {
		j++
	}
	if j >= len(s) || s[j] != '\n' {
		return 0
	}
	j++
	for j < len(s) && (s[j] == ' ' || s[j] == '\t') {
		j++
	}
	if j >= len(s) {
		return 0
	}
	r, _ := utf8.DecodeRune(s[j:])
	if !unicode.IsLower(r) {
		return 0
	}
	return j - i
}
