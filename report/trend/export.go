package trend

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
)

// Kind is the type of a table column, which decides its JSON form.
type Kind int

const (
	// Text columns are JSON strings.
	Text Kind = iota
	// Number columns are JSON numbers; a withheld value is the string "<10" or
	// "withheld" (see Publish), an empty one null.
	Number
	// Bool columns are JSON true/false.
	Bool
)

// Column is one column of a Table.
type Column struct {
	Name string
	Kind Kind
}

// Table is a tidy table ready to write: one row per observation, every value already
// formatted (integers in decimal, other numbers with 6 decimals, booleans as true/false,
// missing values empty, withheld values as Publish.Withheld). Build one with SeriesTable,
// FlagTable, TrendTable, GroupTable.Table, GroupTestTable or WordTable.
type Table struct {
	Name    string
	Columns []Column
	Rows    [][]string
	// Threshold is the suppression threshold used; 0 when nothing was withheld because
	// the table was made with Publish.Everything.
	Threshold int
	private   bool
}

// Private reports whether t was made with Publish.Everything and so may hold counts
// below the threshold.
func (t *Table) Private() bool { return t.private }

// ErrPrivate is returned when a private table would be written anywhere but to a file
// whose name contains "private".
var ErrPrivate = errors.New("trend: table has unsuppressed small counts; write it only to a file whose name contains \"private\"")

// WriteCSV writes t as CSV (RFC 4180, with a header row of column names). A text value
// that begins with =, +, -, @, tab or carriage return gets a leading apostrophe so that
// spreadsheet programs show it instead of running it as a formula (group values and
// labels come from the data; the guard is common practice, after OWASP's advice on CSV
// injection). It returns ErrPrivate for a private table.
func (t *Table) WriteCSV(w io.Writer) error {
	if t.private {
		return ErrPrivate
	}
	return t.writeCSV(w)
}

// WriteJSON writes t as JSON:
//
//	{"table": name, "withheld_below": threshold, "rows": [{column: value, ...}, ...]}
//
// with the keys of each row in column order and values typed by Kind. It returns
// ErrPrivate for a private table.
func (t *Table) WriteJSON(w io.Writer) error {
	if t.private {
		return ErrPrivate
	}
	return t.writeJSON(w)
}

func (t *Table) writeCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	head := make([]string, len(t.Columns))
	for i, c := range t.Columns {
		head[i] = c.Name
	}
	cw.Write(head)
	rec := make([]string, len(t.Columns))
	for _, r := range t.Rows {
		for j, v := range r {
			rec[j] = v
			if t.Columns[j].Kind == Text && v != "" && strings.ContainsRune("=+-@\t\r", rune(v[0])) {
				rec[j] = "'" + v
			}
		}
		cw.Write(rec)
	}
	cw.Flush()
	return cw.Error()
}

func (t *Table) writeJSON(w io.Writer) error {
	var b bytes.Buffer
	fmt.Fprintf(&b, "{\"table\": %s, \"withheld_below\": %d, \"rows\": [", jsonString(t.Name), t.Threshold)
	for i, r := range t.Rows {
		if i > 0 {
			b.WriteByte(',')
		}
		b.WriteString("\n {")
		for j, c := range t.Columns {
			if j > 0 {
				b.WriteString(", ")
			}
			b.WriteString(jsonString(c.Name))
			b.WriteString(": ")
			v := r[j]
			switch {
			case c.Kind == Number && v == "":
				b.WriteString("null")
			case c.Kind == Number && isNumber(v), c.Kind == Bool && (v == "true" || v == "false"):
				b.WriteString(v)
			default:
				b.WriteString(jsonString(v))
			}
		}
		b.WriteByte('}')
	}
	b.WriteString("\n]}\n")
	_, err := w.Write(b.Bytes())
	return err
}

// jsonString quotes s as a JSON string without HTML escaping ("<10" stays readable).
func jsonString(s string) string {
	var b bytes.Buffer
	e := json.NewEncoder(&b)
	e.SetEscapeHTML(false)
	e.Encode(s) // a string always encodes
	return strings.TrimSuffix(b.String(), "\n")
}

func isNumber(s string) bool {
	f, err := strconv.ParseFloat(s, 64)
	return err == nil && !math.IsInf(f, 0) && !math.IsNaN(f) && !strings.ContainsAny(s, "xXpP_") && s[0] != '+' && s[0] != '.'
}

// WriteFiles writes t as CSV to path and as JSON beside it (path with its extension
// replaced by ".json"). A private table (Publish.Everything) is written only if the
// file name of path contains "private" (any case); otherwise WriteFiles returns
// ErrPrivate and writes nothing. Both files are rendered in memory first, so a failure
// leaves no half-written table behind.
func WriteFiles(path string, t *Table) error {
	if t.private && !strings.Contains(strings.ToLower(filepath.Base(path)), "private") {
		return fmt.Errorf("%s: %w", path, ErrPrivate)
	}
	jsonPath := strings.TrimSuffix(path, filepath.Ext(path)) + ".json"
	if jsonPath == path {
		return fmt.Errorf("trend: %s: the CSV file needs an extension other than .json", path)
	}
	var c, j bytes.Buffer
	if err := t.writeCSV(&c); err != nil {
		return err
	}
	if err := t.writeJSON(&j); err != nil {
		return err
	}
	if err := os.WriteFile(path, c.Bytes(), 0o644); err != nil {
		return err
	}
	return os.WriteFile(jsonPath, j.Bytes(), 0o644)
}

// Formatting helpers.

func fmtFloat(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return ""
	}
	s := strconv.FormatFloat(x, 'f', 6, 64)
	if s == "-0.000000" {
		s = "0.000000"
	}
	return s
}

// fmtP formats a p-value: 6 decimals, or 'e' notation with 6 significant digits when
// below 0.0001 so that small p-values keep their size.
func fmtP(x float64) string {
	if x < 1e-4 && x > 0 {
		return strconv.FormatFloat(x, 'e', 5, 64)
	}
	return fmtFloat(x)
}

func fmtBool(b bool) string { return strconv.FormatBool(b) }

// NewTable returns an empty table for rows built elsewhere (report/export builds some):
// made with p.Everything it is private, otherwise it records p's threshold. The caller
// formats every value as the tables here do (integers in decimal, other numbers with 6
// decimals) and withholds what p says to.
func NewTable(name string, p Publish, cols ...Column) *Table { return newTable(name, p, cols...) }

func newTable(name string, p Publish, cols ...Column) *Table {
	t := &Table{Name: name, Columns: cols, private: p.Everything}
	if !p.Everything {
		t.Threshold = p.threshold()
	}
	return t
}

func label(labels []string, k int) string {
	if k < len(labels) {
		return labels[k]
	}
	return ""
}
