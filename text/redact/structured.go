package redact

import (
	"regexp"
	"strconv"
	"strings"
	"unicode/utf8"
)

// wordBefore reports whether the rune before s is a letter or digit.
func (d *doc) wordBefore(s int) bool {
	if s <= 0 {
		return false
	}
	r, _ := utf8.DecodeLastRuneInString(d.text[:s])
	return isWordRune(r)
}

// wordAfter reports whether the rune at e is a letter or digit.
func (d *doc) wordAfter(e int) bool {
	if e >= len(d.text) {
		return false
	}
	r, _ := utf8.DecodeRuneInString(d.text[e:])
	return isWordRune(r)
}

// cueBefore reports whether re matches within the window bytes before s.
func (d *doc) cueBefore(s, window int, re *regexp.Regexp) bool {
	a := s - window
	if a < 0 {
		a = 0
	}
	return re.MatchString(d.text[a:s])
}

// scan runs re over the parts of the text around trigger offsets and calls f with each
// match's submatch offsets made absolute. Each trigger t is widened to
// [t-before, t+after), then out to whitespace on both sides so that \b and the detectors'
// own boundary checks see what they would in the whole text; overlapping windows merge.
// Running the regexps only where a match can be keeps redaction fast on long narratives.
func (d *doc) scan(re *regexp.Regexp, trig []int, before, after int, f func(m []int)) {
	if len(trig) == 0 {
		return
	}
	text := d.text
	ws := make([][2]int, 0, len(trig))
	for _, t := range trig {
		a, b := t-before, t+after
		if a < 0 {
			a = 0
		}
		if b > len(text) {
			b = len(text)
		}
		// widen to whitespace, but never back past the previous window nor more than 256
		// bytes, and forward only past the previous window: linear in all.
		floor := a - 256
		if n := len(ws); n > 0 && ws[n-1][1] > floor {
			floor = ws[n-1][1]
		}
		for a > 0 && a > floor && !isSpaceByte(text[a-1]) {
			a--
		}
		if n := len(ws); n == 0 || b > ws[n-1][1] {
			for b < len(text) && !isSpaceByte(text[b]) {
				b++
			}
		}
		if n := len(ws); n > 0 && a <= ws[n-1][1] {
			if b > ws[n-1][1] {
				ws[n-1][1] = b
			}
			continue
		}
		ws = append(ws, [2]int{a, b})
	}
	for _, w := range ws {
		win := text[w[0]:w[1]]
		if !mayMatch(re, win) {
			continue
		}
		ms, ok := d.memo.get(re, win)
		if !ok {
			ms = findAll(re, win)
			d.memo.put(re, win, ms)
		}
		for _, m := range ms {
			f(d.shifted(m, w[0]))
		}
	}
}

// shifted returns m, a match in a window starting at off, in text offsets. The result is
// a scratch slice, valid until the next call: detectors read it and keep only numbers.
func (d *doc) shifted(m []int, off int) []int {
	d.scratch = append(d.scratch[:0], m...)
	for i, v := range d.scratch {
		if v >= 0 {
			d.scratch[i] = v + off
		}
	}
	return d.scratch
}

// scanAt runs re, anchored at each trigger, over [t, t+after) widened forward to
// whitespace, and calls f with the absolute offsets of a match that starts at t. The small
// windows let the regexp package use its backtracker instead of its slower NFA for
// patterns with large alternations (the street suffixes). re must start with \b or match
// only at a word start; a trigger that continues a word is skipped.
func (d *doc) scanAt(re *regexp.Regexp, trig []int, after int, f func(m []int)) {
	text := d.text
	for _, t := range trig {
		if d.wordBefore(t) {
			continue
		}
		b := t + after
		if b > len(text) {
			b = len(text)
		}
		for b < len(text) && !isSpaceByte(text[b]) && b-t < 4*after {
			b++
		}
		win := text[t:b]
		if !mayMatch(re, win) {
			continue
		}
		var m []int
		if ms, ok := d.memo.get(re, win); ok {
			if len(ms) > 0 {
				m = ms[0]
			}
		} else {
			m = pick(re, win, true).FindStringSubmatchIndex(win)
			if m == nil {
				d.memo.put(re, win, nil)
			} else {
				d.memo.put(re, win, [][]int{m})
			}
		}
		if m == nil || m[0] != 0 {
			continue
		}
		f(d.shifted(m, t))
	}
}

func isSpaceByte(b byte) bool {
	return b == ' ' || b == '\n' || b == '\t' || b == '\r' || b == '\f' || b == '\v'
}

// triggers returns the starts of tokens for which keep is true, in order.
func (d *doc) triggers(keep func(i int) bool) []int {
	var out []int
	for i := range d.toks {
		if keep(i) {
			out = append(out, d.toks[i].start)
		}
	}
	return out
}

// numLen returns a trigger test for digit tokens of the given lengths.
func (d *doc) numLen(ls ...int) func(i int) bool {
	return func(i int) bool {
		if d.toks[i].kind != tNum {
			return false
		}
		n := d.toks[i].end - d.toks[i].start
		for _, l := range ls {
			if n == l {
				return true
			}
		}
		return false
	}
}

// E-mail: RFC 5322 section 3.4.1 addr-spec restricted to dot-atom local parts (atext of
// section 3.2.3 minus the quote characters ' and `) and a domain of dotted labels (RFC 1035
// letters, digits, inner hyphens) ending in a label of two or more letters.
var emailRe = regexp.MustCompile(`[A-Za-z0-9!#$%&*+/=?^_{|}~-]+(?:\.[A-Za-z0-9!#$%&*+/=?^_{|}~-]+)*@(?:[A-Za-z0-9](?:[A-Za-z0-9-]{0,61}[A-Za-z0-9])?\.)+[A-Za-z]{2,63}`)

func (d *doc) emails(cs []cand) []cand {
	var at []int
	for i := 0; i < len(d.text); i++ {
		if d.text[i] == '@' {
			at = append(at, i)
		}
	}
	d.scan(emailRe, at, 0, 1, func(m []int) {
		if !d.wordAfter(m[1]) {
			cs = append(cs, cand{typ: Email, start: m[0], end: m[1]})
		}
	})
	return cs
}

// Phone: North American Numbering Plan, NPA-NXX-XXXX. The area code (NPA) and the central
// office code (NXX) both start with 2-9 (NANPA and ATIS numbering guidelines, from
// memory). An optional country code 1 and an extension ("ext. 12", "x12", "#12") may follow.
var (
	phoneRe      = regexp.MustCompile(`(?:\+\s?1[ .-]?|\b1[ .-])?(?:\(\s?([2-9][0-9]{2})\s?\)[ .-]?|\b([2-9][0-9]{2})([ .-]?))([2-9][0-9]{2})([ .-]?)([0-9]{4})(?:\s{0,2}(?i:ext\.?|extension|x|#)\s{0,2}[0-9]{1,6})?`)
	phone7Re     = regexp.MustCompile(`\b[2-9][0-9]{2}[.-][0-9]{4}\b(?:\s{0,2}(?i:ext\.?|extension|x|#)\s{0,2}[0-9]{1,6}\b)?`)
	phoneCueRe   = regexp.MustCompile(`(?i)(?:\b(?:phone|ph|tel|telephone|cell|cellphone|mobile|call|called|calling|callback|cb|contact|number|num|nbr|fax|home|work|reached|text|texted|pager|at)\b|#)[^.\n]*$`)
	phoneDigitRe = regexp.MustCompile(`^[0-9]+$`)
)

func (d *doc) phones(cs []cand) []cand {
	trig := d.triggers(d.numLen(3, 10, 11))
	d.scan(phoneRe, trig, 4, 32, func(m []int) {
		s, e := m[0], m[1]
		if d.wordBefore(s) || d.wordAfter(e) {
			return
		}
		// a run of ten digits with nothing between them needs a cue.
		if m[2] < 0 && m[6] == m[7] && m[10] == m[11] && d.text[s] != '+' && !d.cueBefore(s, 24, phoneCueRe) {
			return
		}
		if s > 1 && (d.text[s-1] == '-' || d.text[s-1] == '/') && isDigitByte(d.text[s-2]) {
			return // part of a longer dashed number
		}
		cs = append(cs, cand{typ: Phone, start: s, end: e})
	})
	d.scan(phone7Re, d.triggers(d.numLen(3)), 0, 24, func(m []int) {
		s, e := m[0], m[1]
		if s > 0 && (d.text[s-1] == '-' || d.text[s-1] == '.' || d.text[s-1] == ')') {
			return
		}
		if e < len(d.text)-1 && (d.text[e] == '-' || d.text[e] == '.') && isDigitByte(d.text[e+1]) {
			return
		}
		if d.wordAfter(e) || !d.cueBefore(s, 24, phoneCueRe) {
			return
		}
		cs = append(cs, cand{typ: Phone, start: s, end: e})
	})
	return cs
}

func isDigitByte(b byte) bool { return b >= '0' && b <= '9' }

// SSN: AAA-GG-SSSS. The Social Security Administration has never issued area 000, 666 or
// 900-999, group 00 or serial 0000 (SSA, "Social Security Number Randomization", 2011, from
// memory). Numbers without dashes, or with spaces, count only after a cue.
var (
	ssnRe    = regexp.MustCompile(`\b([0-9]{3})([ -]?)([0-9]{2})([ -]?)([0-9]{4})\b`)
	ssnCueRe = regexp.MustCompile(`(?i)\b(?:ssn|ssan|ss|soc\.?\s?sec|social\s+security|social)\b[^.\n]*$`)
)

// validSSN applies the SSA's never-issued rules to the digits.
func validSSN(area, group, serial string) bool {
	a, _ := strconv.Atoi(area)
	if a == 0 || a == 666 || a >= 900 {
		return false
	}
	return group != "00" && serial != "0000"
}

func (d *doc) ssns(cs []cand) []cand {
	d.scan(ssnRe, d.triggers(d.numLen(3, 9)), 0, 12, func(m []int) {
		s, e := m[0], m[1]
		sep1, sep2 := d.text[m[4]:m[5]], d.text[m[8]:m[9]]
		if sep1 != sep2 || !validSSN(d.text[m[2]:m[3]], d.text[m[6]:m[7]], d.text[m[10]:m[11]]) {
			return
		}
		if sep1 != "-" && !d.cueBefore(s, 24, ssnCueRe) {
			return
		}
		if s > 1 && (d.text[s-1] == '-' || d.text[s-1] == '.') && isDigitByte(d.text[s-2]) {
			return
		}
		if e < len(d.text)-1 && (d.text[e] == '-' || d.text[e] == '.') && isDigitByte(d.text[e+1]) {
			return
		}
		cs = append(cs, cand{typ: SSN, start: s, end: e})
	})
	return cs
}

// VIN: 17 characters from the digits and the letters other than I, O and Q, position 9 a
// check digit (49 CFR 565.15, from memory): each character is transliterated to a number,
// multiplied by its position weight, the products summed, and the sum taken mod 11; a
// remainder of 10 is written X.
//
//	letters:  A=1 B=2 C=3 D=4 E=5 F=6 G=7 H=8 J=1 K=2 L=3 M=4 N=5 P=7 R=9
//	          S=2 T=3 U=4 V=5 W=6 X=7 Y=8 Z=9; digits are their own value
//	weights:  8 7 6 5 4 3 2 10 0 9 8 7 6 5 4 3 2  (positions 1-17)
//	check  =  (sum_i value_i * weight_i) mod 11, 10 written X
var (
	vinRe    = regexp.MustCompile(`^[A-HJ-NPR-Za-hj-npr-z0-9]{17}$`)
	vinCueRe = regexp.MustCompile(`(?i)\bvin\b[^.\n]*$`)
)

// vinWeights are the position weights of 49 CFR 565.15.
var vinWeights = [17]int{8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2}

// vinValue is the transliteration table of 49 CFR 565.15; -1 marks letters not allowed.
func vinValue(c byte) int {
	switch {
	case c >= '0' && c <= '9':
		return int(c - '0')
	case c >= 'a' && c <= 'z':
		c -= 'a' - 'A'
	}
	const table = "12345678-12345-7-923456789" // A..Z; I, O, Q not allowed
	if c < 'A' || c > 'Z' || table[c-'A'] == '-' {
		return -1
	}
	return int(table[c-'A'] - '0')
}

// VINCheckDigit returns the check digit ('0'-'9' or 'X') that 49 CFR 565.15 gives for
// vin, which must be 17 characters long, and false when vin has a character that is not
// allowed.
func VINCheckDigit(vin string) (byte, bool) {
	if len(vin) != 17 {
		return 0, false
	}
	sum := 0
	for i := 0; i < 17; i++ {
		v := vinValue(vin[i])
		if v < 0 {
			return 0, false
		}
		sum += v * vinWeights[i]
	}
	r := sum % 11
	if r == 10 {
		return 'X', true
	}
	return byte('0' + r), true
}

// ValidVIN reports whether vin is 17 allowed characters with a correct check digit.
func ValidVIN(vin string) bool {
	c, ok := VINCheckDigit(vin)
	if !ok {
		return false
	}
	p := vin[8]
	if p == 'x' {
		p = 'X'
	}
	return p == c
}

func (d *doc) vins(cs []cand) []cand {
	for _, st := range d.runs17 {
		m := []int{st, st + 17}
		v := d.text[m[0]:m[1]]
		if !vinRe.MatchString(v) {
			continue
		}
		hasDigit, hasLetter := false, false
		for i := 0; i < len(v); i++ {
			if isDigitByte(v[i]) {
				hasDigit = true
			} else {
				hasLetter = true
			}
		}
		if !hasDigit || !hasLetter {
			continue
		}
		if ValidVIN(v) || d.cueBefore(m[0], 16, vinCueRe) {
			cs = append(cs, cand{typ: VIN, start: m[0], end: m[1]})
		}
	}
	return cs
}

// Dates: M/D/YYYY, M-D-YY, YYYY-MM-DD, "January 2, 1990", "2 Jan 1990".
const (
	monthPat = `(?:Jan(?:uary)?|Feb(?:ruary)?|Mar(?:ch)?|Apr(?:il)?|May|June?|July?|Aug(?:ust)?|Sep(?:t(?:ember)?)?|Oct(?:ober)?|Nov(?:ember)?|Dec(?:ember)?)\.?`
	datePat  = `(?:[0-9]{1,2}[/.-][0-9]{1,2}[/.-](?:[0-9]{4}|[0-9]{2})|[0-9]{4}-[0-9]{1,2}-[0-9]{1,2}|` + monthPat + `\s+[0-9]{1,2}(?:st|nd|rd|th)?,?\s+[0-9]{4}|[0-9]{1,2}(?:st|nd|rd|th)?\s+` + monthPat + `,?\s+[0-9]{4})`
	dobCue   = `(?:\bd\.?\s?o\.?\s?b\b\.?|\b[a-z]{2,6}\s+of\s+birth\b|\bbirth\s?date\b|\bbirthday\b|\bborn\b)`
	dobGap   = `[\s:;,(=#-]*(?:(?:on|of|is|was|in|listed|given|as|reported|approx\.?|approximately)[\s:;,(=#-]+){0,3}`
)

var dobTrig = set("dob d date birth birthdate birthday born")

var (
	dobRe      = regexp.MustCompile(`(?i)` + dobCue + dobGap + `(` + datePat + `|[0-9]{8}|[0-9]{4})\b`)
	dobAfterRe = regexp.MustCompile(`(?i)\b(` + datePat + `)\s?\(?\s?(?:d\.?o\.?b\b\.?)`)
)

func (d *doc) dobs(cs []cand) []cand {
	trig := d.triggers(d.flagged(fDOB))
	d.scan(dobRe, trig, 16, 64, func(m []int) {
		s, e := m[2], m[3]
		if d.wordAfter(e) {
			return
		}
		v := d.text[s:e]
		if len(v) == 4 && !strings.ContainsAny(v, "/.- ") {
			// a bare year only straight after "born (in)".
			y, _ := strconv.Atoi(v)
			cue := strings.ToLower(d.text[m[0]:s])
			if y < 1900 || y > 2099 || !strings.HasPrefix(cue, "born") {
				return
			}
		}
		cs = append(cs, cand{typ: DOB, start: s, end: e})
	})
	d.scan(dobAfterRe, trig, 40, 8, func(m []int) {
		cs = append(cs, cand{typ: DOB, start: m[2], end: m[3]})
	})
	return cs
}

// Ages: "age 45", "aged 45", "23 y/o", "23 yo", "45 yoa", "45-year-old", "45 years of age".
var (
	ageTrig1 = set("age aged ages")
	ageTrig2 = set("y yo yoa yr yrs year years year-old years-old yr-old")
)

var (
	ageBeforeRe = regexp.MustCompile(`(?i)\b(?:age|aged|ages)\s?[:=]?\s?([0-9]{1,3})\b`)
	ageAfterRe  = regexp.MustCompile(`(?i)\b([0-9]{1,3})\s?-?\s?(?:y/o|y\.o\.?|yoa|yo|yrs?\.?\s?old|years?[\s-]old|years?\s+of\s+age|yr[\s-]old)`)
)

func (d *doc) ages(cs []cand) []cand {
	add := func(m []int) {
		if d.wordAfter(m[1]) {
			return
		}
		n, _ := strconv.Atoi(d.text[m[2]:m[3]])
		if n > 120 {
			return
		}
		cs = append(cs, cand{typ: Age, start: m[0], end: m[1]})
	}
	d.scan(ageBeforeRe, d.triggers(d.flagged(fAge1)), 0, 12, add)
	d.scan(ageAfterRe, d.triggers(d.flagged(fAge2)), 8, 24, add)
	return cs
}

// Plates: a cue, optional filler ("#", "no.", "number", a state code), then a plate of 2-8
// letters and digits with at least one digit, in one or two groups.
var plateTrig = set("license licence plate plates tag tags registration reg lic lp")

var plateRe = regexp.MustCompile(`(?i)\b(?:license\s+plate|licence\s+plate|plates?|tags?|registration|reg|lic|license|licence|lp)\b\.?(?:\s{0,8}(?:#|no\.?|num\.?|nbr\.?|number|:|-|reading|of|was|is|displaying|bearing|showing|state)\s{0,8}|\s+(?-i:A[LKZR]|C[AOT]|D[EC]|FL|GA|HI|I[DLNA]|K[SY]|LA|M[EDAINSOT]|N[EVHJMYCD]|O[HKR]|PA|RI|S[CD]|T[NX]|UT|V[TA]|W[AVIY]|PR)\s+)*\s{0,8}(?-i:([A-Z0-9]{1,4}(?:[ -][A-Z0-9]{1,5})?|[A-Z0-9]{5,8}))\b`)

func (d *doc) plates(cs []cand) []cand {
	d.scan(plateRe, d.triggers(d.flagged(fPlate)), 0, 48, func(m []int) {
		s, e := m[2], m[3]
		v := d.text[s:e]
		letters, digits := 0, 0
		for i := 0; i < len(v); i++ {
			switch {
			case isDigitByte(v[i]):
				digits++
			case v[i] != ' ' && v[i] != '-':
				letters++
			}
		}
		if digits == 0 || letters+digits < 2 || letters+digits > 8 {
			return
		}
		if letters == 0 {
			// all digits: at least three, and not a year.
			if digits < 3 {
				return
			}
			if y, err := strconv.Atoi(v); err == nil && len(v) == 4 && y >= 1900 && y <= 2099 {
				return
			}
		}
		// the second group of a spaced plate must hold a digit, else drop it.
		if i := strings.IndexAny(v, " "); i >= 0 && !strings.ContainsAny(v[i:], "0123456789") {
			e = s + i
			if !strings.ContainsAny(d.text[s:e], "0123456789") {
				return
			}
		}
		// "plate AZ 71305": a state code before digits is part of the plate as written.
		if letters == 0 && s >= 3 && d.text[s-1] == ' ' && isUpperByte(d.text[s-2]) && isUpperByte(d.text[s-3]) && (s == 3 || !isAlnumByte(d.text[s-4])) {
			s -= 3
		}
		cs = append(cs, cand{typ: Plate, start: s, end: e})
	})
	return cs
}

// Case numbers: a cue word, optional "#", "no.", "number", then an identifier with at least
// four digits ("24-001234", "2021-00012", "R21-3456").
var dateRe = regexp.MustCompile(`^(?:[0-9]{1,2}[/-][0-9]{1,2}[/-][0-9]{2,4}|[0-9]{4}-[0-9]{2}-[0-9]{2})$`)

var caseTrig = set("case incident inc report rpt file complaint cad event ticket citation warrant docket booking reference ref control ccn dr ir cr rms")

var caseRe = regexp.MustCompile(`(?i)\b(?:case|incident|inc|report|rpt|file|complaint|cad|event|ticket|citation|warrant|docket|booking|reference|ref|control|ccn|dr|ir|cr|rms)\b\.?((?:\s{0,8}(?:#|no\.?|num\.?|nbr\.?|number|:)\s{0,8})*)\s{0,8}([A-Z]{0,4}-?[0-9]{2,}(?:[-/][0-9A-Z]+)*)\b`)

func (d *doc) caseNos(cs []cand) []cand {
	d.scan(caseRe, d.triggers(d.flagged(fCase)), 0, 48, func(m []int) {
		marker := strings.TrimSpace(d.text[m[2]:m[3]])
		s, e := m[4], m[5]
		v := d.text[s:e]
		digits := 0
		for i := 0; i < len(v); i++ {
			if isDigitByte(v[i]) {
				digits++
			}
		}
		if digits < 4 || dateRe.MatchString(v) {
			return // too short, or a date ("incident 10/21/2000")
		}
		// "See supplemental report. 10-98, back in service": a sentence ends after the cue.
		if marker == "" && strings.Contains(d.text[m[0]:s], ". ") {
			return
		}
		if marker == "" {
			if y, err := strconv.Atoi(v); err == nil && len(v) == 4 && y >= 1900 && y <= 2099 {
				return // "incident 2017" is a year
			}
			// without a marker the number needs a dash, a letter or five digits ("Case 1150"
			// is a bulldozer); cue words that are also titles always need a marker.
			cue := strings.ToLower(d.text[m[0]:m[4]])
			if strings.HasPrefix(cue, "dr") || strings.HasPrefix(cue, "ir") || strings.HasPrefix(cue, "cr") {
				return
			}
			if digits < 5 {
				return // "Case 1150" is a bulldozer, "10-98" a radio code
			}
		}
		cs = append(cs, cand{typ: CaseNo, start: s, end: e})
	})
	return cs
}

func isUpperByte(b byte) bool { return b >= 'A' && b <= 'Z' }
