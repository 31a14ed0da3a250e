package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"time"

	"undercurrent/text/intake"
)

// inputFlags are the options every command that reads exports shares.
type inputFlags struct {
	id, date, text, groups string
	dateFormat, dateOrder  string
	sheet, delimiter       string
	keepLast, requireDate  bool
	lazyQuotes             bool
	now                    string
}

func (f *inputFlags) register(fs *flag.FlagSet) {
	fs.StringVar(&f.id, "id", "", "id column (default: chosen; \"-\" for none: ids become file:line)")
	fs.StringVar(&f.date, "date", "", "date column (default: chosen; \"-\" for none)")
	fs.StringVar(&f.text, "text", "", "narrative column(s), comma-separated, joined in this order (default: chosen)")
	fs.StringVar(&f.groups, "group", "", "comma-separated columns to break results down by (district, call type ...)")
	fs.StringVar(&f.dateFormat, "date-format", "", "fix the date reading: iso, mdy, dmy, excel, a strftime-like format (%d.%m.%Y) or a Go layout")
	fs.StringVar(&f.dateOrder, "date-order", "auto", "numeric dates such as 03/04/2020: auto, month-first or day-first")
	fs.StringVar(&f.sheet, "sheet", "", "worksheet of an XLSX workbook (default: the first)")
	fs.StringVar(&f.delimiter, "delimiter", "", "CSV delimiter (default: sniffed among , ; tab |)")
	fs.BoolVar(&f.keepLast, "keep-last", false, "for a repeated id keep the last version instead of the first")
	fs.BoolVar(&f.requireDate, "require-date", false, "reject rows with an empty date (default: keep them, undated)")
	fs.BoolVar(&f.lazyQuotes, "lazy-quotes", false, "accept stray quotes (non-RFC 4180 exports)")
	fs.StringVar(&f.now, "now", "", "the run's present, YYYY-MM-DD, for reproducible checks of future dates (default: today)")
}

func splitList(s string) []string {
	var out []string
	for _, p := range strings.Split(s, ",") {
		if p = strings.TrimSpace(p); p != "" {
			out = append(out, p)
		}
	}
	return out
}

func (f *inputFlags) options() (intake.Options, error) {
	o := intake.Options{
		ID: f.id, Date: f.date, Text: splitList(f.text), Groups: splitList(f.groups),
		DateFormat: f.dateFormat, Sheet: f.sheet, KeepLast: f.keepLast,
		RequireDate: f.requireDate, LazyQuotes: f.lazyQuotes,
	}
	switch f.dateOrder {
	case "", "auto":
		o.DateOrder = intake.OrderAuto
	case "month-first", "mdy":
		o.DateOrder = intake.MonthFirst
	case "day-first", "dmy":
		o.DateOrder = intake.DayFirst
	default:
		return o, usagef("-date-order %q: want auto, month-first or day-first", f.dateOrder)
	}
	switch f.delimiter {
	case "":
	case "tab", `\t`:
		o.Delimiter = '\t'
	default:
		r := []rune(f.delimiter)
		if len(r) != 1 {
			return o, usagef("-delimiter %q: want one character or \"tab\"", f.delimiter)
		}
		o.Delimiter = r[0]
	}
	if f.now != "" {
		t, err := time.Parse("2006-01-02", f.now)
		if err != nil {
			return o, usagef("-now %q: want YYYY-MM-DD", f.now)
		}
		o.Now = t
	}
	return o, nil
}

// readInputs reads the files (or stdin when none or "-") and prints the column choices and
// the accounting summary to stderr.
func readInputs(ctx context.Context, e *env, f *inputFlags, args []string) (*intake.Set, error) {
	opt, err := f.options()
	if err != nil {
		return nil, err
	}
	if len(args) == 0 {
		return nil, usagef("no input files (use - for standard input)")
	}
	set, err := intake.Read(ctx, args, e.stdin, opt)
	if err != nil {
		return nil, err
	}
	for _, n := range set.Notes {
		fmt.Fprintf(e.stderr, "note: %s\n", n)
	}
	fmt.Fprintln(e.stderr, set.Summary())
	return set, nil
}

// writeFileAtomic writes a file through a temporary name in the same folder and renames it
// into place only when fn succeeded, so that no half-written file is left under the final
// name (an interrupted run leaves at most a *.partial file, which is removed on error).
func writeFileAtomic(path string, fn func(w io.Writer) error) error {
	dir := filepath.Dir(path)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".*.partial")
	if err != nil {
		return err
	}
	name := tmp.Name()
	ok := false
	defer func() {
		if !ok {
			tmp.Close()
			os.Remove(name)
		}
	}()
	if err := fn(tmp); err != nil {
		return err
	}
	if err := tmp.Close(); err != nil {
		return err
	}
	if err := os.Chmod(name, 0o644); err != nil {
		return err
	}
	if err := os.Rename(name, path); err != nil {
		return err
	}
	ok = true
	return nil
}

func writeRejects(path string, set *intake.Set) error {
	return writeFileAtomic(path, func(w io.Writer) error { return intake.WriteRejects(w, set.Rejects) })
}

func intakeRejectCounts(set *intake.Set) []intake.ReasonCount {
	return intake.RejectCounts(set.Rejects)
}
