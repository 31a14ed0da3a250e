package demotown

import (
	"math/rand/v2"
	"strconv"
)

// PII span types recorded in Truth.PII.
const (
	PIIName         = "name"          // a listed given name and/or surname
	PIIPhone        = "phone"         // NANP number in 555-0100..555-0199, optional extension
	PIIEmail        = "email"         // at example.com, example.org or example.net (RFC 2606)
	PIIPlate        = "plate"         // a licence plate after a cue (plate, tag, registration)
	PIIVIN          = "vin"           // 17 characters with a valid 49 CFR 565 check digit
	PIIDOB          = "dob"           // a date of birth (the date only; the cue is outside)
	PIIAge          = "age"           // the number of an age ("23" in "23 y/o")
	PIIAddress      = "address"       // house number, street name, USPS suffix [, Apt ...]
	PIIAddressBlock = "address_block" // "400 block of Marrowell St"
	PIIIntersection = "intersection"  // "Elm St and 4th Ave"
	PIICase         = "case_number"   // "24-001234" after a case cue
	PIISSN          = "ssn"           // NNN-NN-NNNN, area 001-665, group 01-99, serial 0001-9999
)

// vinValue is the 49 CFR Part 565 transliteration of VIN characters to values: digits are
// themselves, and
//
//	A=1 B=2 C=3 D=4 E=5 F=6 G=7 H=8   J=1 K=2 L=3 M=4 N=5 P=7 R=9
//	S=2 T=3 U=4 V=5 W=6 X=7 Y=8 Z=9   (I, O and Q are never used)
//
// (written from memory and checked against the table of Wikibooks' "Vehicle Identification
// Numbers (VIN codes)/Check digit"; common practice).
func vinValue(c byte) int {
	switch {
	case c >= '0' && c <= '9':
		return int(c - '0')
	case c >= 'A' && c <= 'H':
		return int(c-'A') + 1
	case c >= 'J' && c <= 'N':
		return int(c-'J') + 1
	case c == 'P':
		return 7
	case c == 'R':
		return 9
	case c >= 'S' && c <= 'Z':
		return int(c-'S') + 2
	}
	return -1
}

// vinWeights are the position weights of 49 CFR Part 565, positions 1 to 17; position 9 holds
// the check digit and weighs 0.
var vinWeights = [17]int{8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2}

// VINCheckDigit returns the check digit of a 17-character VIN (its 9th character):
//
//	r = sum_i {value(c_i) * weight_i} mod 11
//
// written as '0'..'9', or 'X' when r = 10. It returns 0 when vin is not 17 characters of
// the VIN alphabet (digits and A-Z without I, O, Q).
func VINCheckDigit(vin string) byte {
	if len(vin) != 17 {
		return 0
	}
	sum := 0
	for i := 0; i < 17; i++ {
		v := vinValue(vin[i])
		if v < 0 {
			return 0
		}
		sum += v * vinWeights[i]
	}
	r := sum % 11
	if r == 10 {
		return 'X'
	}
	return byte('0' + r)
}

const (
	vinAlphabet   = "0123456789ABCDEFGHJKLMNPRSTUVWXYZ"
	yearAlphabet  = "123456789ABCDEFGHJKLMNPRSTVWXY" // model-year codes: no U, Z or 0
	plateLetters  = "ABCDEFGHJKLMNPRSTUVWXYZ"        // no I, O, Q on plates here
	digitAlphabet = "0123456789"
)

func pick(r *rand.Rand, s string) byte { return s[r.IntN(len(s))] }

// appendVIN appends an invented VIN with a valid check digit.
func appendVIN(dst []byte, r *rand.Rand) []byte {
	var v [17]byte
	for i := range v {
		v[i] = pick(r, vinAlphabet)
	}
	v[9] = pick(r, yearAlphabet)
	v[8] = '0'
	v[8] = VINCheckDigit(string(v[:]))
	return append(dst, v[:]...)
}

// appendPhone appends a number in 555-0100..555-0199 in one of several NANP formats, with
// an occasional extension.
func appendPhone(dst []byte, r *rand.Rand) []byte {
	line := strconv.Itoa(100 + r.IntN(100))
	switch r.IntN(8) {
	case 0:
		dst = append(dst, "555-0"...)
	case 1:
		dst = append(dst, "(555) 555-0"...)
	case 2, 3:
		dst = append(dst, "555-555-0"...)
	case 4:
		dst = append(dst, "555.555.0"...)
	case 5:
		dst = append(dst, "+1 555 555 0"...)
	case 6:
		dst = append(dst, "(555)555-0"...)
	default:
		dst = append(dst, "1-555-555-0"...)
	}
	dst = append(dst, line...)
	switch r.IntN(12) {
	case 0:
		dst = append(dst, " ext. "...)
		dst = strconv.AppendInt(dst, int64(1+r.IntN(400)), 10)
	case 1:
		dst = append(dst, " x"...)
		dst = strconv.AppendInt(dst, int64(10+r.IntN(90)), 10)
	}
	return dst
}

func appendPlate(dst []byte, r *rand.Rand) []byte {
	switch r.IntN(4) {
	case 0, 1: // ABC1234
		for i := 0; i < 3; i++ {
			dst = append(dst, pick(r, plateLetters))
		}
		for i := 0; i < 4; i++ {
			dst = append(dst, pick(r, digitAlphabet))
		}
	case 2: // 7ABC123
		dst = append(dst, byte('1'+r.IntN(9)))
		for i := 0; i < 3; i++ {
			dst = append(dst, pick(r, plateLetters))
		}
		for i := 0; i < 3; i++ {
			dst = append(dst, pick(r, digitAlphabet))
		}
	default: // AB 12345
		dst = append(dst, pick(r, plateLetters), pick(r, plateLetters), ' ')
		for i := 0; i < 5; i++ {
			dst = append(dst, pick(r, digitAlphabet))
		}
	}
	return dst
}

func append2(dst []byte, n int) []byte {
	return append(dst, byte('0'+n/10), byte('0'+n%10))
}

// appendDate appends a date of birth between 1946 and 2007 as M/D/YYYY, MM/DD/YYYY or M/D/YY.
func appendDate(dst []byte, r *rand.Rand) []byte {
	y, m, d := 1946+r.IntN(62), 1+r.IntN(12), 1+r.IntN(28)
	switch r.IntN(3) {
	case 0:
		dst = append2(dst, m)
		dst = append(dst, '/')
		dst = append2(dst, d)
		dst = append(dst, '/')
		return strconv.AppendInt(dst, int64(y), 10)
	case 1:
		dst = strconv.AppendInt(dst, int64(m), 10)
		dst = append(dst, '/')
		dst = strconv.AppendInt(dst, int64(d), 10)
		dst = append(dst, '/')
		return strconv.AppendInt(dst, int64(y), 10)
	}
	dst = strconv.AppendInt(dst, int64(m), 10)
	dst = append(dst, '/')
	dst = strconv.AppendInt(dst, int64(d), 10)
	dst = append(dst, '/')
	return append2(dst, y%100)
}

// appendSSN appends an invented number in the issuable format (area 001-665, group 01-99,
// serial 0001-9999). The numbers are random; none is taken from any person.
func appendSSN(dst []byte, r *rand.Rand) []byte {
	for {
		a, g, s := 1+r.IntN(665), 1+r.IntN(99), 1+r.IntN(9999)
		if a == 78 && g == 5 && s == 1120 { // the famous wallet-card sample number
			continue
		}
		dst = append(dst, byte('0'+a/100))
		dst = append2(dst, a%100)
		dst = append(dst, '-')
		dst = append2(dst, g)
		dst = append(dst, '-')
		dst = append2(dst, s/100)
		return append2(dst, s%100)
	}
}

func appendCase(dst []byte, r *rand.Rand, year int) []byte {
	dst = append2(dst, year%100)
	dst = append(dst, '-')
	return append6(dst, 1+r.IntN(99999))
}

func lowerASCII(dst []byte, s string) []byte {
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c >= 'A' && c <= 'Z' {
			c += 'a' - 'A'
		}
		dst = append(dst, c)
	}
	return dst
}

func appendEmail(dst []byte, r *rand.Rand, first, last string) []byte {
	switch r.IntN(4) {
	case 0:
		dst = lowerASCII(dst, first)
		dst = append(dst, '.')
		dst = lowerASCII(dst, last)
		return append(dst, "@example.com"...)
	case 1:
		dst = lowerASCII(dst, first[:1])
		dst = lowerASCII(dst, last)
		dst = strconv.AppendInt(dst, int64(r.IntN(100)), 10)
		return append(dst, "@example.org"...)
	case 2:
		dst = lowerASCII(dst, last)
		dst = append(dst, '_')
		dst = lowerASCII(dst, first)
		return append(dst, "@example.net"...)
	}
	dst = lowerASCII(dst, first)
	dst = strconv.AppendInt(dst, int64(1960+r.IntN(45)), 10)
	return append(dst, "@mail.example.com"...)
}
