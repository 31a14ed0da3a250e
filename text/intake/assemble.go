package intake

import (
	"context"
	"errors"
	"fmt"
	"sort"
	"strconv"
	"strings"
	"time"
	"unicode"
)

// rowRef is a row of one of the tables, its fields in the first table's column order.
type rowRef struct {
	file string
	fi   int // index of the file in the run
	line int
	f    []string
}

// plausible dates: from 1900-01-01 to Now plus the widest zone offset.
var earliest = time.Date(1900, 1, 1, 0, 0, 0, 0, time.UTC)

const zoneSlack = 14 * time.Hour

// alignAll returns align's permutation of each table against the first.
func alignAll(tabs []*table) ([][]int, error) {
	perms := make([][]int, len(tabs))
	for i, t := range tabs {
		p, err := align(tabs[0], t)
		if err != nil {
			return nil, err
		}
		perms[i] = p
	}
	return perms, nil
}

// decide makes the run's column choices and date reading from the tables (their headers,
// notes, parse rejects) and the survey of their rows. It returns the Set with everything
// but the records and the rejects of the record checks, and the builder of the records.
func decide(ctx context.Context, tabs []*table, perms [][]int, sv *survey, opt *Options) (*Set, *builder, error) {
	header := tabs[0].header
	s := &Set{Columns: header}
	xlsx := true
	s.Notes = mergeNotes(tabs)
	for fi, t := range tabs {
		s.Files = append(s.Files, t.info)
		s.Read += t.read()
		xlsx = xlsx && t.xlsx
		if perms[fi] != nil {
			s.Notes = append(s.Notes, fmt.Sprintf("%s: same columns as %s in another order; matched by name", t.info.Path, tabs[0].info.Path))
		}
	}
	if err := ctx.Err(); err != nil {
		return nil, nil, err
	}
	first := tabs[0].info.Path
	idCol, dateCol, textCols, groupCols, notes, err := chooseColumns(first, header, sv, xlsx, opt)
	if err != nil {
		return nil, nil, err
	}
	s.Notes = append(s.Notes, notes...)
	// Rows rejected while parsing get their id from the id column when they have one.
	for fi, t := range tabs {
		perm := perms[fi]
		for i, rj := range t.rejects {
			if f, ok := t.rejFields[i]; ok && idCol >= 0 {
				c := idCol
				if perm != nil {
					c = perm[idCol]
				}
				if c < len(f) {
					rj.ID = clip(strings.ToValidUTF8(strings.TrimSpace(f[c]), "\uFFFD"), 64)
				}
			}
			s.Rejects = append(s.Rejects, rj)
		}
	}
	b := &builder{s: s, opt: opt, idCol: idCol, dateCol: dateCol, timeCol: -1, textCols: textCols, groupCols: groupCols, late: opt.Now.Add(zoneSlack)}
	if opt.Time != "" {
		if dateCol < 0 {
			return nil, nil, &PosError{File: first, Err: fmt.Errorf("%w: a time column (%q) needs a date column", ErrNoColumn, opt.Time)}
		}
		if b.timeCol, err = findColumn(first, "time", opt.Time, header); err != nil {
			return nil, nil, err
		}
		s.TimeName = header[b.timeCol]
	}
	role := map[int]bool{idCol: true, dateCol: true, b.timeCol: true}
	if idCol >= 0 {
		s.IDName = header[idCol]
	}
	if dateCol >= 0 {
		s.DateName = header[dateCol]
	}
	for _, c := range textCols {
		s.TextNames = append(s.TextNames, header[c])
		role[c] = true
	}
	for _, c := range groupCols {
		s.GroupNames = append(s.GroupNames, header[c])
		role[c] = true
	}
	for c, h := range header {
		if !role[c] {
			b.extraCols = append(b.extraCols, c)
			s.ExtraNames = append(s.ExtraNames, h)
		}
	}
	if dateCol >= 0 {
		var note string
		b.reading, note, err = decideTally(header[dateCol], sv.dates[dateCol], opt, xlsx, opt.Now)
		if err != nil {
			return nil, nil, err
		}
		if note != "" {
			s.Notes = append(s.Notes, note)
		}
		s.DateRead = b.reading.describe()
	}
	return s, b, nil
}

// builder turns rows (in the first file's column order) into records or rejects, by the
// checks in the order the package documentation gives, duplicates aside.
type builder struct {
	s                                               *Set
	opt                                             *Options
	idCol, dateCol, timeCol                         int
	textCols, groupCols, extraCols                  []int
	reading                                         *dateReading
	late                                            time.Time
	rows                                            int // rows built
	synth, noDate, badDate, implausible, otherOrder int
}

// dateOf is the date text of a row: the date column, and the time column after it.
func (b *builder) dateOf(f []string) string {
	v := strings.TrimSpace(f[b.dateCol])
	if b.timeCol >= 0 && v != "" {
		if tv := strings.TrimSpace(f[b.timeCol]); tv != "" {
			v += " " + tv
		}
	}
	return v
}

// build makes the record of a row, or (ok false) its reject.
func (b *builder) build(file string, line int, f []string) (rec Record, rj Reject, ok bool) {
	b.rows++
	s, opt := b.s, b.opt
	rec = Record{File: file, Line: line}
	if b.idCol >= 0 {
		rec.ID = strings.TrimSpace(f[b.idCol])
	}
	if rec.ID == "" {
		rec.ID = file + ":" + strconv.Itoa(line)
		if b.idCol >= 0 && !allBlank(f) {
			b.synth++
		}
	}
	rej := func(reason, detail string) (Record, Reject, bool) {
		return Record{}, Reject{File: file, Line: line, ID: rec.ID, Reason: reason, Detail: detail}, false
	}
	var parts []string
	var placeholders []string
	for _, c := range b.textCols {
		p := strings.TrimSpace(f[c])
		if p != "" && placeholder(p) {
			placeholders = append(placeholders, p)
			continue
		}
		if p != "" {
			parts = append(parts, p)
		}
	}
	if len(parts) == 0 && allBlank(f) {
		return rej(ReasonBlankRow, "every field is empty")
	}
	if len(parts) == 0 {
		d := "no text in " + quoteList(s.TextNames)
		if len(placeholders) > 0 {
			d = "only a placeholder: " + quoteList(placeholders)
		}
		return rej(ReasonEmptyNarrative, d)
	}
	if len(parts) == 1 {
		rec.Text = parts[0]
	} else {
		rec.Text = strings.Join(parts, "\n\n")
	}
	if b.dateCol >= 0 {
		v := b.dateOf(f)
		switch {
		case v == "" && opt.RequireDate:
			return rej(ReasonMissingDate, fmt.Sprintf("%q is empty", s.DateName))
		case v == "":
			b.noDate++
		default:
			t, err := b.reading.parse(v)
			if err != nil {
				if o, ot, ok := b.reading.otherOrder(v); ok {
					b.otherOrder++
					return rej(ReasonOtherDateOrder, fmt.Sprintf("%q: the column is read %s; this value reads only %s (as %s)", clip(v, 64), b.reading.order, o, ot.Format("2006-01-02")))
				}
				b.badDate++
				return rej(ReasonUnparseableDate, fmt.Sprintf("%q: %v", clip(v, 64), err))
			}
			if t.Before(earliest) || t.After(b.late) {
				b.implausible++
				return rej(ReasonImplausibleDate, fmt.Sprintf("%q read as %s, outside 1900-01-01 .. %s", clip(v, 64), t.Format("2006-01-02"), opt.Now.UTC().Format("2006-01-02")))
			}
			rec.Date, rec.HasDate = t, true
		}
	}
	if len(b.groupCols) > 0 {
		rec.Groups = make([]string, len(b.groupCols))
		for j, c := range b.groupCols {
			rec.Groups[j] = strings.TrimSpace(f[c])
		}
	}
	if len(b.extraCols) > 0 {
		rec.Extra = make([]string, len(b.extraCols))
		for j, c := range b.extraCols {
			rec.Extra[j] = f[c]
		}
	}
	return rec, Reject{}, true
}

// notes are the notes on the rows built: synthesized ids, missing and bad dates.
func (b *builder) notes() []string {
	var out []string
	s := b.s
	if b.synth > 0 {
		out = append(out, fmt.Sprintf("id column %q: %s no id; their id is file:line", s.IDName, count(b.synth, "row has", "rows have")))
	}
	if b.noDate > 0 {
		out = append(out, fmt.Sprintf("date column %q: %s no date; kept without one", s.DateName, count(b.noDate, "row has", "rows have")))
	}
	if b.dateCol >= 0 && b.badDate+b.implausible+b.otherOrder > 0 {
		msg := fmt.Sprintf("date column %q: rows rejected for an unparseable date %d, for an implausible date %d", s.DateName, b.badDate, b.implausible)
		if b.otherOrder > 0 {
			msg += fmt.Sprintf(", for a date in the other day/month order %d (set the date order option if the column's order was guessed wrong)", b.otherOrder)
		}
		out = append(out, msg)
		if nonEmpty := b.rows - b.noDate; nonEmpty > 0 && 2*b.badDate > nonEmpty {
			out = append(out, fmt.Sprintf("date column %q is mostly not dates (%d of %d values); check the column or name another", s.DateName, b.badDate, nonEmpty))
		}
	}
	return out
}

func dupNote(dups int, keepLast bool) string {
	which := "first"
	if keepLast {
		which = "last"
	}
	return fmt.Sprintf("duplicate ids: %s an id with another row; kept the %s of each", count(dups, "row shares", "rows share"), which)
}

func dupReject(o Record, sameText bool, keptFile string, keptLine int) Reject {
	reason := ReasonDuplicateID
	if !sameText {
		reason = ReasonDuplicateIDText
	}
	return Reject{File: o.File, Line: o.Line, ID: o.ID, Reason: reason, Detail: fmt.Sprintf("kept the row at %s:%d", keptFile, keptLine)}
}

// sortRejects orders rejects by their file's place on the command line, then file name
// and line.
func sortRejects(r []Reject, fileIndex map[string]int) {
	sort.SliceStable(r, func(i, j int) bool {
		a, b := r[i], r[j]
		fa, fb := fileIndex[a.File], fileIndex[b.File]
		if fa != fb {
			return fa < fb
		}
		if a.File != b.File {
			return a.File < b.File
		}
		return a.Line < b.Line
	})
}

func assemble(ctx context.Context, tabs []*table, opt *Options) (*Set, error) {
	perms, err := alignAll(tabs)
	if err != nil {
		return nil, err
	}
	tl := newTally(opt)
	total := 0
	for ti, t := range tabs {
		total += len(t.rows)
		for _, r := range t.rows {
			tl.add(ti, t.header, r)
		}
	}
	rows := make([]rowRef, 0, total)
	for fi, t := range tabs {
		for _, r := range t.rows {
			rows = append(rows, rowRef{file: rowFile(t, r), fi: fi, line: r.line, f: permute(r.f, perms[fi])})
		}
	}
	// fileIndex orders rejects by the file's place on the command line.
	fileIndex := map[string]int{}
	note := func(file string, fi int) {
		if _, ok := fileIndex[file]; !ok {
			fileIndex[file] = fi
		}
	}
	for fi, t := range tabs {
		note(t.info.Path, fi)
		for _, rj := range t.rejects {
			note(rj.File, fi)
		}
	}
	for _, r := range rows {
		note(r.file, r.fi)
	}
	s, b, err := decide(ctx, tabs, perms, tl.finish(tabs, perms), opt)
	if err != nil {
		return nil, err
	}
	cands := make([]Record, 0, len(rows))
	for i, r := range rows {
		if i&4095 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		rec, rj, ok := b.build(r.file, r.line, r.f)
		if !ok {
			s.Rejects = append(s.Rejects, rj)
			continue
		}
		cands = append(cands, rec)
	}
	s.Notes = append(s.Notes, b.notes()...)

	// Duplicate ids: keep the first (or, with KeepLast, the last) row of each id.
	firstOf := make(map[string]int, len(cands)) // id -> index of its first row
	more := map[string][]int{}                  // id -> indices of all its rows, when several
	for i, c := range cands {
		if j, ok := firstOf[c.ID]; ok {
			if more[c.ID] == nil {
				more[c.ID] = []int{j}
			}
			more[c.ID] = append(more[c.ID], i)
		} else {
			firstOf[c.ID] = i
		}
	}
	drop := make([]bool, len(cands))
	dups := 0
	for i, c := range cands {
		idx := more[c.ID]
		if len(idx) < 2 || idx[0] != i {
			continue
		}
		keep := idx[0]
		if opt.KeepLast {
			keep = idx[len(idx)-1]
		}
		k := cands[keep]
		for _, j := range idx {
			if j == keep {
				continue
			}
			drop[j] = true
			dups++
			s.Rejects = append(s.Rejects, dupReject(cands[j], cands[j].Text == k.Text, k.File, k.Line))
		}
	}
	if dups > 0 {
		s.Notes = append(s.Notes, dupNote(dups, opt.KeepLast))
	}
	s.Records = cands[:0]
	for i, c := range cands {
		if !drop[i] {
			s.Records = append(s.Records, c)
		}
	}
	clear(cands[len(s.Records):]) // release the dropped rows' strings
	sortRejects(s.Rejects, fileIndex)
	if len(s.Records)+len(s.Rejects) != s.Read {
		return nil, errors.New("intake: internal error: rows kept plus rejected differ from rows read")
	}
	return s, nil
}

// align checks that t has the columns of t0. It returns nil when they are in the same
// order, or the permutation perm such that t's field perm[j] is t0's column j.
func align(t0, t *table) ([]int, error) {
	if t == t0 {
		return nil, nil
	}
	same := len(t.header) == len(t0.header)
	for i := 0; same && i < len(t.header); i++ {
		same = t.header[i] == t0.header[i]
	}
	if same {
		return nil, nil
	}
	pos := map[string]int{}
	for i, h := range t.header {
		pos[h] = i
	}
	var missing, extra []string
	perm := make([]int, len(t0.header))
	in0 := map[string]bool{}
	for j, h := range t0.header {
		in0[h] = true
		p, ok := pos[h]
		if !ok {
			missing = append(missing, h)
		}
		perm[j] = p
	}
	for _, h := range t.header {
		if !in0[h] {
			extra = append(extra, h)
		}
	}
	if len(missing) > 0 || len(extra) > 0 {
		msg := fmt.Sprintf("%v (%s)", ErrColumns, t0.info.Path)
		if len(missing) > 0 {
			msg += "; missing " + quoteList(missing)
		}
		if len(extra) > 0 {
			msg += "; extra " + quoteList(extra)
		}
		return nil, &PosError{File: t.info.Path, Line: 1, Err: fmt.Errorf("%w%s", ErrColumns, strings.TrimPrefix(msg, ErrColumns.Error()))}
	}
	return perm, nil
}

// describe says how the date column is read, for Set.DateRead.
func (r *dateReading) describe() string {
	switch {
	case r.layout != "":
		return "layout " + r.layout
	case r.iso:
		return "ISO 8601"
	case r.serial:
		return "Excel serial (1900 system)"
	}
	return r.order.String()
}

// mergeNotes gathers the per-file notes; a note that several files share word for word
// (after their "path: " prefix) is given once with the number of files and the first.
func mergeNotes(tabs []*table) []string {
	type group struct {
		files []string
		first int
	}
	var order []string
	groups := map[string]*group{}
	for _, t := range tabs {
		for _, n := range t.notes {
			body, file := n, ""
			if p := t.info.Path + ": "; strings.HasPrefix(n, p) {
				body, file = n[len(p):], t.info.Path
			}
			g, ok := groups[body]
			if !ok || file == "" {
				g = &group{}
				groups[body] = g
				order = append(order, body)
			}
			if file != "" {
				g.files = append(g.files, file)
			}
		}
	}
	var out []string
	for _, body := range order {
		g := groups[body]
		switch len(g.files) {
		case 0:
			out = append(out, body)
		case 1:
			out = append(out, g.files[0]+": "+body)
		default:
			out = append(out, fmt.Sprintf("%s and %d more files: %s", g.files[0], len(g.files)-1, body))
		}
	}
	return out
}

// count writes n with the singular or plural words: count(1, "row has", "rows have").
func count(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}

// placeholder reports whether a narrative holds no text: no letter or digit at all
// ("-", "...", "?"), or an export's stand-in for nothing ("NULL", "N/A", "none",
// "nil", "NaN", any case).
func placeholder(s string) bool {
	switch strings.ToLower(s) {
	case "null", "n/a", "na", "none", "nil", "nan", "#n/a":
		return true
	}
	for _, r := range s {
		if unicode.IsLetter(r) || unicode.IsDigit(r) {
			return false
		}
	}
	return true
}
