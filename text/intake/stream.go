package intake

import (
	"context"
	"errors"
	"fmt"
	"io"
	"iter"
	"sort"
	"strings"
)

// Stream reads the inputs as Read does and accounts for every row the same way, but
// hands each kept record to each, in input order, instead of holding them: memory does
// not grow with the number of rows but for the set of id values (below). The Set it
// returns has everything Read's has except Records, which stays empty:
//
//	Set.Read = Set.Kept() + len(Set.Rejects)
//
// where Set.Kept() is the number of calls of each. An error from each stops the reading
// and is returned as it is.
//
// Stream reads each input twice: a first pass tallies the rows (the sample of
// sampleSize rows, the distinct values of id-like columns, the date counts; see the
// package documentation) and makes the column choices and the date reading exactly as
// Read makes them, so the records, rejects and notes are Read's (tested record for
// record). Standard input and gzip files are spooled to a temporary file first, as Read
// does. The second pass builds the records. Memory, besides a record in flight and the
// sample: the first pass's 64-bit hash of each row's value in each id-like column (8
// bytes a row and column, freed after the first pass), and, for the chosen id column,
// the ids that occur more than
// once (or look like the file:line of a row without id) with the file, line and a hash
// of the text of their kept row. Rejects are kept in the Set (there are few; a file of
// many repeated versions of its reports makes many duplicate-id rejects).
//
// Differences from Read: with Options.KeepLast, a record whose id occurs again later is
// held until the id's last row has been read and is then passed to each, so records
// can come later than in Read's order (the same records; a repeated id's record keeps
// its place when its last row is kept, the common case). "duplicate id" and "duplicate
// id, different text" are told apart by a 64-bit hash of the narratives rather than the
// texts. An XLSX workbook is held whole by excelize while it is read (in both passes),
// so its memory grows with its size. If a file changes between the passes, Stream
// returns an error.
func Stream(ctx context.Context, paths []string, stdin io.Reader, opt Options, each func(Record) error) (*Set, error) {
	st, err := openStream(ctx, paths, stdin, opt)
	if err != nil {
		return nil, err
	}
	defer st.ps.cleanup()
	if err := st.run(each); err != nil {
		return nil, err
	}
	return st.s, nil
}

// Reader is Stream with the records pulled one at a time (like encoding/csv's Reader):
//
//	r, err := intake.NewReader(ctx, paths, stdin, opt)
//	...
//	defer r.Close()
//	for {
//		rec, err := r.Next()
//		if err == io.EOF {
//			break
//		}
//		...
//	}
//	set := r.Set() // the whole accounting
type Reader struct {
	st   *streamer
	next func() (Record, error, bool)
	stop func()
	err  error
}

// NewReader reads the inputs' first pass (see Stream) and makes the column choices:
// Set then holds the columns, names and the notes of the choices.
func NewReader(ctx context.Context, paths []string, stdin io.Reader, opt Options) (*Reader, error) {
	st, err := openStream(ctx, paths, stdin, opt)
	if err != nil {
		return nil, err
	}
	r := &Reader{st: st}
	r.next, r.stop = iter.Pull2(func(yield func(Record, error) bool) {
		err := st.run(func(rec Record) error {
			if !yield(rec, nil) {
				return errStopped
			}
			return nil
		})
		if err != nil && err != errStopped {
			yield(Record{}, err)
		}
	})
	return r, nil
}

var errStopped = errors.New("intake: reader closed")

// Next returns the next kept record, or io.EOF after the last one (the Set is then
// complete), or the error that stopped the reading (again on every later call).
func (r *Reader) Next() (Record, error) {
	if r.err != nil {
		return Record{}, r.err
	}
	rec, err, ok := r.next()
	switch {
	case !ok:
		r.err = io.EOF
		return Record{}, io.EOF
	case err != nil:
		r.err = err
		return Record{}, err
	}
	return rec, nil
}

// Set returns the run's accounting: before Next returned io.EOF, the column choices and
// the first pass's notes (Read counts every row, Rejects those of the parse and of the
// records so far); after, all of it.
func (r *Reader) Set() *Set { return r.st.s }

// Close stops the reading and removes the temporary files. It may be called at any time.
func (r *Reader) Close() error {
	if r.stop != nil {
		r.stop()
	}
	r.st.ps.cleanup()
	if r.err == nil {
		r.err = errStopped
	}
	return nil
}

// streamer is the state of a two-pass reading.
type streamer struct {
	ctx       context.Context
	paths     []string
	stdin     io.Reader
	opt       Options
	ps        *pass
	tabs      []*table // the first pass's tables (headers, notes, parse rejects; no rows)
	perms     [][]int
	s         *Set
	b         *builder
	fileIndex map[string]int
	ids       map[uint64]uint32 // rows per id value (hash) of the chosen id column, for values in several rows
	first     map[string]keptRow
	pend      map[string]*pending
	kept      int
	dups      int
}

// keptRow is what the duplicate check keeps of a repeated id's kept row.
type keptRow struct {
	file string
	line int
	text uint64
}

// pending is a repeated id under Options.KeepLast: the last record so far and the
// earlier ones it will replace.
type pending struct {
	seen, total int // rows of the id read; rows in all (-1: not known)
	last        *Record
	lastText    uint64
	drops       []dropped
}

type dropped struct {
	rec  Record // File, Line, ID only
	text uint64
}

func openStream(ctx context.Context, paths []string, stdin io.Reader, opt Options) (*streamer, error) {
	if err := checkPaths(paths, &opt); err != nil {
		return nil, err
	}
	st := &streamer{ctx: ctx, paths: paths, stdin: stdin, opt: opt, ps: &pass{}, fileIndex: map[string]int{}}
	ok := false
	defer func() {
		if !ok {
			st.ps.cleanup()
		}
	}()
	tl, err := st.tallyPass(nil)
	if err != nil {
		return nil, err
	}
	if tl.timeMoved() {
		// A JSON file named the time column's key only after rows were tallied: tally
		// again, its header now known.
		hs := make([][]string, len(st.tabs))
		for i, t := range st.tabs {
			hs[i] = t.header
		}
		if tl, err = st.tallyPass(hs); err != nil {
			return nil, err
		}
	}
	if st.perms, err = alignAll(st.tabs); err != nil {
		return nil, err
	}
	sv := tl.finish(st.tabs, st.perms)
	if st.s, st.b, err = decide(ctx, st.tabs, st.perms, sv, &st.opt); err != nil {
		return nil, err
	}
	if st.b.idCol >= 0 {
		st.ids = sv.repeated[st.b.idCol]
	}
	for fi, t := range st.tabs {
		st.note(t.info.Path, fi)
		for _, rj := range t.rejects {
			st.note(rj.File, fi)
		}
	}
	ok = true
	return st, nil
}

func (st *streamer) note(file string, fi int) {
	if _, ok := st.fileIndex[file]; !ok {
		st.fileIndex[file] = fi
	}
}

func (tl *tally) timeMoved() bool {
	for _, t := range tl.tabs {
		if t.timeMoved {
			return true
		}
	}
	return false
}

// tallyPass reads every input, tallying its rows; headers, when known, are the files'
// whole headers.
func (st *streamer) tallyPass(headers [][]string) (*tally, error) {
	tl := newTally(&st.opt)
	tl.headers = headers
	ti := 0
	st.ps.emit = func(t *table, r rawRow) error {
		tl.add(ti, t.header, r)
		if r.file != "" {
			st.note(r.file, ti)
		}
		return nil
	}
	st.tabs = st.tabs[:0]
	for i, p := range st.paths {
		if err := st.ctx.Err(); err != nil {
			return nil, err
		}
		ti = i
		t, err := st.ps.readPath(st.ctx, p, st.stdin, &st.opt)
		if err != nil {
			return nil, err
		}
		st.tabs = append(st.tabs, t)
	}
	return tl, nil
}

// tracked reports whether an id needs the duplicate check: its value occurs in several
// rows, or it has the form of a file:line id (which a row without id gets).
func (st *streamer) tracked(id string) bool {
	if st.b.idCol < 0 {
		return false // every id is a distinct file:line
	}
	return st.ids[hashString(id)] >= 2 || lineID(id)
}

// lineID reports whether id ends in ":" and digits.
func lineID(id string) bool {
	i := strings.LastIndexByte(id, ':')
	if i < 0 || i == len(id)-1 {
		return false
	}
	for _, c := range id[i+1:] {
		if c < '0' || c > '9' {
			return false
		}
	}
	return true
}

// run is the second pass: it builds the records and passes the kept ones to each.
func (st *streamer) run(each func(Record) error) error {
	s, b := st.s, st.b
	keepLast := st.opt.KeepLast
	if keepLast {
		st.pend = map[string]*pending{}
	} else {
		st.first = map[string]keptRow{}
	}
	emit := func(rec Record) error {
		st.kept++
		return each(rec)
	}
	resolve := func(id string, p *pending) error {
		delete(st.pend, id)
		if p.last == nil {
			return nil
		}
		for _, d := range p.drops {
			s.Rejects = append(s.Rejects, dupReject(d.rec, d.text == p.lastText, p.last.File, p.last.Line))
		}
		st.dups += len(p.drops)
		return emit(*p.last)
	}
	ti := 0
	n := 0
	st.ps.emit = func(t *table, r rawRow) error {
		if n&4095 == 0 {
			if err := st.ctx.Err(); err != nil {
				return err
			}
		}
		n++
		t0 := st.tabs[ti]
		f := permute(pad(r.f, len(t0.header)), st.perms[ti])
		rec, rj, ok := b.build(rowFile(t0, r), r.line, f)
		id := rec.ID
		if !ok {
			id = rj.ID
			s.Rejects = append(s.Rejects, rj)
		}
		if !st.tracked(id) {
			if !ok {
				return nil
			}
			return emit(rec)
		}
		if !keepLast {
			if !ok {
				return nil
			}
			h := hashString(rec.Text)
			if k, seen := st.first[id]; seen {
				s.Rejects = append(s.Rejects, dupReject(rec, k.text == h, k.file, k.line))
				st.dups++
				return nil
			}
			st.first[id] = keptRow{rec.File, rec.Line, h}
			return emit(rec)
		}
		p := st.pend[id]
		if p == nil {
			p = &pending{total: -1}
			if !lineID(id) {
				p.total = int(st.ids[hashString(id)])
			}
			st.pend[id] = p
		}
		p.seen++
		if ok {
			if p.last != nil {
				p.drops = append(p.drops, dropped{Record{File: p.last.File, Line: p.last.Line, ID: p.last.ID}, p.lastText})
			}
			p.last, p.lastText = &rec, hashString(rec.Text)
		}
		if p.seen == p.total {
			return resolve(id, p)
		}
		return nil
	}
	for i, p := range st.paths {
		if err := st.ctx.Err(); err != nil {
			return err
		}
		ti = i
		t, err := st.ps.readPath(st.ctx, p, st.stdin, &st.opt)
		if err != nil {
			return err
		}
		if t.read() != st.tabs[i].read() || len(t.rejects) != len(st.tabs[i].rejects) {
			return &PosError{File: st.tabs[i].info.Path, Err: fmt.Errorf("changed while it was read: %d rows, then %d", st.tabs[i].read(), t.read())}
		}
	}
	if keepLast {
		// Ids whose number of rows the first pass could not tell: their last record,
		// in input order.
		var ids []string
		for id, p := range st.pend {
			if p.last != nil {
				ids = append(ids, id)
			}
		}
		sort.Slice(ids, func(i, j int) bool {
			a, b := st.pend[ids[i]].last, st.pend[ids[j]].last
			if fa, fb := st.fileIndex[a.File], st.fileIndex[b.File]; fa != fb {
				return fa < fb
			}
			if a.File != b.File {
				return a.File < b.File
			}
			return a.Line < b.Line
		})
		for _, id := range ids {
			if err := resolve(id, st.pend[id]); err != nil {
				return err
			}
		}
	}
	s.Notes = append(s.Notes, b.notes()...)
	if st.dups > 0 {
		s.Notes = append(s.Notes, dupNote(st.dups, keepLast))
	}
	sortRejects(s.Rejects, st.fileIndex)
	if st.kept+len(s.Rejects) != s.Read {
		return errors.New("intake: internal error: rows kept plus rejected differ from rows read")
	}
	s.kept = st.kept
	return nil
}
