package intake

import (
	"errors"
	"fmt"
)

// PosError is a data problem at a position in an input file. Line and Column are 1-based;
// Column counts bytes of the decoded (UTF-8) line, as encoding/csv does. A zero Line or
// Column means the position is unknown or not meaningful (an empty file has no line).
type PosError struct {
	File   string
	Line   int
	Column int
	Err    error
}

// Error prints "file:line:col: msg", dropping the parts that are zero.
func (e *PosError) Error() string {
	switch {
	case e.Line > 0 && e.Column > 0:
		return fmt.Sprintf("%s:%d:%d: %v", e.File, e.Line, e.Column, e.Err)
	case e.Line > 0:
		return fmt.Sprintf("%s:%d: %v", e.File, e.Line, e.Err)
	}
	return fmt.Sprintf("%s: %v", e.File, e.Err)
}

// Unwrap returns the underlying error, so errors.Is(err, ErrEmpty) works.
func (e *PosError) Unwrap() error { return e.Err }

// Sentinel errors wrapped in a *PosError.
var (
	ErrEmpty         = errors.New("empty file")
	ErrHeaderOnly    = errors.New("header only, no data rows")
	ErrBinary        = errors.New("binary content, not a text export")
	ErrUnclosedQuote = errors.New("unclosed quote")
	ErrColumns       = errors.New("columns differ from the first file")
	ErrNoColumn      = errors.New("no such column")
	ErrNoNarrative   = errors.New("no narrative column")
	ErrDateFormat    = errors.New("bad date format option")
)

// Reason codes of a Reject. They are stable strings: exports and tests compare them.
const (
	ReasonEmptyNarrative  = "empty narrative"
	ReasonBlankRow        = "blank row"
	ReasonUnparseableDate = "unparseable date"
	ReasonImplausibleDate = "implausible date"
	// ReasonOtherDateOrder: a numeric date such as 25/12/2023 that does not read in the
	// column's day/month order (here month-first) but reads in the other one.
	ReasonOtherDateOrder  = "date in the other day/month order"
	ReasonMissingDate     = "missing date"
	ReasonDuplicateID     = "duplicate id"
	ReasonDuplicateIDText = "duplicate id, different text"
	ReasonRepeatedHeader  = "repeated header"
	ReasonRaggedRow       = "ragged row"
	ReasonBadQuoting      = "bad quoting"
	ReasonBadEncoding     = "bad encoding"
	ReasonBadJSON         = "bad json"
)
