// Package sentences cuts a narrative into sentences at the punctuation between its tokens and
// keys every sentence by its normalised words, so that sentences many narratives repeat word
// for word (disclaimers, sign-offs, procedure: "No further action.") can be counted and kept
// out of theme fitting.
//
// # Boundaries
//
// The caller gives the text and its tokens (byte spans into the text, ascending, not
// overlapping, each with its lower-case form). A sentence ends between token i-1 and token i
// when the gap between them, text[toks[i-1].End:toks[i].Start], holds
//
//   - '!', '?' or ';', or a line break ('\n'), whatever else it holds; or
//   - a full stop '.', except for the full stop of an abbreviation: the gap begins with the
//     '.' (it follows the token with nothing between) and either
//     (a) the next token follows the '.' with no space between ("a.m", "e.g", "approx.5"),
//     (b) the token before is listed in Abbreviations ("approx.", "Sgt.", "St.", "Ave."), or is
//     "no"/"nos" followed by a token that starts with a digit ("No. 5"), or
//     (c) the token before is a single letter ("a.m. hours", "U.S."), unless the next token
//     starts with an upper-case letter ("at 9 a.m. Checked the area": a new sentence).
//
// A token whose own text ends with a full stop (the tokenizer absorbs "a.m."/"p.m." into a time:
// "9:45 a.m.") ends a sentence when the next token starts with an upper-case letter and
// nothing but spaces lies between. Decimals ("3.5"), times ("9:45") and codes ("10-50") are
// single tokens, so the full stops and hyphens inside them never cut a sentence; ':' ',' and
// '-' between tokens never do.
//
// The rule is our own, written for incident narratives (abbreviations that take a full stop
// and the capital-letter test for a new sentence are common practice, from memory; Kiss and
// Strunk 2006, "Unsupervised multilingual sentence boundary detection", learn such evidence
// from the corpus instead). It errs towards joining two sentences: that only makes a key less
// likely to repeat, never sets aside text that was not repeated. Line breaks end sentences,
// so text hard-wrapped at a fixed width is cut at every line: its pieces seldom repeat.
//
// # Keys
//
// A sentence's key is its tokens' key forms joined by one space (the caller chooses the forms:
// package text writes numbers, times and dates by their kind, "[number]", so that "Employee #1"
// and "Employee #2" share a key). Counting is by the key's 64-bit FNV-1a hash (Fowler, Noll
// and Vo; the published offset basis and prime), computed token by token without building
// the string: Hash("w1 w2") == Add(Add(Start, w1), w2). A false match between two different
// keys has a chance of about n·m/2^64 for n keys and m sentences (5e-8 for a thousand keys
// and a billion sentences).
package sentences

import (
	"unicode"
	"unicode/utf8"
)

// Token is one token as the segmenter sees it: text[Start:End] is where it stands, Lower its
// lower-case form (read by the abbreviation test).
type Token struct {
	Start, End int
	Lower      []byte
}

// Abbreviations are the words whose full stop does not end a sentence (rule (b)): titles and
// ranks, street types, and words of measure and reference that narratives abbreviate with a
// full stop. Common practice, written from memory. Words that often end a sentence ("etc",
// "inc") are left out, so the list holds words seldom found at a sentence's end.
var Abbreviations = map[string]bool{
	"mr": true, "mrs": true, "ms": true, "dr": true, "jr": true, "sr": true, "prof": true,
	"sgt": true, "lt": true, "capt": true, "cpl": true, "cmdr": true, "det": true, "ofc": true,
	"ofcr": true, "insp": true, "supt": true, "dep": true, "tpr": true, "pvt": true, "gen": true,
	"st": true, "ave": true, "av": true, "blvd": true, "rd": true, "ln": true, "hwy": true,
	"pkwy": true, "ct": true, "apt": true, "ste": true, "bldg": true, "mt": true, "ft": true,
	"approx": true, "appx": true, "est": true, "min": true, "hr": true, "hrs": true, "mi": true,
	"dept": true, "ref": true, "vs": true, "viz": true, "cf": true, "al": true, "fig": true,
	"jan": true, "feb": true, "mar": true, "apr": true, "jun": true, "jul": true, "aug": true,
	"sep": true, "sept": true, "oct": true, "nov": true, "dec": true,
}

// Starts appends to dst the index of the first token of every sentence (0 first, when toks
// is not empty) and returns it. It reads text only inside the gaps between tokens and the
// first byte of each token, and never panics for spans inside text (see FuzzStarts).
func Starts(dst []int, text []byte, toks []Token) []int {
	if len(toks) == 0 {
		return dst
	}
	dst = append(dst, 0)
	for i := 1; i < len(toks); i++ {
		if Boundary(text, toks[i-1], toks[i]) {
			dst = append(dst, i)
		}
	}
	return dst
}

// Boundary reports whether a sentence ends between the tokens prev and next (see the package
// documentation for the rule).
func Boundary(text []byte, prev, next Token) bool {
	a, b := prev.End, next.Start
	if a < 0 || b > len(text) || a > b {
		return false
	}
	gap := text[a:b]
	upperNext := startsUpper(text, b)
	dot := false
	for _, c := range gap {
		switch c {
		case '!', '?', ';', '\n':
			return true
		case '.':
			dot = true
		}
	}
	if !dot {
		// A token ending in its own full stop ("9:45 a.m.") before a capitalised word.
		if prev.End > prev.Start && prev.End <= len(text) && text[prev.End-1] == '.' && upperNext && onlySpaces(gap) {
			return true
		}
		return false
	}
	if gap[0] != '.' {
		return true // a full stop not attached to the word before
	}
	if len(gap) == 1 {
		return false // (a) "a.m", "e.g", "approx.5": no space after the full stop
	}
	w := prev.Lower
	switch {
	case Abbreviations[string(w)]:
		return false
	case (string(w) == "no" || string(w) == "nos") && b < len(text) && text[b] >= '0' && text[b] <= '9':
		return false
	case utf8.RuneCount(w) == 1 && !upperNext:
		return false
	}
	return true
}

func onlySpaces(b []byte) bool {
	for _, c := range b {
		if c != ' ' && c != '\t' && c != '\r' {
			return false
		}
	}
	return true
}

// startsUpper reports whether text[i:] starts with an upper-case letter.
func startsUpper(text []byte, i int) bool {
	if i < 0 || i >= len(text) {
		return false
	}
	c := text[i]
	if c < utf8.RuneSelf {
		return c >= 'A' && c <= 'Z'
	}
	r, _ := utf8.DecodeRune(text[i:])
	return unicode.IsUpper(r)
}

// Start is the FNV-1a 64-bit offset basis: the hash of an empty key.
const Start uint64 = 14695981039346656037

const prime uint64 = 1099511628211

// Add returns the hash h extended by one more token's key form w: w's bytes, then a space.
func Add(h uint64, w []byte) uint64 {
	for _, c := range w {
		h ^= uint64(c)
		h *= prime
	}
	h ^= ' '
	return h * prime
}

// Hash returns the hash of a whole key ("w1 w2 w3"): the FNV-1a hash of the key followed by
// one space, equal to adding its words one by one to Start with Add.
func Hash(key string) uint64 {
	h := Start
	for i := 0; i < len(key); i++ {
		h ^= uint64(key[i])
		h *= prime
	}
	h ^= ' '
	return h * prime
}

// Threshold is the number of narratives a key must be found in to count as boilerplate:
// the larger of minNarratives and minShare of docs (rounded up), and at least 2.
func Threshold(docs, minNarratives int, minShare float64) int {
	t := minNarratives
	if s := minShare * float64(docs); s > float64(t) {
		t = int(s)
		if float64(t) < s {
			t++
		}
	}
	return max(t, 2)
}
