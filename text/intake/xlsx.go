package intake

import (
	"context"
	"fmt"
	"io"
	"strings"

	"github.com/xuri/excelize/v2"
)

// readXLSX reads one worksheet of an Excel workbook: Options.Sheet, or the first sheet.
// Row 1 is the header; Record.Line is the worksheet row number. Cells are read raw (no
// number format applied), so dates arrive as 1900-system serial numbers. Empty rows are
// skipped like blank CSV lines; a row with a value beyond the header's last column is
// rejected as a ragged row.
func (ps *pass) readXLSX(ctx context.Context, name string, r io.Reader, opt *Options) (t *table, err error) {
	// A damaged workbook must give an error, never a crash; excelize is not guaranteed
	// to be panic-free on arbitrary bytes.
	defer func() {
		if p := recover(); p != nil {
			t, err = nil, &PosError{File: name, Err: fmt.Errorf("%w: damaged Excel workbook (%v)", ErrBinary, p)}
		}
	}()
	return ps.readSheet(ctx, name, r, opt)
}

func (ps *pass) readSheet(ctx context.Context, name string, r io.Reader, opt *Options) (*table, error) {
	f, err := excelize.OpenReader(r)
	if err != nil {
		return nil, &PosError{File: name, Err: fmt.Errorf("cannot open Excel workbook: %v", err)}
	}
	defer f.Close()
	sheets := f.GetSheetList()
	if len(sheets) == 0 {
		return nil, &PosError{File: name, Err: fmt.Errorf("%w: workbook has no sheets", ErrEmpty)}
	}
	sheet := sheets[0]
	if opt.Sheet != "" {
		sheet = ""
		for _, s := range sheets {
			if s == opt.Sheet {
				sheet = s
			}
		}
		if sheet == "" {
			for _, s := range sheets {
				if strings.EqualFold(s, opt.Sheet) {
					sheet = s
				}
			}
		}
		if sheet == "" {
			return nil, &PosError{File: name, Err: fmt.Errorf("no sheet %q; sheets are %s", opt.Sheet, quoteList(sheets))}
		}
	}
	rows, err := f.Rows(sheet)
	if err != nil {
		return nil, &PosError{File: name, Err: err}
	}
	defer rows.Close()
	t := ps.table(FileInfo{Path: name, Format: "xlsx", Encoding: "xlsx (UTF-8 XML)", Sheet: sheet})
	t.xlsx = true
	if len(sheets) > 1 && opt.Sheet == "" {
		t.notes = append(t.notes, fmt.Sprintf("%s: workbook has %d sheets, read the first, %q (others: %s)", name, len(sheets), sheet, quoteList(sheets[1:])))
	}
	rowNum := 0
	for rows.Next() {
		rowNum++
		if rowNum&1023 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		cells, err := rows.Columns(excelize.Options{RawCellValue: true})
		if err != nil {
			return nil, &PosError{File: name, Line: rowNum, Err: err}
		}
		if t.header == nil {
			if allBlank(cells) {
				continue
			}
			t.header, t.notes = uniqueHeaderAppend(name, cells, t.notes)
			continue
		}
		if allBlank(cells) {
			continue
		}
		if len(cells) > len(t.header) {
			extra := false
			for _, c := range cells[len(t.header):] {
				if strings.TrimSpace(c) != "" {
					extra = true
				}
			}
			if extra {
				if t.rejFields == nil {
					t.rejFields = map[int][]string{}
				}
				t.rejFields[len(t.rejects)] = cells
				t.rejects = append(t.rejects, Reject{File: name, Line: rowNum, Reason: ReasonRaggedRow,
					Detail: fmt.Sprintf("values in %d columns, header has %d", len(cells), len(t.header))})
				continue
			}
			cells = cells[:len(t.header)]
		}
		for len(cells) < len(t.header) {
			cells = append(cells, "")
		}
		if sameHeader(cells, t.header) {
			t.rejects = append(t.rejects, Reject{File: name, Line: rowNum, Reason: ReasonRepeatedHeader, Detail: "the row repeats the header"})
			continue
		}
		if err := t.keep(rawRow{line: rowNum, f: cells}); err != nil {
			return nil, err
		}
	}
	if err := rows.Error(); err != nil {
		return nil, &PosError{File: name, Line: rowNum, Err: err}
	}
	if t.header == nil {
		return nil, &PosError{File: name, Err: fmt.Errorf("%w (sheet %q)", ErrEmpty, sheet)}
	}
	if t.read() == 0 {
		return nil, &PosError{File: name, Err: fmt.Errorf("%w (sheet %q)", ErrHeaderOnly, sheet)}
	}
	t.info.Rows = t.read()
	return t, nil
}

func uniqueHeaderAppend(name string, h, notes []string) ([]string, []string) {
	out, n := uniqueHeader(name, h)
	return out, append(notes, n...)
}

func allBlank(cells []string) bool {
	for _, c := range cells {
		if strings.TrimSpace(c) != "" {
			return false
		}
	}
	return true
}

func quoteList(s []string) string {
	q := make([]string, len(s))
	for i, x := range s {
		q[i] = fmt.Sprintf("%q", x)
	}
	return strings.Join(q, ", ")
}
