package main

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"runtime/debug"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"undercurrent/report"
	"undercurrent/report/export"
	"undercurrent/text"
	"undercurrent/text/intake"
	"undercurrent/text/redact"
	"undercurrent/topics"
)

func init() {
	register(&command{
		name:  "tag",
		usage: "tag [options] file...",
		short: "tag new narratives with the themes of a model file",
		long: `Tag applies a model file (-model, written by 'undercurrent fit' or 'report') to new
narratives: each row is read and accounted for as the other commands do, redacted, passed
through the text pipeline frozen in the model file (the same cleaning, abbreviations,
repairs, stemming, phrases and vocabulary as when the model was fitted), and given its theme
shares by fold-in Gibbs sampling with the themes held fixed.

A narrative's shares depend only on the model, its id and its text: its random stream is
seeded from the id and the narrative's words, never from the other narratives in the file
or their order. Tagging a file in one run or in pieces on several machines gives the same
rows, so very large files can be split and tagged in parallel by any batch system and the
outputs joined. (Without an id column, ids are file:line and therefore change when a file
is split: name the id column with -id.) Narratives stream through in small batches, so
memory does not grow with the number of rows: the input is read twice (a first pass makes
the column choices exactly as the other commands make them; standard input is first
copied to a temporary file), and between rows only a hash per id value and the repeated
ids are kept. An Excel workbook is held whole while it is read. Unless the GOGC
environment variable is set, tagging lets the heap grow to five times its live data
between collections (GOGC=400) under a 1 GiB soft limit (or GOMEMLIMIT's).

Routine narratives (whose content reduces to a few routine words, as the pipeline settings
in the model define them) are not tagged with a theme: they get the extra last theme,
number K, labelled "` + routineLabel + `", as in the report's
exports. Near-duplicate narratives are set aside only when a model is fitted, not here
(that would depend on the batch).

Redaction: pass the same -names and -allow files as when the model was fitted, so that the
text the model reads is redacted the same way.

Output: one row per kept narrative in the wide form of narratives-wide.csv (id, date, the
-group columns, the strongest theme with its label and share, the next two themes) to -out
or standard output; with -long also one row per narrative and theme with a share of at least
-min-share. A labels file (-labels, as for 'undercurrent report') merges and labels themes
before the rows are written; "hide" lines only hide a theme in the report, so a hidden
theme's shares are still tagged here. Ids are written as they are in the input; narrative text is
never written.

Themes summarise what narrative writers wrote; they are not findings of fact. Ids, dates
and group values together can identify people: check public-records law, data-sharing
terms and ethics review before sharing the output.

Example:

	undercurrent tag -model out/city/themes.ucmodel -out tagged.csv new_incidents.csv
	undercurrent tag -model themes.ucmodel -labels labels.txt -group district -long tagged-long.csv -out tagged.csv part-*.csv`,
		setup: func(fs *flag.FlagSet) func(context.Context, *env, []string) error {
			var (
				in       inputFlags
				rf       redactFlags
				path     string
				out      string
				long     string
				labels   string
				minShare float64
				workers  int
				iters    int
			)
			in.register(fs)
			fs.StringVar(&rf.names, "names", "", "file of people's names to redact wherever they appear (one a line; use the fitting run's)")
			fs.StringVar(&rf.allow, "allow", "", "file of street, business and place names never redacted as names (use the fitting run's)")
			fs.BoolVar(&rf.noGuessNames, "no-guess-names", false, "do not treat capitalised non-dictionary words in name position as names (as in the fitting run)")
			fs.StringVar(&path, "model", "out/themes.ucmodel", "model file to apply")
			fs.StringVar(&out, "out", "", "wide CSV file to write (default: standard output)")
			fs.StringVar(&long, "long", "", "also write the long CSV (id, theme, share) to this file")
			fs.StringVar(&labels, "labels", "", "labels file: theme labels and merges applied to the shares")
			fs.Float64Var(&minShare, "min-share", 0.01, "smallest share written to the long CSV")
			fs.IntVar(&workers, "workers", 2, "goroutines (results do not depend on it)")
			fs.IntVar(&iters, "iterations", 0, "Gibbs sweeps of fold-in per narrative (default 60; results depend on it)")
			return func(ctx context.Context, e *env, args []string) error {
				if workers < 1 {
					return usagef("-workers %d: want at least 1", workers)
				}
				if iters < 0 {
					return usagef("-iterations %d: want at least 1", iters)
				}
				if !(minShare >= 0 && minShare <= 1) {
					return usagef("-min-share %v: want 0 to 1", minShare)
				}
				if os.Getenv("GOGC") == "" {
					defer debug.SetGCPercent(debug.SetGCPercent(tagGCPercent))
					if os.Getenv("GOMEMLIMIT") == "" {
						defer debug.SetMemoryLimit(debug.SetMemoryLimit(tagMemoryLimit))
					}
				}
				m, _, err := loadModel(path)
				if err != nil {
					return err
				}
				k := m.K()
				lab, tm, err := tagLabels(m, labels)
				if err != nil {
					return err
				}
				red, err := rf.redactor()
				if err != nil {
					return err
				}
				pipes, err := framePipelines(m, workers)
				if err != nil {
					return fmt.Errorf("%s: %w", path, err)
				}
				rd, err := openInputs(ctx, e, &in, args)
				if err != nil {
					return err
				}
				defer rd.Close()
				set := rd.Set()
				nNotes := len(set.Notes) // printed; the second pass adds its own
				tg := topics.NewTagger(m, topics.InferSettings{Iterations: iters, Workers: workers})
				var st tagStats
				write := func(wide, longW io.Writer) error {
					ww, err := newWideCSV(wide, set.GroupNames, lab)
					if err != nil {
						return err
					}
					var lw *tagCSV
					if longW != nil {
						if lw, err = newLongCSV(longW); err != nil {
							return err
						}
					}
					folded := make([]float64, k+1)
					st, err = tagRecords(ctx, rd.Next, red, pipes, tg, func(r *intake.Record, theta []float64) error {
						tm.Fold(folded, theta)
						if err := ww.wide(r.ID, r.Date, r.HasDate, r.Groups, folded); err != nil {
							return err
						}
						if lw != nil {
							return lw.long(r.ID, folded, minShare)
						}
						return nil
					})
					if err != nil {
						return err
					}
					if err := ww.flush(); err != nil {
						return err
					}
					if lw != nil {
						return lw.flush()
					}
					return nil
				}
				withLong := func(wide io.Writer) error {
					if long == "" {
						return write(wide, nil)
					}
					return writeFileAtomic(long, func(lw io.Writer) error { return write(wide, lw) })
				}
				if out == "" || out == "-" {
					err = withLong(e.stdout)
				} else {
					err = writeFileAtomic(out, withLong)
				}
				if err != nil {
					return err
				}
				for _, n := range set.Notes[nNotes:] {
					fmt.Fprintf(e.stderr, "note: %s\n", n)
				}
				fmt.Fprintln(e.stderr, set.Summary())
				fmt.Fprintf(e.stderr, "tagged %d narratives: %d with themes, %d routine (theme %d), %d without any word of the model's vocabulary (given the prior mean)\n",
					st.n, st.n-st.routine, st.routine, k, st.empty)
				return nil
			}
		},
	})
}

// tagLabels returns the labels of the K themes and the routine column, and the theme map of
// the labels file (identity without one), following runJob's convention: column K holds
// the routine narratives.
func tagLabels(m *topics.Model, labelsFile string) ([]string, report.ThemeMap, error) {
	k := m.K()
	lab := make([]string, k+1)
	for t := 0; t < k; t++ {
		lab[t] = themeLabel(m, t)
	}
	lab[k] = routineLabel
	tm := report.ThemeMap{Into: identity(k + 1), Hidden: make([]bool, k+1)}
	if labelsFile == "" {
		return lab, tm, nil
	}
	fh, err := os.Open(labelsFile)
	if err != nil {
		return nil, tm, err
	}
	cur, err := report.ParseLabels(labelsFile, fh)
	fh.Close()
	if err != nil {
		return nil, tm, err
	}
	cm, err := cur.Map(k)
	if err != nil {
		return nil, tm, err
	}
	tm = report.ThemeMap{Into: append(cm.Into, k), Hidden: append(cm.Hidden, false)}
	for _, st := range cur.Statements {
		if st.Kind == report.SetLabel {
			lab[st.Theme] = st.Text
		}
	}
	return lab, tm, nil
}

// framePipelines returns n independent copies of the model's frozen text pipeline:
// Frozen.Transform serialises its calls, so each tagging worker gets its own.
func framePipelines(m *topics.Model, n int) ([]*text.Frozen, error) {
	out := make([]*text.Frozen, n)
	for i := range out {
		var fr text.Frozen
		if err := json.Unmarshal(m.Pipeline(), &fr); err != nil {
			return nil, fmt.Errorf("text pipeline: %w", err)
		}
		if err := fr.Prepare(); err != nil {
			return nil, fmt.Errorf("text pipeline: %w", err)
		}
		if len(fr.Vocab) != m.V() {
			return nil, fmt.Errorf("text pipeline has %d terms, model %d", len(fr.Vocab), m.V())
		}
		out[i] = &fr
	}
	return out, nil
}

// tagStats counts what tagRecords did.
type tagStats struct {
	n, routine, empty int
}

// tagRecords pulls records from next until io.EOF, redacts each, runs it through the
// frozen pipeline and folds it in (one worker per pipeline copy, in batches of tagBatch
// narratives; tg.InferBatchTo per batch), then calls emit with the record and its K+1
// theme shares (the last one is the routine column) in input order, from the caller's
// goroutine. At most 2 × workers + 1 batches exist, recycled, so memory does not grow with
// the number of records. The record and theta passed to emit are reused after emit returns.
//
// The processing of one narrative is exactly prepare's for fitting: redactor.Redact, then
// redact.Blank, then the frozen pipeline's Transform. Fold-in is per narrative (seeded from
// its id and words), so the batches change nothing in the results.
func tagRecords(ctx context.Context, next func() (intake.Record, error), red *redact.Redactor, pipes []*text.Frozen, tg *topics.Tagger, emit func(r *intake.Record, theta []float64) error) (tagStats, error) {
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	var st tagStats
	W := len(pipes)
	if W < 1 {
		panic("undercurrent: tagRecords without a pipeline")
	}
	K := tg.K()
	window := 2 * W // batches in flight in the workers
	type batch struct {
		recs    []intake.Record
		docs    []topics.Doc
		routine []bool
		theta   []float64 // tagBatch × K
		full    []float64 // tagBatch × (K+1), what emit gets
		ready   chan struct{}
	}
	free := make(chan *batch, window+1)
	for range window + 1 {
		free <- &batch{
			recs:    make([]intake.Record, 0, tagBatch),
			docs:    make([]topics.Doc, tagBatch),
			routine: make([]bool, tagBatch),
			theta:   make([]float64, tagBatch*K),
			full:    make([]float64, tagBatch*(K+1)),
			ready:   make(chan struct{}, 1),
		}
	}
	jobs := make(chan *batch, window)
	order := make(chan *batch, window+1)
	var readErr error // set by the producer before it closes order
	go func() {
		defer close(jobs)
		defer close(order)
		for done := false; !done; {
			var b *batch
			select {
			case b = <-free:
			case <-ctx.Done():
				return
			}
			b.recs = b.recs[:0]
			for len(b.recs) < tagBatch {
				r, err := next()
				if err == io.EOF {
					done = true
					break
				}
				if err != nil {
					readErr, done = err, true
					break
				}
				b.recs = append(b.recs, r)
			}
			if len(b.recs) == 0 {
				break
			}
			// order has room for every batch there is, so this never blocks.
			order <- b
			select {
			case jobs <- b:
			case <-ctx.Done():
				return
			}
		}
	}()
	for w := 0; w < W; w++ {
		fr := pipes[w]
		go func() {
			for b := range jobs {
				n := len(b.recs)
				for i := range b.recs {
					out, _ := red.Redact(b.recs[i].Text)
					d := fr.Transform(redact.Blank(out))
					b.routine[i] = d.Routine != text.NotRoutine
					ids := d.Terms
					if b.routine[i] {
						ids = nil // not a theme of the model: no need to sample
					}
					b.docs[i] = topics.Doc{ID: b.recs[i].ID, IDs: ids}
				}
				tg.InferBatchTo(b.theta[:n*K], b.docs[:n])
				for i := range n {
					full := b.full[i*(K+1) : (i+1)*(K+1)]
					if b.routine[i] {
						clear(full)
						full[K] = 1
					} else {
						copy(full, b.theta[i*K:(i+1)*K])
						full[K] = 0
					}
				}
				b.ready <- struct{}{}
			}
		}()
	}
	var err error
	for b := range order {
		if err == nil {
			select {
			case <-b.ready:
			case <-ctx.Done():
				err = ctx.Err()
			}
		}
		if err != nil {
			// Drain until the producer sees the cancellation and stops; a worker may
			// still hold b, so it is left alone.
			continue
		}
		for i := range b.recs {
			if err = ctx.Err(); err != nil {
				break // interrupted: nothing more is emitted
			}
			st.n++
			if b.routine[i] {
				st.routine++
			} else if len(b.docs[i].IDs) == 0 {
				st.empty++
			}
			if err = emit(&b.recs[i], b.full[i*(K+1):(i+1)*(K+1)]); err != nil {
				cancel()
				break
			}
		}
		if err != nil {
			continue
		}
		clear(b.recs) // drop the texts before the batch waits in free
		clear(b.docs)
		free <- b
	}
	if err != nil {
		return st, err
	}
	if readErr != nil {
		return st, readErr
	}
	return st, ctx.Err()
}

// sliceRecords returns a next function over recs, for tagRecords.
func sliceRecords(recs []intake.Record) func() (intake.Record, error) {
	i := 0
	return func() (intake.Record, error) {
		if i == len(recs) {
			return intake.Record{}, io.EOF
		}
		i++
		return recs[i-1], nil
	}
}

// openInputs opens the files (or stdin for "-") for streaming and prints the notes of
// the column choices to stderr; the caller prints the rest and the accounting summary
// when the reader is done.
func openInputs(ctx context.Context, e *env, f *inputFlags, args []string) (*intake.Reader, error) {
	opt, err := f.options()
	if err != nil {
		return nil, err
	}
	if len(args) == 0 {
		return nil, usagef("no input files (use - for standard input)")
	}
	rd, err := intake.NewReader(ctx, args, e.stdin, opt)
	if err != nil {
		return nil, err
	}
	for _, n := range rd.Set().Notes {
		fmt.Fprintf(e.stderr, "note: %s\n", n)
	}
	return rd, nil
}

// tagGCPercent is the garbage collector's target (GOGC) while tagging, unless the GOGC
// variable sets one. Tagging keeps little alive (the model, a few batches in flight: some
// tens of MB) but allocates about 8 KB per narrative in redaction and the text pipeline,
// so the default 100 collects every few thousand narratives; 400 lets the heap grow to
// five times the live data instead and cut BenchmarkTag/whole from 104–120 to 90–92
// cpu-µs/narrative on the shared machine.
//
// What grows with the rows is intake's record of the ids seen (some tens of bytes per
// row), which the higher target would multiply by five; tagMemoryLimit (unless GOMEMLIMIT
// sets one) makes the collector work harder instead once the process nears it. Measured on
// 1M demotown rows: peak RSS 111 MB (53 MB with the defaults).
const (
	tagGCPercent   = 400
	tagMemoryLimit = 1 << 30
)

// tagBatch is the number of narratives a preprocessing worker takes at a time.
const tagBatch = 64

// tagCSV writes the tag command's wide or long CSV row by row, appending every cell to one
// buffer (strconv.Append*, no per-cell strings), and gives the same bytes as export.WriteWide
// and export.WriteLong over all the rows (TestTagCSVMatchesExport): the header comes from
// those functions, cells are defused as they defuse them (a leading = + - @ tab or CR gets
// a ') and quoted by encoding/csv's rules, shares have four decimals.
type tagCSV struct {
	w      io.Writer
	buf    []byte
	rows   int      // rows written, for RowError
	labels [][]byte // each label's cell, encoded once (wide only)
	date   []byte   // scratch: the formatted date
	cell   []byte   // scratch: the id's cell (long)
	quoted bytes.Buffer
	qw     *csv.Writer
}

// tagCSVFlush is the buffered size at which tagCSV writes to its writer.
const tagCSVFlush = 64 << 10

func newWideCSV(w io.Writer, groupCols, labels []string) (*tagCSV, error) {
	c := &tagCSV{w: w}
	var hb bytes.Buffer
	if err := export.WriteWide(&hb, groupCols, labels, nil); err != nil {
		return nil, err
	}
	c.buf = append(c.buf, hb.Bytes()...)
	for _, l := range labels {
		c.labels = append(c.labels, c.appendCell(nil, l))
	}
	return c, nil
}

func newLongCSV(w io.Writer) (*tagCSV, error) {
	c := &tagCSV{w: w}
	var hb bytes.Buffer
	if err := export.WriteLong(&hb, nil); err != nil {
		return nil, err
	}
	c.buf = append(c.buf, hb.Bytes()...)
	return c, nil
}

// wide appends one row of narratives-wide.csv: id, date (empty without one), groups, the
// strongest theme with its label and share, the next two themes with their shares.
func (c *tagCSV) wide(id string, date time.Time, hasDate bool, groups []string, theta []float64) error {
	if len(theta) != len(c.labels) {
		panic("undercurrent: tagCSV.wide: len(theta) does not match the labels")
	}
	for _, v := range theta {
		if err := finiteShare(v); err != nil {
			return &export.RowError{Row: c.rows, ID: id, Err: err}
		}
	}
	b := c.appendCell(c.buf, id)
	b = append(b, ',')
	if hasDate {
		c.date = date.AppendFormat(c.date[:0], "2006-01-02")
		if c.date[0] == '-' || len(c.date) != len("2006-01-02") {
			b = c.appendCell(b, string(c.date)) // a year before 1 or after 9999
		} else {
			b = append(b, c.date...) // digits and hyphens: a plain cell
		}
	}
	for _, g := range groups {
		b = append(b, ',')
		b = c.appendCell(b, g)
	}
	best, n := export.Top3(theta)
	b = append(b, ',')
	b = strconv.AppendInt(b, int64(best[0]), 10)
	b = append(b, ',')
	b = append(b, c.labels[best[0]]...)
	b = append(b, ',')
	b = strconv.AppendFloat(b, theta[best[0]], 'f', 4, 64)
	for i := 1; i < 3; i++ {
		b = append(b, ',')
		if i < n {
			b = strconv.AppendInt(b, int64(best[i]), 10)
			b = append(b, ',')
			b = strconv.AppendFloat(b, theta[best[i]], 'f', 4, 64)
		} else {
			b = append(b, ',')
		}
	}
	c.buf = append(b, '\n')
	c.rows++
	return c.maybeFlush()
}

// long appends one row of the long CSV per theme with a share of at least min.
func (c *tagCSV) long(id string, theta []float64, min float64) error {
	var cell []byte
	for k, v := range theta {
		if !(v >= min) {
			continue
		}
		if err := finiteShare(v); err != nil {
			return &export.RowError{Row: c.rows, ID: id, Err: err}
		}
		if cell == nil {
			c.cell = c.appendCell(c.cell[:0], id)
			cell = c.cell
		}
		b := append(c.buf, cell...)
		b = append(b, ',')
		b = strconv.AppendInt(b, int64(k), 10)
		b = append(b, ',')
		b = strconv.AppendFloat(b, v, 'f', 4, 64)
		c.buf = append(b, '\n')
		c.rows++
	}
	return c.maybeFlush()
}

func (c *tagCSV) maybeFlush() error {
	if len(c.buf) < tagCSVFlush {
		return nil
	}
	return c.flush()
}

// flush writes what is buffered.
func (c *tagCSV) flush() error {
	_, err := c.w.Write(c.buf)
	c.buf = c.buf[:0]
	return err
}

// appendCell appends s as export's writers write a text cell: defused, then as
// encoding/csv writes a field. Plain cells are copied; the rare cell that needs quotes or
// starts with a non-ASCII byte goes through a csv.Writer, so the rules are csv's own.
func (c *tagCSV) appendCell(dst []byte, s string) []byte {
	pre := s != "" && strings.IndexByte("=+-@\t\r", s[0]) >= 0
	if plainCell(s, pre) {
		if pre {
			dst = append(dst, '\'')
		}
		return append(dst, s...)
	}
	f := s
	if pre {
		f = "'" + s
	}
	if c.qw == nil {
		c.qw = csv.NewWriter(&c.quoted)
	}
	c.quoted.Reset()
	c.qw.Write([]string{f}) // a bytes.Buffer does not fail
	c.qw.Flush()
	out := c.quoted.Bytes()
	return append(dst, out[:len(out)-1]...) // without the record's "\n"
}

// plainCell reports whether encoding/csv writes s (after a defusing ' when pre) as it
// is: no line break, quote or comma, not `\.`, and not starting with a space (any
// non-ASCII first byte is sent the slow way, which decides for itself).
func plainCell(s string, pre bool) bool {
	if s == "" {
		return true
	}
	if !pre {
		if s == `\.` || s[0] >= utf8.RuneSelf {
			return false
		}
		switch s[0] {
		case ' ', '\t', '\n', '\v', '\f', '\r':
			return false
		}
	}
	for i := 0; i < len(s); i++ {
		switch s[i] {
		case '\n', '\r', '"', ',':
			return false
		}
	}
	return true
}

// finiteShare is export's check of a share (same wording).
func finiteShare(v float64) error {
	if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 || v > 1+1e-9 {
		return fmt.Errorf("share %v is not between 0 and 1", v)
	}
	return nil
}
