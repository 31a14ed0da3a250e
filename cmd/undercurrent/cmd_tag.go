package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"

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
ids are kept. An Excel workbook is held whole while it is read.

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
before the rows are written. Ids are written as they are in the input; narrative text is
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
					ww := newChunkWriter(wide, func(w io.Writer, rows []export.WideRow) error {
						return export.WriteWide(w, set.GroupNames, lab, rows)
					})
					var lw *chunkWriter[export.LongRow]
					if longW != nil {
						lw = newChunkWriter(longW, export.WriteLong)
					}
					folded := make([]float64, k+1)
					st, err = tagRecords(ctx, rd.Next, red, pipes, tg, func(r *intake.Record, theta []float64) error {
						tm.Fold(folded, theta)
						row := export.WideRow{ID: r.ID, Groups: r.Groups, Theta: append([]float64(nil), folded...)}
						if r.HasDate {
							row.Date = r.Date.Format("2006-01-02")
						}
						if err := ww.add(row); err != nil {
							return err
						}
						if lw != nil {
							for _, lr := range export.LongRows(nil, r.ID, folded, minShare) {
								if err := lw.add(lr); err != nil {
									return err
								}
							}
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

// tagBatch is the number of narratives a preprocessing worker takes at a time.
const tagBatch = 64

// chunkWriter streams rows through a whole-file CSV writer (export.WriteWide, WriteLong)
// in chunks: the header is written once, then each chunk's rows without the header the
// writer repeats. Memory holds one chunk.
type chunkWriter[R any] struct {
	w       io.Writer
	fn      func(io.Writer, []R) error
	rows    []R
	buf     bytes.Buffer
	header  []byte
	started bool
	done    int // rows written
}

const chunkRows = 512

func newChunkWriter[R any](w io.Writer, fn func(io.Writer, []R) error) *chunkWriter[R] {
	return &chunkWriter[R]{w: w, fn: fn}
}

func (c *chunkWriter[R]) add(r R) error {
	c.rows = append(c.rows, r)
	if len(c.rows) >= chunkRows {
		return c.write()
	}
	return nil
}

func (c *chunkWriter[R]) write() error {
	if c.header == nil {
		var hb bytes.Buffer
		if err := c.fn(&hb, nil); err != nil {
			return err
		}
		c.header = hb.Bytes()
	}
	c.buf.Reset()
	if err := c.fn(&c.buf, c.rows); err != nil {
		var re *export.RowError
		if errors.As(err, &re) {
			re.Row += c.done // the row's number in the whole file, not in the chunk
		}
		return err
	}
	c.done += len(c.rows)
	b := c.buf.Bytes()
	if !bytes.HasPrefix(b, c.header) {
		return errors.New("undercurrent: CSV writer did not start with its header")
	}
	if c.started {
		b = b[len(c.header):]
	}
	c.started = true
	c.rows = c.rows[:0]
	_, err := c.w.Write(b)
	return err
}

// flush writes the rows held (and the header if nothing was written yet).
func (c *chunkWriter[R]) flush() error {
	if len(c.rows) == 0 && c.started {
		return nil
	}
	return c.write()
}
