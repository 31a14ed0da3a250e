// Package export writes the tidy CSV files that go beside the report: tagged narratives
// in wide form (one row per narrative: its strongest theme and the next two) and in long
// form (one row per narrative and theme), the theme table, and the groups of narratives
// that repeat one text (one row per narrative in a group, as a report/trend table).
//
// The files hold identifiers, dates, group values, theme numbers, labels and shares:
// never narrative text. Identifiers and group values are written as given, so pass
// redacted ones (the default of the pipeline). Text cells that a spreadsheet would run
// as a formula (starting with =, +, -, @, tab or carriage return) get a leading
// apostrophe, as OWASP's "CSV Injection" guidance recommends; numeric cells are not
// changed. Shares are written with 4 decimals, rows in the order given, so the same
// input gives byte-identical files. The columns are documented in WideColumns,
// LongColumns and ThemeColumns (and as Markdown by ColumnsMarkdown, for the README).
package export

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"undercurrent/report"
	"undercurrent/report/trend"
)

// Column documents one CSV column.
type Column struct {
	Name, Meaning string
}

// WideColumns are the columns of WriteWide, with the group columns where "<group>" is.
var WideColumns = []Column{
	{"id", "narrative reference: file:line in the input by default, the record id with -publish-ids (tag writes record ids); exports hold no narrative text"},
	{"date", "date of the narrative, YYYY-MM-DD, empty when unknown"},
	{"<group>", "one column per group column given (e.g. district), its value for the narrative"},
	{"theme", "number of the narrative's strongest theme (0-based, as in the report)"},
	{"label", "label of that theme"},
	{"share", "that theme's share of the narrative, 0 to 1"},
	{"second_theme", "number of the second strongest theme (empty when no other theme has a share: with only one theme, and for routine narratives)"},
	{"second_share", "its share"},
	{"third_theme", "number of the third strongest theme (empty likewise)"},
	{"third_share", "its share"},
}

// LongColumns are the columns of WriteLong.
var LongColumns = []Column{
	{"id", "narrative reference: file:line in the input by default, the record id with -publish-ids (tag writes record ids); exports hold no narrative text"},
	{"theme", "theme number (0-based)"},
	{"share", "the theme's share of the narrative, 0 to 1"},
}

// ThemeColumns are the columns of WriteThemes.
var ThemeColumns = []Column{
	{"theme", "theme number (0-based)"},
	{"label", "label shown in the report"},
	{"label_by", "\"person\" when a reviewer chose the label, \"program\" when it was made from the top words"},
	{"top_words", "most probable words, highest first, separated by spaces"},
	{"narratives", "narratives whose strongest theme it is, as published (may be withheld, e.g. <10)"},
	{"expected", "sum of the theme's shares over all narratives"},
	{"share", "expected divided by the number of narratives, 0 to 1"},
	{"status", "\"shown\", \"hidden\" (by the labels file) or \"merged into N\""},
	{"repeated_text", "of its narratives, how many sit in a group repeating one text (repeated-text.csv), as published; empty when no search was made"},
}

// ColumnsMarkdown returns cols as a Markdown table, for the README.
func ColumnsMarkdown(cols []Column) string {
	var b strings.Builder
	b.WriteString("| column | meaning |\n|---|---|\n")
	for _, c := range cols {
		fmt.Fprintf(&b, "| `%s` | %s |\n", c.Name, c.Meaning)
	}
	return b.String()
}

// WideRow is one narrative for WriteWide.
type WideRow struct {
	ID, Date string
	// Groups holds the values of the group columns, in the order given to WriteWide.
	Groups []string
	// Theta is the narrative's theme shares, one per theme (after ThemeMap.Fold when a
	// labels file merged themes).
	Theta []float64
}

// LongRow is one narrative and theme for WriteLong.
type LongRow struct {
	ID    string
	Theme int
	Share float64
}

// ThemeRow is one theme for WriteThemes.
type ThemeRow struct {
	ID            int
	Label         string
	LabelByPerson bool
	TopWords      []string
	Dominant      string
	Expected      float64
	Share         float64
	// Status is "shown", "hidden" or "merged into N"; empty means "shown".
	Status string
	// Copies is the published number of its narratives in repeated-text groups (Theme.Copies).
	Copies string
}

// RowError reports a row that cannot be written.
type RowError struct {
	Row int // 0-based index in the rows given
	ID  string
	Err error
}

func (e *RowError) Error() string {
	return fmt.Sprintf("export: row %d (id %q): %v", e.Row, e.ID, e.Err)
}
func (e *RowError) Unwrap() error { return e.Err }

// safe defuses a text cell that a spreadsheet would read as a formula.
func safe(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + s
	}
	return s
}

func share(v float64) string { return strconv.FormatFloat(v, 'f', 4, 64) }

func finiteShare(v float64) error {
	if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 || v > 1+1e-9 {
		return fmt.Errorf("share %v is not between 0 and 1", v)
	}
	return nil
}

// Top3 returns the narrative's strongest theme and the next two, highest share first, ties
// to the lower theme number, in best[:n]. A theme with no share is not counted: a routine
// narrative, whose share is all in the routine column, has n = 1 (when no theme has a share,
// theme 0 stands alone). It allocates nothing (the tagger calls it for every row); n is 0
// only for an empty theta.
func Top3(theta []float64) (best [3]int, n int) {
	for i, v := range theta {
		if !(v > 0) {
			continue
		}
		pos := n
		for pos > 0 && v > theta[best[pos-1]] {
			pos--
		}
		if pos < 3 {
			if n < 3 {
				n++
			}
			copy(best[pos+1:n], best[pos:n-1])
			best[pos] = i
		}
	}
	if n == 0 && len(theta) > 0 {
		n = 1
	}
	return best, n
}

// WriteWide writes one row per narrative: id, date, the group columns, the strongest
// theme with its label and share, and the next two themes with their shares (empty when
// they have no share). labels[i]
// is the label of theme i; every row's Theta must have len(labels) entries and its
// Groups len(groupCols) (a mismatch is a caller bug and panics).
func WriteWide(w io.Writer, groupCols, labels []string, rows []WideRow) error {
	cw := csv.NewWriter(w)
	head := []string{"id", "date"}
	for _, g := range groupCols {
		head = append(head, safe(g))
	}
	head = append(head, "theme", "label", "share", "second_theme", "second_share", "third_theme", "third_share")
	if err := cw.Write(head); err != nil {
		return err
	}
	rec := make([]string, len(head))
	for r, row := range rows {
		if len(row.Theta) != len(labels) {
			panic("export: WriteWide: len(Theta) does not match len(labels)")
		}
		if len(row.Groups) != len(groupCols) {
			panic("export: WriteWide: len(Groups) does not match len(groupCols)")
		}
		for _, v := range row.Theta {
			if err := finiteShare(v); err != nil {
				return &RowError{Row: r, ID: row.ID, Err: err}
			}
		}
		rec = rec[:0]
		rec = append(rec, safe(row.ID), safe(row.Date))
		for _, g := range row.Groups {
			rec = append(rec, safe(g))
		}
		best, n := Top3(row.Theta)
		if n == 0 {
			return &RowError{Row: r, ID: row.ID, Err: fmt.Errorf("no themes")}
		}
		rec = append(rec, strconv.Itoa(best[0]), safe(labels[best[0]]), share(row.Theta[best[0]]))
		for i := 1; i < 3; i++ {
			if i < n {
				rec = append(rec, strconv.Itoa(best[i]), share(row.Theta[best[i]]))
			} else {
				rec = append(rec, "", "")
			}
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// LongRows returns the rows of one narrative for WriteLong: every theme whose share is
// at least min, in theme order.
func LongRows(dst []LongRow, id string, theta []float64, min float64) []LongRow {
	for k, v := range theta {
		if v >= min {
			dst = append(dst, LongRow{ID: id, Theme: k, Share: v})
		}
	}
	return dst
}

// WriteLong writes one row per narrative and theme: id, theme, share.
func WriteLong(w io.Writer, rows []LongRow) error {
	cw := csv.NewWriter(w)
	if err := cw.Write([]string{"id", "theme", "share"}); err != nil {
		return err
	}
	for r, row := range rows {
		if err := finiteShare(row.Share); err != nil {
			return &RowError{Row: r, ID: row.ID, Err: err}
		}
		if row.Theme < 0 {
			return &RowError{Row: r, ID: row.ID, Err: fmt.Errorf("theme %d below 0", row.Theme)}
		}
		if err := cw.Write([]string{safe(row.ID), strconv.Itoa(row.Theme), share(row.Share)}); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// ThemeRows returns the theme table of the report data d: its shown themes, then its
// hidden ones, then, for each merge, the themes merged away (taken from the tree's
// leaves, which keep every theme of the model).
func ThemeRows(d *report.Data) []ThemeRow {
	var out []ThemeRow
	for _, t := range d.Themes {
		out = append(out, ThemeRow{ID: t.ID, Label: t.Label, LabelByPerson: t.LabelByPerson, TopWords: t.TopWords,
			Dominant: t.Size.Dominant, Expected: t.Size.Expected, Share: t.Size.Share, Status: "shown", Copies: t.Copies})
	}
	for _, h := range d.Hidden {
		out = append(out, ThemeRow{ID: h.ID, Label: h.Label, Status: "hidden"})
	}
	for _, t := range d.Themes {
		for _, m := range t.MergedFrom {
			out = append(out, ThemeRow{ID: m, Label: leafLabel(d, m), Status: fmt.Sprintf("merged into %d", t.ID)})
		}
	}
	return out
}

func leafLabel(d *report.Data, id int) string {
	for _, l := range d.Tree.Leaves {
		if l.Theme == id {
			return l.Label
		}
	}
	return ""
}

// WriteThemes writes the theme table.
func WriteThemes(w io.Writer, rows []ThemeRow) error {
	cw := csv.NewWriter(w)
	head := make([]string, len(ThemeColumns))
	for i, c := range ThemeColumns {
		head[i] = c.Name
	}
	if err := cw.Write(head); err != nil {
		return err
	}
	for r, t := range rows {
		if math.IsNaN(t.Expected) || math.IsInf(t.Expected, 0) {
			return &RowError{Row: r, ID: strconv.Itoa(t.ID), Err: fmt.Errorf("expected size %v not finite", t.Expected)}
		}
		by := "program"
		if t.LabelByPerson {
			by = "person"
		}
		status := t.Status
		if status == "" {
			status = "shown"
		}
		words := make([]string, len(t.TopWords))
		copy(words, t.TopWords)
		rec := []string{strconv.Itoa(t.ID), safe(t.Label), by, safe(strings.Join(words, " ")), safe(t.Dominant),
			strconv.FormatFloat(t.Expected, 'f', 1, 64), share(t.Share), status, safe(t.Copies)}
		if t.Status != "shown" && t.Status != "" {
			rec[4], rec[5], rec[6] = safe(t.Dominant), "", ""
			if t.Expected != 0 || t.Share != 0 {
				rec[5], rec[6] = strconv.FormatFloat(t.Expected, 'f', 1, 64), share(t.Share)
			}
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// CopyColumns are the columns of CopyTable.
var CopyColumns = []Column{
	{"group", "group number, 1 for the largest (as in the report)"},
	{"size", "narratives in the group"},
	{"least_similarity", "smallest cosine similarity between the words (TF-IDF) of two narratives of the group, 0 to 1"},
	{"id", "narrative reference: file:line in the input by default, the record id with -publish-ids; no narrative text"},
	{"theme", "the narrative's strongest theme (0-based, after the labels file's merges)"},
	{"label", "label of that theme"},
}

// CopyRow is one narrative of a group of narratives that repeat one text.
type CopyRow struct {
	Group, Size     int
	LeastSimilarity float64
	ID              string
	Theme           int
	Label           string
}

// CopyTable returns the rows as the "repeated_text" table (CopyColumns), in the order
// given: one row per narrative in a group. Only groups of at least p's threshold belong
// in a published table (the caller drops the others; the table says which threshold was
// used); made with p.Everything the table is private. It panics on a similarity outside
// [0, 1] or a negative theme (caller bugs).
func CopyTable(rows []CopyRow, p trend.Publish) *trend.Table {
	t := trend.NewTable("repeated_text", p,
		trend.Column{Name: "group", Kind: trend.Number}, trend.Column{Name: "size", Kind: trend.Number},
		trend.Column{Name: "least_similarity", Kind: trend.Number}, trend.Column{Name: "id", Kind: trend.Text},
		trend.Column{Name: "theme", Kind: trend.Number}, trend.Column{Name: "label", Kind: trend.Text})
	for _, r := range rows {
		if !(r.LeastSimilarity >= 0 && r.LeastSimilarity <= 1) || r.Theme < 0 {
			panic(fmt.Sprintf("export: CopyTable: row %+v out of range", r))
		}
		t.Rows = append(t.Rows, []string{strconv.Itoa(r.Group), strconv.Itoa(r.Size),
			strconv.FormatFloat(r.LeastSimilarity, 'f', 6, 64), r.ID, strconv.Itoa(r.Theme), r.Label})
	}
	return t
}
