package redact

import "strings"

// Type is a kind of personal information.
type Type uint8

// The detected types. Their String values are used in audits and benchmark output.
const (
	Name    Type = iota + 1 // a person's name
	Phone                   // a telephone number
	Email                   // an e-mail address
	SSN                     // a US Social Security number
	DOB                     // a date of birth
	Age                     // a person's age
	Plate                   // a vehicle plate or licence number
	VIN                     // a vehicle identification number
	Address                 // a street address or an intersection
	CaseNo                  // a case, incident or report number
	numTypes
)

var typeNames = [...]string{"", "name", "phone", "email", "ssn", "dob", "age", "plate", "vin", "address", "case-no"}

// placeholder keywords, the text inside the brackets.
var typeTags = [...]string{"", "NAME", "PHONE", "EMAIL", "SSN", "DOB", "AGE", "PLATE", "VIN", "ADDRESS", "CASE-NO"}

// String returns the lower-case name of t, such as "phone" or "case-no".
func (t Type) String() string {
	if t == 0 || t >= numTypes {
		return "unknown"
	}
	return typeNames[t]
}

// AllTypes lists every type in a fixed order.
func AllTypes() []Type {
	out := make([]Type, 0, numTypes-1)
	for t := Name; t < numTypes; t++ {
		out = append(out, t)
	}
	return out
}

// ParseType returns the Type whose String is s (case-insensitive). It also accepts the
// ground-truth labels of the demo corpus that are finer than Type: "case_number",
// "address_block" and "intersection".
func ParseType(s string) (Type, bool) {
	s = strings.ToLower(strings.TrimSpace(s))
	for t := Name; t < numTypes; t++ {
		if typeNames[t] == s {
			return t, true
		}
	}
	switch s {
	case "case_number", "case":
		return CaseNo, true
	case "address_block", "intersection":
		return Address, true
	}
	return 0, false
}

// TypeSet is a set of types. The zero TypeSet means every type.
type TypeSet uint32

// Types returns the set holding ts.
func Types(ts ...Type) TypeSet {
	var s TypeSet
	for _, t := range ts {
		s |= 1 << t
	}
	return s
}

// Has reports whether t is in s. Every type is in the zero TypeSet.
func (s TypeSet) Has(t Type) bool {
	if s == 0 {
		return true
	}
	return s&(1<<t) != 0
}

// Span is one replacement: Text was found at input[Start:End] and replaced by Placeholder.
type Span struct {
	Type        Type
	Start, End  int // byte offsets into the text given to Redact
	Placeholder string
	Text        string
}
