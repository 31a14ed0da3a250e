package intake

import (
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"
)

// Options says which columns play which part and how to read them. The zero value reads
// every file with automatic choices, noted in Set.Notes.
type Options struct {
	// ID, Date name the id and date columns; "" chooses automatically. ID "-" means no
	// id column (ids become "file:line"); Date "-" means no date column.
	ID, Date string
	// Time names a column holding the time of day of the date column's dates (exports
	// that split them); its value is read after the date, "2020-01-05" + " " + "1545".
	// "" means none.
	Time string
	// Text names the narrative columns, joined with a blank line ("\n\n") in this order;
	// nil chooses one automatically.
	Text []string
	// Groups names columns kept for breakdowns (district, call type ...), in Record.Groups;
	// nil keeps none apart (they are then among Record.Extra).
	Groups []string
	// DateFormat fixes the reading of the date column: "" automatic, "iso", "mdy", "dmy",
	// "excel" (1900-system serial numbers), a strftime-like format holding '%'
	// ("%d.%m.%Y %H:%M") or a Go layout ("02.01.2006 15:04").
	DateFormat string
	// DateOrder overrides the column's month-first/day-first decision; OrderAuto decides.
	DateOrder DateOrder
	// Sheet names the worksheet of an XLSX workbook; "" takes the first sheet.
	Sheet string
	// Delimiter of CSV files; 0 sniffs among ',' ';' '\t' '|' (and ", ").
	Delimiter rune
	// SkipLines is the number of lines before a CSV file's header (a report title, a
	// generation date); 0 detects such a preamble (see the package documentation), -1
	// means none.
	SkipLines int
	// KeepLast keeps the last row of a duplicated id instead of the first.
	KeepLast bool
	// RequireDate rejects rows with an empty date ("missing date"); by default they are
	// kept with Record.HasDate false.
	RequireDate bool
	// RejectBadEncoding rejects rows holding bytes that are not valid in their file's
	// encoding ("bad encoding"); by default such bytes become U+FFFD and the rows are
	// kept (FileInfo.InvalidLines counts the lines).
	RejectBadEncoding bool
	// LazyQuotes lets a quote appear in an unquoted field and a non-doubled quote in a
	// quoted field (encoding/csv's LazyQuotes). Off by default: RFC 4180 is strict.
	LazyQuotes bool
	// Now is the run's present: dates after Now (plus 14 hours, the widest zone offset)
	// are implausible, and it bounds two-digit years. Zero means time.Now() once, at the
	// start of Read; pass a fixed value for reproducible runs.
	Now time.Time
}

// Record is one kept row.
type Record struct {
	ID      string
	Date    time.Time
	HasDate bool
	Text    string
	Groups  []string // aligned with Set.GroupNames
	Extra   []string // aligned with Set.ExtraNames
	File    string
	Line    int // physical line (or worksheet row) where the row starts
}

// Reject is one row that was read but not kept.
type Reject struct {
	File   string
	Line   int
	ID     string
	Reason string // one of the Reason constants
	Detail string
}

// FileInfo describes how one input was read.
type FileInfo struct {
	Path         string
	Format       string // "csv", "xlsx", "json", "jsonl", "txt"
	Encoding     string // Enc... constant; for a folder of .txt, a count per encoding
	Delimiter    string // CSV only: ",", ", ", ";", "\t" or "|"
	Sheet        string // XLSX only
	Rows         int    // data rows read
	InvalidLines int    // lines not valid in the chosen encoding
}

// Set is everything Read produced. Read = Kept() + len(Rejects) always; Kept() is
// len(Records) for Read; Stream passes its records on and leaves Records empty.
type Set struct {
	Records    []Record
	Rejects    []Reject
	Files      []FileInfo
	Columns    []string // every column, in the first file's order (repeated names made distinct)
	IDName     string   // "" when ids are synthesized
	DateName   string   // "" when there is no date column
	TimeName   string   // Options.Time's column, or ""
	DateRead   string   // how dates were read, e.g. "month-first", "excel serial", a layout
	TextNames  []string // narrative columns, in join order
	GroupNames []string
	ExtraNames []string
	Notes      []string // automatic choices and warnings, human-readable, in order
	Read       int      // data rows read
	kept       int      // records passed on by Stream (Records is then empty)
}

// Kept is the number of rows kept: len(Records), or for a Set from Stream or Reader the
// number of records passed on.
func (s *Set) Kept() int {
	if s.kept > 0 {
		return s.kept
	}
	return len(s.Records)
}

// Summary returns "read R: kept K, rejected J (reason n, ...)"; reasons by count, then name.
func (s *Set) Summary() string {
	var b strings.Builder
	fmt.Fprintf(&b, "read %d: kept %d, rejected %d", s.Read, s.Kept(), len(s.Rejects))
	if rs := RejectCounts(s.Rejects); len(rs) > 0 {
		b.WriteString(" (")
		for i, r := range rs {
			if i > 0 {
				b.WriteString(", ")
			}
			fmt.Fprintf(&b, "%s %d", r.Reason, r.N)
		}
		b.WriteString(")")
	}
	return b.String()
}

// ReasonCount is a reject reason and how many rows it took.
type ReasonCount struct {
	Reason string
	N      int
}

// RejectCounts counts rejects by reason, most frequent first, ties by reason.
func RejectCounts(r []Reject) []ReasonCount {
	m := map[string]int{}
	for _, x := range r {
		m[x.Reason]++
	}
	out := make([]ReasonCount, 0, len(m))
	for k, v := range m {
		out = append(out, ReasonCount{k, v})
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].N != out[j].N {
			return out[i].N > out[j].N
		}
		return out[i].Reason < out[j].Reason
	})
	return out
}

// WriteRejects writes r as CSV with the header file,line,id,reason,detail.
func WriteRejects(w io.Writer, r []Reject) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"file", "line", "id", "reason", "detail"})
	for _, x := range r {
		cw.Write([]string{x.File, strconv.Itoa(x.Line), x.ID, x.Reason, x.Detail})
	}
	cw.Flush()
	return cw.Error()
}

// StdinName is the file name used for "-" in messages and records.
const StdinName = "stdin"

// Read reads every path ("-" is stdin; a folder is a folder of .txt narratives) and
// accounts for every data row: it ends in Set.Records or in Set.Rejects. Files are read
// in the order given; with several files they must have the same columns. An error is
// returned for problems that make a file unreadable as a whole (binary content, empty,
// header only, unclosed quote, different columns, a named column that does not exist).
func Read(ctx context.Context, paths []string, stdin io.Reader, opt Options) (*Set, error) {
	if err := checkPaths(paths, &opt); err != nil {
		return nil, err
	}
	ps := &pass{}
	defer ps.cleanup()
	var tabs []*table
	for _, p := range paths {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		t, err := ps.readPath(ctx, p, stdin, &opt)
		if err != nil {
			return nil, err
		}
		tabs = append(tabs, t)
	}
	return assemble(ctx, tabs, &opt)
}

// checkPaths sets opt.Now and refuses an empty or repeated list of paths.
func checkPaths(paths []string, opt *Options) error {
	if len(paths) == 0 {
		return errors.New("intake: no input files")
	}
	if opt.Now.IsZero() {
		opt.Now = time.Now()
	}
	seen := map[string]bool{}
	for _, p := range paths {
		k := filepath.Clean(p)
		if seen[k] {
			return &PosError{File: p, Err: errors.New("given twice on the command line")}
		}
		seen[k] = true
	}
	return nil
}

func (ps *pass) readPath(ctx context.Context, p string, stdin io.Reader, opt *Options) (*table, error) {
	if p == "-" {
		if stdin == nil {
			return nil, &PosError{File: StdinName, Err: errors.New("no standard input")}
		}
		f, n, err := ps.spooledFile("stdin", func(f *os.File) (int64, error) {
			n, err := io.Copy(f, stdin)
			if err != nil {
				return 0, &PosError{File: StdinName, Err: err}
			}
			return n, nil
		})
		if err != nil {
			return nil, err
		}
		return ps.readSource(ctx, StdinName, f, n, opt)
	}
	st, err := os.Stat(p)
	if err != nil {
		return nil, err
	}
	if st.IsDir() {
		return ps.readTextDir(ctx, p, opt)
	}
	f, err := os.Open(p)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return ps.readSource(ctx, p, f, st.Size(), opt)
}
