package text

// A byte-level English (Porter2) Snowball stemmer for lower-case ASCII words, written to give
// exactly the stems of github.com/kljensen/snowball v0.10.0 (english.Stem(w, true)), which
// works on a []rune copy of every word and allocates for each suffix it tries. The rules are
// Porter's, as the Snowball project publishes them (snowballstem.org, "The English (Porter2)
// stemming algorithm"), in the revision and with the details of that library: its vowel set
// (a e i o u y), its suffix lists taken in its order (the first listed suffix that ends the
// word is the one used, not always the longest), its R1 prefixes (gener, commun, arsen), its
// exception words and its short-syllable test. Tests check it against the library on every
// word of the Snowball sample vocabulary, the Debian fixture and the benchmark corpora
// (TestPorter2MatchesLibrary).
//
// stemASCII reports ok=false for a word it does not handle (non-ASCII bytes, upper case,
// spaces or control bytes, a leading apostrophe, more than porter2Max bytes); the caller then
// asks the library.

const porter2Max = 64

// isVowel2 is the library's vowel test (isLowerVowel): a e i o u y; a capital Y (a y marked
// as a consonant) is not a vowel.
func isVowel2(c byte) bool {
	switch c {
	case 'a', 'e', 'i', 'o', 'u', 'y':
		return true
	}
	return false
}

// p2word is the word being stemmed: b[:n] with the region starts r1, r2 (byte indexes, at
// most n).
type p2word struct {
	b      [porter2Max + 2]byte
	n      int
	r1, r2 int
}

func (w *p2word) hasSuffix(s string) bool {
	if len(s) > w.n {
		return false
	}
	return string(w.b[w.n-len(s):w.n]) == s
}

// firstSuffix returns the first of list that ends the word, or "".
func (w *p2word) firstSuffix(list ...string) string {
	for _, s := range list {
		if w.hasSuffix(s) {
			return s
		}
	}
	return ""
}

// suffixTable is a suffix list split by last byte, each part in the list's order: the first
// suffix of the list that ends the word is the first of its part that does.
type suffixTable [256][]string

func newSuffixTable(list ...string) (t suffixTable) {
	for _, s := range list {
		t[s[len(s)-1]] = append(t[s[len(s)-1]], s)
	}
	return
}

var (
	p2Step1a = newSuffixTable("sses", "ied", "ies", "us", "ss", "s")
	p2Step1b = newSuffixTable("eedly", "ingly", "edly", "ing", "eed", "ed")
	p2Step2  = newSuffixTable("ational", "fulness", "iveness", "ization", "ousness",
		"biliti", "lessli", "tional", "alism", "aliti", "ation",
		"entli", "fulli", "iviti", "ousli", "anci", "abli",
		"alli", "ator", "enci", "izer", "bli", "ogi", "li")
	p2Step3 = newSuffixTable("ational", "tional", "alize", "icate", "ative",
		"iciti", "ical", "ful", "ness")
	p2Step4 = newSuffixTable("ement", "ance", "ence", "able", "ible", "ment",
		"ent", "ant", "ism", "ate", "iti", "ous", "ive",
		"ize", "ion", "al", "er", "ic")
)

// firstSuffixIn is firstSuffix over a split list.
func (w *p2word) firstSuffixIn(t *suffixTable) string {
	if w.n == 0 {
		return ""
	}
	for _, s := range t[w.b[w.n-1]] {
		if w.hasSuffix(s) {
			return s
		}
	}
	return ""
}

// clamp is the library's resetR1R2: region starts never pass the end of the word.
func (w *p2word) clamp() {
	w.r1, w.r2 = min(w.r1, w.n), min(w.r2, w.n)
}

func (w *p2word) cut(k int) {
	w.n -= k
	w.clamp()
}

func (w *p2word) replace(suffix, repl string) {
	w.n -= len(suffix)
	w.n += copy(w.b[w.n:], repl)
	w.clamp()
}

// endsShort is the library's endsShortSyllable on b[:i].
func (w *p2word) endsShort(i int) bool {
	switch {
	case i == 2:
		return isVowel2(w.b[0]) && !isVowel2(w.b[1])
	case i >= 3:
		s1, s2, s3 := w.b[i-1], w.b[i-2], w.b[i-3]
		return !isVowel2(s1) && s1 != 'w' && s1 != 'x' && s1 != 'Y' && isVowel2(s2) && !isVowel2(s3)
	}
	return false
}

// vnv is the library's romance.VnvSuffix: the index after the first non-vowel that follows a
// vowel at or after start, or n.
func (w *p2word) vnv(start int) int {
	for j := start + 1; j < w.n; j++ {
		if isVowel2(w.b[j-1]) && !isVowel2(w.b[j]) {
			return j + 1
		}
	}
	return w.n
}

func stemASCII(word string) (string, bool) {
	if len(word) > porter2Max || (len(word) > 0 && word[0] == '\'') {
		return "", false
	}
	for i := 0; i < len(word); i++ {
		c := word[i]
		if c >= 0x80 || c <= ' ' || c == 0x7f || (c >= 'A' && c <= 'Z') {
			return "", false
		}
	}
	if len(word) <= 2 {
		return word, true
	}
	if s, ok := porter2Special(word); ok {
		return s, true
	}
	var w p2word
	w.n = copy(w.b[:], word)
	// Preprocess: y at the start or after a vowel is a consonant (Y), left to right.
	for i := 0; i < w.n; i++ {
		if w.b[i] == 'y' && (i == 0 || isVowel2(w.b[i-1])) {
			w.b[i] = 'Y'
		}
	}
	w.r1 = -1
	for _, p := range [...]string{"gener", "commun", "arsen"} {
		if len(p) <= w.n && string(w.b[:len(p)]) == p {
			w.r1 = len(p)
			break
		}
	}
	if w.r1 < 0 {
		w.r1 = w.vnv(0)
	}
	w.r2 = w.vnv(w.r1)

	// Step 0.
	if s := w.firstSuffix("'s'", "'s", "'"); s != "" {
		w.cut(len(s))
	}
	// Step 1a.
	switch s := w.firstSuffixIn(&p2Step1a); s {
	case "sses":
		w.replace(s, "ss")
	case "ies", "ied":
		if w.n > 4 {
			w.replace(s, "i")
		} else {
			w.replace(s, "ie")
		}
	case "s":
		for i := 0; i < w.n-2; i++ {
			if isVowel2(w.b[i]) {
				w.cut(1)
				break
			}
		}
	}
	// Step 1b.
	switch s := w.firstSuffixIn(&p2Step1b); s {
	case "eed", "eedly":
		if len(s) <= w.n-w.r1 {
			w.replace(s, "ee")
		}
	case "ed", "edly", "ing", "ingly":
		vowel := false
		for i := 0; i < w.n-len(s); i++ {
			if isVowel2(w.b[i]) {
				vowel = true
				break
			}
		}
		if !vowel {
			break
		}
		r1, r2 := w.r1, w.r2
		w.cut(len(s))
		switch t := w.firstSuffix("at", "bl", "iz", "bb", "dd", "ff", "gg", "mm", "nn", "pp", "rr", "tt"); t {
		case "":
			if w.r1 >= w.n && w.endsShort(w.n) {
				w.b[w.n] = 'e'
				w.n++
				w.r1, w.r2 = w.n, w.n
				goto step1c
			}
		case "at", "bl", "iz":
			w.b[w.n] = 'e'
			w.n++
		default:
			w.n--
		}
		w.r1, w.r2 = min(r1, w.n), min(r2, w.n)
	}
step1c:
	if w.n > 2 && (w.b[w.n-1] == 'y' || w.b[w.n-1] == 'Y') && !isVowel2(w.b[w.n-2]) {
		w.b[w.n-1] = 'i'
	}
	// Step 2.
	if s := w.firstSuffixIn(&p2Step2); s != "" && len(s) <= w.n-w.r1 {
		switch s {
		case "li":
			if w.n >= 3 {
				switch w.b[w.n-3] {
				case 'c', 'd', 'e', 'g', 'h', 'k', 'm', 'n', 'r', 't':
					w.cut(2)
				}
			}
		case "ogi":
			if w.n >= 4 && w.b[w.n-4] == 'l' {
				w.replace(s, "og")
			}
		default:
			w.replace(s, porter2Step2(s))
		}
	}
	// Step 3.
	if s := w.firstSuffixIn(&p2Step3); s != "" && len(s) <= w.n-w.r1 {
		switch s {
		case "ative":
			if w.n-w.r2 >= 5 {
				w.cut(len(s))
			}
		case "ational":
			w.replace(s, "ate")
		case "tional":
			w.replace(s, "tion")
		case "alize":
			w.replace(s, "al")
		case "icate", "iciti", "ical":
			w.replace(s, "ic")
		default: // ful, ness
			w.cut(len(s))
		}
	}
	// Step 4.
	if s := w.firstSuffixIn(&p2Step4); s != "" && len(s) <= w.n-w.r2 {
		if s != "ion" {
			w.cut(len(s))
		} else if w.n >= 4 && (w.b[w.n-4] == 's' || w.b[w.n-4] == 't') {
			w.cut(len(s))
		}
	}
	// Step 5.
	if lri := w.n - 1; w.r1 <= lri {
		if w.b[lri] == 'e' {
			if w.r2 <= lri || !w.endsShort(lri) {
				w.cut(1)
			}
		} else if w.r2 <= lri && w.b[lri] == 'l' && lri >= 1 && w.b[lri-1] == 'l' {
			w.cut(1)
		}
	}
	// Postprocess: Y back to y.
	same := w.n <= len(word)
	for i := 0; i < w.n; i++ {
		if w.b[i] == 'Y' {
			w.b[i] = 'y'
		}
		if same && w.b[i] != word[i] {
			same = false
		}
	}
	if same {
		return word[:w.n], true // most stems are a prefix of their word: no allocation
	}
	return string(w.b[:w.n]), true
}

// porter2Step2 is step 2's replacement of each suffix (other than li and ogi).
func porter2Step2(suffix string) string {
	switch suffix {
	case "tional":
		return "tion"
	case "enci":
		return "ence"
	case "anci":
		return "ance"
	case "abli":
		return "able"
	case "entli":
		return "ent"
	case "izer":
		return "ize"
	case "ization":
		return "ize"
	case "ational":
		return "ate"
	case "ation":
		return "ate"
	case "ator":
		return "ate"
	case "alism":
		return "al"
	case "aliti":
		return "al"
	case "alli":
		return "al"
	case "fulness":
		return "ful"
	case "ousli":
		return "ous"
	case "ousness":
		return "ous"
	case "iveness":
		return "ive"
	case "iviti":
		return "ive"
	case "biliti":
		return "ble"
	case "bli":
		return "ble"
	case "fulli":
		return "ful"
	case "lessli":
		return "less"
	}
	return ""
}

// porter2Special returns the library's stem of one of its exception words (stemSpecialWord),
// checked on the whole word before any step; ok is false for other words. A switch on
// constant strings compiles to comparisons by length and bytes, with no hashing.
func porter2Special(w string) (string, bool) {
	switch w {
	case "skis":
		return "ski", true
	case "skies":
		return "sky", true
	case "dying":
		return "die", true
	case "lying":
		return "lie", true
	case "tying":
		return "tie", true
	case "idly":
		return "idl", true
	case "gently":
		return "gentl", true
	case "ugly":
		return "ugli", true
	case "early":
		return "earli", true
	case "only":
		return "onli", true
	case "singly":
		return "singl", true
	case "sky":
		return "sky", true
	case "news":
		return "news", true
	case "howe":
		return "howe", true
	case "atlas":
		return "atlas", true
	case "cosmos":
		return "cosmos", true
	case "bias":
		return "bias", true
	case "andes":
		return "andes", true
	case "inning":
		return "inning", true
	case "innings":
		return "inning", true
	case "outing":
		return "outing", true
	case "outings":
		return "outing", true
	case "canning":
		return "canning", true
	case "cannings":
		return "canning", true
	case "herring":
		return "herring", true
	case "herrings":
		return "herring", true
	case "earring":
		return "earring", true
	case "earrings":
		return "earring", true
	case "proceed":
		return "proceed", true
	case "proceeds":
		return "proceed", true
	case "proceeded":
		return "proceed", true
	case "proceeding":
		return "proceed", true
	case "exceed":
		return "exceed", true
	case "exceeds":
		return "exceed", true
	case "exceeded":
		return "exceed", true
	case "exceeding":
		return "exceed", true
	case "succeed":
		return "succeed", true
	case "succeeds":
		return "succeed", true
	case "succeeded":
		return "succeed", true
	case "succeeding":
		return "succeed", true
	}
	return "", false
}
