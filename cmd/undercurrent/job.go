package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"html"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"runtime/debug"
	"sort"
	"strconv"
	"strings"
	"undercurrent/text/intake"

	"undercurrent/cluster"
	"undercurrent/report"
	"undercurrent/report/export"
	"undercurrent/report/trend"
	"undercurrent/text"
	"undercurrent/text/redact"
	"undercurrent/topics"
)

// jobFlags are the options of the whole job (the report and demo commands).
type jobFlags struct {
	in         inputFlags
	text       textFlags
	redact     redactFlags
	model      modelFlags
	out        string
	title      string
	labels     string
	threshold  int
	everything bool
	publishIDs bool
	examples   int
	repeatSim  float64
}

func (f *jobFlags) register(fs *flag.FlagSet, withInput bool) {
	if withInput {
		f.in.register(fs)
	}
	f.text.register(fs)
	f.redact.register(fs)
	f.model.register(fs)
	fs.StringVar(&f.out, "out", "out", "folder for the report, exports and model file")
	fs.StringVar(&f.title, "title", "", "title of the report (default: \"Narrative themes\")")
	fs.StringVar(&f.labels, "labels", "", "labels file: names, merges, hides and notes for themes, applied without refitting")
	fs.IntVar(&f.threshold, "min-count", 10, "withhold published counts below this (with whatever would let them be recovered)")
	fs.BoolVar(&f.everything, "publish-small-counts", false, "also write unsuppressed tables, only to files named *.private.*")
	fs.BoolVar(&f.publishIDs, "publish-ids", false, "publish record ids in the report's examples and in the exports (default: file:line references into the input, since ids with a date and a district can be linked to other records)")
	fs.IntVar(&f.examples, "examples", 4, "redacted example narratives per theme (1 to 5)")
	fs.Float64Var(&f.repeatSim, "repeat-similarity", cluster.DefaultCopySimilarity, "least cosine similarity of the words of every two narratives of a group that repeats one text (0 < s ≤ 1; 0 switches the search off)")
}

// jobResult is what a finished job wrote.
type jobResult struct {
	report string
	files  []string
	k      int
}

// noThemeLabel marks the routine narratives in the series: they take part in every month's
// total but are not a theme of the model.
const routineLabel = "Routine (set aside before fitting)"

// runJob is the whole job: read, account, redact, text pipeline, choose K, fit, describe,
// cluster the themes, trends and groups with suppression, the report and the exports.
func runJob(ctx context.Context, e *env, f *jobFlags, args []string) (*jobResult, error) {
	if f.examples < 1 || f.examples > 5 {
		return nil, usagef("-examples %d: want 1 to 5", f.examples)
	}
	if err := f.model.check(); err != nil {
		return nil, err
	}
	if f.threshold < 1 {
		return nil, usagef("-min-count %d: want at least 1 (use -publish-small-counts for private unsuppressed tables)", f.threshold)
	}
	if !(f.repeatSim >= 0 && f.repeatSim <= 1) {
		return nil, usagef("-repeat-similarity %v: want a number from 0 (off) to 1", f.repeatSim)
	}
	var cur *report.Curation
	if f.labels != "" {
		fh, err := os.Open(f.labels)
		if err != nil {
			return nil, err
		}
		cur, err = report.ParseLabels(filepath.Base(f.labels), fh) // the base name only: the page is published
		fh.Close()
		if err != nil {
			return nil, err
		}
	}
	if err := os.MkdirAll(f.out, 0o755); err != nil {
		return nil, err
	}
	p, err := prepare(ctx, e, &f.in, &f.text, &f.redact, f.out, args)
	if err != nil {
		return nil, err
	}
	res := &jobResult{files: []string{filepath.Join(f.out, "rejects.csv")}}

	// The number of themes.
	var sweep *topics.SweepTable
	k := f.model.themes
	if k == 0 {
		k, sweep, err = chooseK(ctx, e, p, &f.model)
		if err != nil {
			return res, err
		}
		fmt.Fprintf(e.stderr, "number of themes: %d (%s%s)\n", k, strings.Join(sweep.Reasons, " "), edgeNote(sweep))
	}
	m, err := fitModel(ctx, e, p, &f.model, k)
	if err != nil {
		return res, err
	}
	res.k = k
	modelPath := filepath.Join(f.out, "themes.ucmodel")
	if err := saveModel(modelPath, m); err != nil {
		return res, err
	}
	res.files = append(res.files, modelPath)

	// θ for every kept narrative: the model's for fitted ones, the routine column for the
	// others (index k).
	n := len(p.set.Records)
	theta := make([][]float64, n)
	for j, i := range p.fitRows {
		t := make([]float64, k+1)
		copy(t, m.DocTopics(j))
		theta[i] = t
	}
	for i := range theta {
		if theta[i] == nil {
			t := make([]float64, k+1)
			t[k] = 1
			theta[i] = t
		}
	}

	labels := make([]string, k+1)
	for t := 0; t < k; t++ {
		labels[t] = themeLabel(m, t)
	}
	labels[k] = routineLabel

	copies := findCopies(p, m, f.repeatSim, cluster.DefaultCopyEps)
	switch {
	case copies.ran:
		in := 0
		for _, g := range copies.groups {
			in += len(g.Rows)
		}
		fmt.Fprintf(e.stderr, "repeated text: %d groups of %d or more narratives (%d narratives) among the %d long enough to compare\n",
			len(copies.groups), copyMinSize, in, copies.checked)
	case copies.err != nil && f.repeatSim != 0:
		fmt.Fprintf(e.stderr, "note: the search for repeated text was not made: %v\n", copies.err)
	}

	d, err := buildData(ctx, e, f, p, m, sweep, theta, labels)
	if err != nil {
		return res, err
	}
	pub := trend.Publish{Threshold: f.threshold}

	// Curation: labels file applied to the report and to the exports.
	themeMap := report.ThemeMap{Into: identity(k + 1), Hidden: make([]bool, k+1)}
	if cur != nil {
		tm, err := cur.Map(k)
		if err != nil {
			return res, err
		}
		themeMap = report.ThemeMap{Into: append(tm.Into, k), Hidden: append(tm.Hidden, false)}
		recompute := func(into int, from []int) ([]report.MonthPoint, []report.GroupShare, string, error) {
			folded := make([][]float64, n)
			for i := range theta {
				folded[i] = themeMap.Fold(nil, theta[i])
			}
			s, err := monthlySeries(p, folded)
			if err != nil {
				return nil, nil, "", err
			}
			mask := trend.SuppressSeries(s, pub)
			flags := trend.Changes(s, trend.ChangeSettings{})
			months := monthPoints(s, mask, flags, into, pub)
			var groups []report.GroupShare
			if len(p.set.GroupNames) > 0 {
				gt, err := groupTable(p, folded, 0)
				if err != nil {
					return nil, nil, "", err
				}
				groups = groupShares(gt, trend.SuppressGroups(gt, pub), into, pub)
			}
			dom := 0
			for i := range folded {
				if trend.Dominant(folded[i]) == into {
					dom++
				}
			}
			return months, groups, publishCount(dom, pub), nil
		}
		if err := report.Apply(d, cur, recompute); err != nil {
			return res, err
		}
		for t := 0; t < k; t++ {
			for _, th := range d.Themes {
				if th.ID == t {
					labels[t] = th.Label
				}
			}
		}
	}

	// The repeated-text section and the mixture heatmap use the curated themes.
	folded := make([][]float64, n)
	for i := range theta {
		folded[i] = themeMap.Fold(nil, theta[i])
	}
	ids := publishedIDs(p, f.publishIDs)
	copiesData(d, p, copies, folded, labels, pub, f.publishIDs)
	if err := mixtureData(d, p, m, folded, f.model.seed, ids, pub); err != nil {
		return res, err
	}

	reportPath := filepath.Join(f.out, "report.html")
	if err := report.WriteFile(reportPath, d); err != nil {
		return res, err
	}
	res.report = reportPath
	res.files = append(res.files, reportPath)

	written, err := writeExports(ctx, f, p, m, d, theta, labels, themeMap, pub, copies)
	res.files = append(res.files, written...)
	if err != nil {
		return res, err
	}
	return res, nil
}

// jobDone prints what a job wrote. After an interruption or a failure it lists the files
// that were finished (each was written completely under its final name; nothing
// half-written is left behind).
func jobDone(e *env, f *jobFlags, res *jobResult, err error) error {
	if err != nil {
		if res != nil && len(res.files) > 0 {
			fmt.Fprintf(e.stderr, "stopped before the end; these files were finished:\n")
			for _, p := range res.files {
				if _, serr := os.Stat(p); serr == nil {
					fmt.Fprintf(e.stderr, "\t%s\n", p)
				}
			}
		}
		return err
	}
	fmt.Fprintf(e.stdout, "%s\n", res.report)
	fmt.Fprintf(e.stderr, "wrote %d files into %s; open %s in a browser\n", len(res.files), f.out, res.report)
	return nil
}

// publishedIDs names every kept record as the published files do. Exports published beside
// the report name each narrative by its place in the input (file:line), not by its
// incident id, unless -publish-ids: ids with a date and a district can be linked to other
// records.
func publishedIDs(p *prepared, publishIDs bool) []string {
	ids := make([]string, len(p.set.Records))
	for i, r := range p.set.Records {
		ids[i] = recordRef(r)
		if publishIDs {
			ids[i] = r.ID
		}
	}
	return ids
}

// recordRef names a record by its place in the input: file base name and line.
func recordRef(r intake.Record) string {
	return fmt.Sprintf("%s:%d", filepath.Base(r.File), r.Line)
}

func allWithheld(ms []report.MonthPoint) bool {
	any := false
	for _, m := range ms {
		if m.Gap {
			continue
		}
		if !m.Withheld {
			return false
		}
		any = true
	}
	return any
}

func identity(n int) []int {
	out := make([]int, n)
	for i := range out {
		out[i] = i
	}
	return out
}

func publishCount(c int, p trend.Publish) string {
	th := p.Threshold
	if th == 0 {
		th = 10
	}
	if c < th && !p.Everything {
		return p.Withheld()
	}
	return strconv.Itoa(c)
}

// trendDocs turns the kept narratives into the trend package's input (undated ones are left
// out of the monthly series and counted in the data-quality notes).
func trendDocs(p *prepared, theta [][]float64, group int) []trend.Doc {
	docs := make([]trend.Doc, 0, len(theta))
	for i, r := range p.set.Records {
		if !r.HasDate && group < 0 {
			continue
		}
		d := trend.Doc{Date: r.Date, Theta: theta[i]}
		if group >= 0 {
			d.Group = r.Groups[group]
		}
		docs = append(docs, d)
	}
	return docs
}

func monthlySeries(p *prepared, theta [][]float64) (*trend.Series, error) {
	docs := trendDocs(p, theta, -1)
	if len(docs) == 0 {
		return nil, errors.New("no dated narratives: the monthly series needs a date column")
	}
	return trend.Monthly(docs, trend.Settings{})
}

func groupTable(p *prepared, theta [][]float64, g int) (*trend.GroupTable, error) {
	return trend.Groups(trendDocs(p, theta, g), trend.GroupSettings{})
}

// monthPoints is theme k's series as the report shows it, with withheld values and flags.
func monthPoints(s *trend.Series, mask *trend.Mask, flags []trend.Flag, k int, pub trend.Publish) []report.MonthPoint {
	// The explanations come from the published flag table, so that the report withholds
	// exactly what flags.csv withholds (details behind a withheld count are not shown).
	ft := trend.FlagTable(s, flags, trend.ChangeSettings{}, nil, pub)
	col := len(ft.Columns) - 1
	for c, cc := range ft.Columns {
		if cc.Name == "explanation" {
			col = c
		}
	}
	type flagText struct{ text string }
	flagAt := map[trend.Month][]flagText{}
	for i, fl := range flags {
		if fl.Theme == k {
			flagAt[fl.Month] = append(flagAt[fl.Month], flagText{ft.Rows[i][col]})
		}
	}
	out := make([]report.MonthPoint, len(s.Months))
	for i, mi := range s.Months {
		c := s.Cells[i][k]
		mp := report.MonthPoint{Month: mi.Month.String(), Gap: mi.Gap, Partial: mi.Partial}
		if !mi.Gap {
			switch {
			case mask.Count[i][k] && c.Count < thresholdOf(pub):
				mp.Count = pub.Withheld()
			case mask.Count[i][k]:
				mp.Count = trend.Hidden
			default:
				mp.Count = strconv.Itoa(c.Count)
			}
			if mask.Share[i][k] {
				mp.Withheld = true
			} else {
				mp.Share, mp.Low, mp.High = c.Share, c.Low, c.High
			}
		}
		if fs := flagAt[mi.Month]; len(fs) > 0 {
			mp.Flag = "above its baseline"
			var texts []string
			for _, fl := range fs {
				if len(texts) == 0 || texts[len(texts)-1] != fl.text {
					texts = append(texts, fl.text) // one "details withheld" for several methods
				}
			}
			mp.FlagText = strings.Join(texts, " ")
		}
		out[i] = mp
	}
	return out
}

func thresholdOf(p trend.Publish) int {
	if p.Threshold == 0 {
		return 10
	}
	return p.Threshold
}

// groupShares is theme k's shares by group as the report shows them.
func groupShares(g *trend.GroupTable, mask *trend.Mask, k int, pub trend.Publish) []report.GroupShare {
	out := make([]report.GroupShare, len(g.Groups))
	for i, name := range g.Groups {
		gs := report.GroupShare{Group: name}
		c := g.Counts[i][k]
		switch {
		case mask.Count[i][k] && c < thresholdOf(pub):
			gs.Count = pub.Withheld()
		case mask.Count[i][k]:
			gs.Count = trend.Hidden
		default:
			gs.Count = strconv.Itoa(c)
		}
		if mask.Share[i][k] {
			gs.Withheld = true
		} else {
			gs.Share, gs.Low, gs.High = g.Share[i][k], g.Low[i][k], g.High[i][k]
			if g.Test != nil && g.Test.StandsOut[i][k] {
				if g.Test.Residual[i][k] > 0 {
					gs.StandsOut, gs.Higher = "higher than the rest", true
				} else {
					gs.StandsOut = "lower than the rest"
				}
			}
		}
		out[i] = gs
	}
	return out
}

// buildData fills the report's data model.
func buildData(ctx context.Context, e *env, f *jobFlags, p *prepared, m *topics.Model, sweep *topics.SweepTable, theta [][]float64, labels []string) (*report.Data, error) {
	k := m.K()
	pub := trend.Publish{Threshold: f.threshold}
	d := &report.Data{Title: f.title}
	set := p.set

	// Overview.
	routine := len(set.Records) - len(p.fitRows)
	d.Overview = report.Overview{Read: set.Read, Kept: len(p.fitRows), Routine: routine}
	for _, rc := range intakeRejectCounts(set) {
		d.Overview.Rejected = append(d.Overview.Rejected, report.Reason{Reason: rc.Reason, Count: rc.N})
	}
	first, last := dateSpan(p)
	d.Overview.First, d.Overview.Last = first, last
	d.Overview.RoutineNote = routineNote(p)
	if first != "" {
		d.Subtitle = fmt.Sprintf("%d narratives, %s to %s", set.Read, first, last)
	}

	// Series and groups over all kept narratives (routine included in the totals).
	series, err := monthlySeries(p, theta)
	if err != nil {
		return nil, err
	}
	mask := trend.SuppressSeries(series, pub)
	flags := trend.Changes(series, trend.ChangeSettings{})
	var gt *trend.GroupTable
	var gmask *trend.Mask
	if len(set.GroupNames) > 0 {
		if gt, err = groupTable(p, theta, 0); err != nil {
			return nil, err
		}
		gmask = trend.SuppressGroups(gt, pub)
	}

	// Themes, largest first.
	sizes := m.Sizes()
	order := identity(k)
	sort.SliceStable(order, func(a, b int) bool { return sizes[order[a]].Expected > sizes[order[b]].Expected })
	dominant := make([]int, k+1)
	for i := range theta {
		dominant[trend.Dominant(theta[i])]++
	}
	for _, t := range order {
		// A guided theme's name comes from the analyst's seed file: a person's label.
		th := report.Theme{ID: t, Label: labels[t], LabelByPerson: m.ThemeName(t) != ""}
		for _, w := range m.TopWords(t, 12, 1) {
			th.TopWords = append(th.TopWords, strings.ReplaceAll(w.Display, "_", " "))
		}
		for _, w := range m.TopWords(t, 12, topics.DefaultLambda) {
			th.RelevantWords = append(th.RelevantWords, strings.ReplaceAll(w.Display, "_", " "))
		}
		for _, w := range m.TopWords(t, 12, 0.2) {
			th.DistinctiveWords = append(th.DistinctiveWords, strings.ReplaceAll(w.Display, "_", " "))
		}
		exp := 0.0
		for i := range theta {
			exp += theta[i][t]
		}
		th.Size = report.Size{Dominant: publishCount(dominant[t], pub), Expected: exp, Share: exp / float64(len(theta))}
		th.Months = monthPoints(series, mask, flags, t, pub)
		if allWithheld(th.Months) {
			th.SeriesNote = fmt.Sprintf("Every month's count of this theme is below %d or would let one be recovered, so its monthly series is withheld.", f.threshold)
		}
		th.TrendNote = trendNote(series, t)
		if gt != nil {
			th.GroupColumn = set.GroupNames[0]
			th.Groups = groupShares(gt, gmask, t, pub)
		}
		th.Examples = examples(p, m, t, f.examples, f.publishIDs)
		d.Themes = append(d.Themes, th)
	}

	// Theme tree on Hellinger distances between the themes' word distributions.
	phi := make([][]float64, k)
	for t := range phi {
		phi[t] = m.TopicTerms(t)
	}
	if k >= 2 {
		tree, err := cluster.NewThemeTree(phi, cluster.Hellinger, nil)
		if err != nil {
			return nil, err
		}
		d.Tree.Method = "average linkage (UPGMA) on Hellinger distances between the themes' word distributions"
		for t := 0; t < k; t++ {
			d.Tree.Leaves = append(d.Tree.Leaves, report.TreeLeaf{Theme: t, Label: labels[t]})
		}
		for _, mg := range tree.Tree.Merges {
			d.Tree.Merges = append(d.Tree.Merges, report.TreeMerge{Left: mg.A, Right: mg.B, Height: mg.Height})
		}
		top := m.TopIDs(10)
		for _, s := range tree.Suggestions(0) {
			if len(s.Themes) != 2 {
				continue
			}
			a, b := s.Themes[0], s.Themes[1]
			shared := topics.Jaccard(top[a], top[b])
			d.Tree.Suggestions = append(d.Tree.Suggestions, report.MergeSuggestion{A: a, B: b, Height: s.Height,
				Why: fmt.Sprintf("their word distributions are close (Hellinger %.2f); top-10 word overlap (Jaccard) %.2f", s.Height, shared)})
		}
	}

	// The choice of K.
	if sweep != nil {
		d.KChoice.Note = strings.Join(sweep.Reasons, " ") + edgeNote(sweep)
		for _, r := range sweep.Rows {
			d.KChoice.Rows = append(d.KChoice.Rows, report.KRow{K: r.K, HeldOutLL: r.HeldOutLL, NPMI: r.NPMI, UMass: r.UMass,
				Stability: nanToZero(r.Stability), Recommended: r.K == sweep.Recommended})
		}
	} else {
		d.KChoice.Note = fmt.Sprintf("The number of themes was set to %d by the analyst (-themes); no sweep was run.", k)
	}

	d.Methods = methods(f, p, m, k)
	d.Cautions = cautionItems(redact.Cautions)
	d.DataQuality = dataQuality(p, series)
	sentenceQuality(&d.DataQuality, p, pub)
	counts := map[string]int{}
	for _, t := range redact.AllTypes() {
		if c := p.counts.Of(t); c > 0 {
			counts[t.String()] = c
		}
	}
	d.Redaction = report.RedactionCountsFrom(counts)
	return d, nil
}

// cautionItems splits a caution text into items: its opening paragraph, each "- " bullet,
// and its closing paragraph, each with its line breaks joined.
func cautionItems(s string) []string {
	var items []string
	var cur []string
	inBullet := false
	flush := func() {
		if len(cur) > 0 {
			items = append(items, strings.Join(cur, " "))
			cur = nil
		}
	}
	for _, line := range strings.Split(s, "\n") {
		t := strings.TrimSpace(line)
		switch {
		case t == "":
			flush()
			inBullet = false
		case strings.HasPrefix(t, "- "):
			flush()
			inBullet = true
			cur = append(cur, strings.TrimPrefix(t, "- "))
		case inBullet && !strings.HasPrefix(line, " "):
			flush() // a paragraph after the bullets
			inBullet = false
			cur = append(cur, t)
		default:
			cur = append(cur, t)
		}
	}
	flush()
	return items
}

// edgeNote warns when the recommended K is the largest or smallest tried: the best may lie
// outside the range.
func edgeNote(t *topics.SweepTable) string {
	if len(t.Rows) < 2 {
		return ""
	}
	lo, hi := t.Rows[0].K, t.Rows[len(t.Rows)-1].K
	switch t.Recommended {
	case hi:
		return fmt.Sprintf(" K = %d is the largest number tried: a sweep over a wider range (-k-range) may find a better one.", hi)
	case lo:
		return fmt.Sprintf(" K = %d is the smallest number tried: a sweep over a wider range (-k-range) may find a better one.", lo)
	}
	return ""
}

func nanToZero(x float64) float64 {
	if math.IsNaN(x) {
		return 0
	}
	return x
}

func trendNote(s *trend.Series, t int) string {
	mk, err := trend.MannKendallShare(s, t)
	if err != nil {
		return ""
	}
	dir := "no clear rise or fall"
	if mk.P < 0.05 {
		if mk.S > 0 {
			dir = "a rise"
		} else {
			dir = "a fall"
		}
	}
	note := fmt.Sprintf("Over %d months with data, the share shows %s (Mann–Kendall τ = %.2f, p = %.3g; Theil–Sen slope %+.1f points a year)",
		mk.N, dir, mk.Tau, mk.P, 100*mk.Slope)
	if pt, err := trend.Poisson(s, t, 0.95); err == nil {
		note += fmt.Sprintf("; Poisson regression with the month's total as exposure: rate ratio %.2f a year (95%% CI %.2f–%.2f).", pt.RateRatio, pt.Low, pt.High)
	} else {
		note += "."
	}
	return note
}

// examples picks a theme's most representative narratives and marks its words in them.
func examples(p *prepared, m *topics.Model, t, n int, publishIDs bool) []report.Example {
	top := map[int32]bool{}
	for _, w := range m.TopWords(t, 30, topics.DefaultLambda) {
		top[int32(w.ID)] = true
	}
	var out []report.Example
	seen := map[string]bool{}
	for _, j := range m.Representative(t, 4*n) {
		if len(out) == n {
			break
		}
		i := p.fitRows[j]
		txt := p.published[i]
		if seen[txt] {
			continue // templated narratives: show one of them
		}
		seen[txt] = true
		r := p.set.Records[i]
		ex := report.Example{Share: m.DocTopics(j)[t], ID: recordRef(r)}
		if publishIDs {
			ex.ID = r.ID
		}
		if r.HasDate {
			ex.Date = r.Date.Format("2006-01-02")
		}
		ex.Segments = segments(p, txt, func(term int32) bool { return top[term] })
		out = append(out, ex)
	}
	return out
}

// segments cuts txt, a published (redacted) narrative, into the pieces an example shows:
// the spans of the terms for which hit is true are Hit segments. Every piece goes
// through displayText.
func segments(p *prepared, txt string, hit func(term int32) bool) []report.Segment {
	var out []report.Segment
	doc := p.frozen.Transform(redact.Blank(txt))
	prev := 0
	for q, sp := range doc.Spans {
		if !hit(doc.Terms[q]) || sp.Start < prev {
			continue
		}
		if sp.Start > prev {
			out = append(out, report.Segment{Text: displayText(txt[prev:sp.Start])})
		}
		out = append(out, report.Segment{Text: displayText(txt[sp.Start:sp.End]), Hit: true})
		prev = sp.End
	}
	if prev < len(txt) {
		out = append(out, report.Segment{Text: displayText(txt[prev:])})
	}
	return out
}

var (
	htmlTag    = regexp.MustCompile(`</?[A-Za-z][A-Za-z0-9]*(?:\s[^<>]*)?/?>`)
	spaceRunRe = regexp.MustCompile(`[ \t\x{00A0}]{2,}`)
)

// displayText cleans a piece of a narrative for reading: HTML tags left by the records system
// (<p>, <br />) become spaces and entities (&amp;, &nbsp;) their characters, as the text
// pipeline reads them. The page escapes the result, so nothing in it can run.
func displayText(s string) string {
	if strings.IndexByte(s, '<') < 0 && strings.IndexByte(s, '&') < 0 {
		return s
	}
	s = htmlTag.ReplaceAllString(s, " ")
	s = html.UnescapeString(s)
	return spaceRunRe.ReplaceAllString(s, " ")
}

func dateSpan(p *prepared) (string, string) {
	var first, last string
	for _, r := range p.set.Records {
		if !r.HasDate {
			continue
		}
		s := r.Date.Format("2006-01-02")
		if first == "" || s < first {
			first = s
		}
		if s > last {
			last = s
		}
	}
	return first, last
}

func routineNote(p *prepared) string {
	if len(p.routineN) == 0 {
		return "No narrative was set aside as routine."
	}
	keys := make([]string, 0, len(p.routineN))
	for k := range p.routineN {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	var parts []string
	for _, k := range keys {
		parts = append(parts, fmt.Sprintf("%s: %d", k, p.routineN[k]))
	}
	return "Narratives whose content reduces to a few routine words, or that repeat other narratives almost word for word, are counted and kept in every month's total but left out of fitting the themes (" + strings.Join(parts, "; ") + ")."
}

func methods(f *jobFlags, p *prepared, m *topics.Model, k int) report.Methods {
	s := p.settings
	mt := report.Methods{
		Steps: []string{
			"Read the export(s) and account for every row: kept, or rejected with its reason (rejects.csv).",
			"Redact personal information (names, phones, e-mail addresses, SSNs, dates of birth, ages, plates, VINs, addresses, case numbers) with typed placeholders.",
			"Normalise the text (Unicode NFKC, case folding, HTML residue removed, hyphenated line breaks rejoined), expand abbreviations, repair rare OCR misspellings, remove stopwords, stem (Snowball English), join frequent two-word phrases, prune the vocabulary.",
			"Set routine and near-duplicate narratives aside from fitting (they stay in the monthly totals).",
			"Fit LDA by collapsed Gibbs sampling, with the number of themes chosen by held-out likelihood, coherence and stability unless given.",
			"Describe each theme by its most probable and most relevant words (Sievert & Shirley 2014) and its most representative narratives.",
			"Cluster the themes by the Hellinger distance between their word distributions; order the narratives (or, when there are many, groups of narratives with similar theme shares) by Ward's method on their theme shares for the mixture heatmap.",
			"Look for narratives that repeat one text: complete linkage on the cosine similarities of their TF-IDF weights, comparing only narratives with nearly the same theme shares.",
			"Count each theme month by month (dominant theme) with 95% Wilson score intervals; flag unusual months (EARS C1–C3, Farrington); test the long-run trend (Mann–Kendall; Poisson regression with the month's total as exposure).",
			fmt.Sprintf("Withhold counts below %d and whatever would let them be recovered by subtraction.", f.threshold),
		},
		Seed:             strconv.FormatUint(f.model.seed, 10),
		InputFingerprint: p.inputHash,
	}
	kv := func(k, v string) { mt.Settings = append(mt.Settings, report.KV{Key: k, Value: v}) }
	kv("themes (K)", strconv.Itoa(k))
	kv("chains", strconv.Itoa(f.model.chains))
	kv("stability across chains", fmtFloat(m.Stability))
	kv("β (theme-word prior)", fmtFloat(m.Beta()))
	kv("vocabulary", strconv.Itoa(len(p.corpus.Vocab)))
	kv("OCR repair", strconv.FormatBool(s.Repair.Enabled))
	kv("phrases", strconv.FormatBool(s.Phrases.Enabled))
	kv("minimum narratives per word", strconv.Itoa(s.Vocab.MinDocs))
	kv("maximum share of narratives per word", fmtFloat(s.Vocab.MaxDocShare))
	kv("stopword lists", strings.Join(s.Stop.Lists, ", "))
	kv("boilerplate sentences set aside", sentenceSetting(s))
	kv("date column", p.set.DateName+" ("+p.set.DateRead+")")
	kv("narrative columns", strings.Join(p.set.TextNames, ", "))
	kv("group columns", strings.Join(p.set.GroupNames, ", "))
	kv("minimum published count", strconv.Itoa(f.threshold))
	if f.repeatSim > 0 {
		kv("repeated text: least similarity", fmtFloat(f.repeatSim))
		kv("repeated text: least counted words", strconv.Itoa(copyMinWords))
		kv("repeated text: least group size", strconv.Itoa(copyMinSize))
		kv("repeated text: theme-share blocking distance", fmtFloat(cluster.DefaultCopyEps)+" (halved within sets of more than "+strconv.Itoa(cluster.DefaultCopyMaxBlock)+" narratives)")
	} else {
		kv("repeated text", "not searched (-repeat-similarity 0)")
	}
	mt.Versions = append(mt.Versions, report.KV{Key: "undercurrent", Value: version}, report.KV{Key: "model file format", Value: strconv.Itoa(topics.FormatVersion)})
	if bi, ok := debug.ReadBuildInfo(); ok {
		mt.Versions = append(mt.Versions, report.KV{Key: "Go", Value: bi.GoVersion})
		for _, dep := range bi.Deps {
			switch dep.Path {
			case "gonum.org/v1/gonum", "github.com/kljensen/snowball", "github.com/go-echarts/go-echarts/v2", "golang.org/x/text", "github.com/xuri/excelize/v2":
				mt.Versions = append(mt.Versions, report.KV{Key: dep.Path, Value: dep.Version})
			}
		}
	}
	return mt
}

func fmtFloat(x float64) string {
	if math.IsNaN(x) {
		return "n/a"
	}
	return strconv.FormatFloat(x, 'g', 4, 64)
}

func dataQuality(p *prepared, s *trend.Series) report.DataQuality {
	var dq report.DataQuality
	dq.Notes = append(dq.Notes, p.set.Notes...)
	undated := 0
	for _, r := range p.set.Records {
		if !r.HasDate {
			undated++
		}
	}
	if undated > 0 {
		dq.Notes = append(dq.Notes, fmt.Sprintf("%d kept narratives have no date; they are in the themes but not in the monthly series.", undated))
	}
	files := report.Table{Title: "Files read", Columns: []string{"file", "format", "encoding", "rows", "lines not valid in that encoding"}}
	for _, fi := range p.set.Files {
		files.Rows = append(files.Rows, []string{filepath.Base(fi.Path), fi.Format, fi.Encoding, strconv.Itoa(fi.Rows), strconv.Itoa(fi.InvalidLines)})
	}
	dq.Tables = append(dq.Tables, files)
	if len(p.set.Rejects) > 0 {
		rt := report.Table{Title: "Rows not kept", Columns: []string{"reason", "rows"}}
		for _, rc := range intakeRejectCounts(p.set) {
			rt.Rows = append(rt.Rows, []string{rc.Reason, strconv.Itoa(rc.N)})
		}
		dq.Tables = append(dq.Tables, rt)
	}
	c := p.corpus
	dq.Notes = append(dq.Notes, fmt.Sprintf("The text pipeline read %d tokens in %d narratives and kept a vocabulary of %d terms.", c.Tokens, c.Docs, len(c.Vocab)))
	if len(c.Audit) > 0 {
		total := 0
		for _, a := range c.Audit {
			total += a.Count
		}
		dq.Notes = append(dq.Notes, fmt.Sprintf("OCR repair changed %d occurrences of %d distinct rare spellings to a frequent word; each one is listed in repairs.csv.", total, len(c.Audit)))
	}
	if len(c.Expansions) > 0 {
		at := report.Table{Title: "Abbreviations expanded (most frequent)", Columns: []string{"abbreviation", "expansion", "times"}}
		ex := append([]text.Expansion(nil), c.Expansions...)
		sort.SliceStable(ex, func(a, b int) bool {
			if ex[a].Count != ex[b].Count {
				return ex[a].Count > ex[b].Count
			}
			return ex[a].Abbrev < ex[b].Abbrev
		})
		for i, x := range ex {
			if i == 15 {
				break
			}
			at.Rows = append(at.Rows, []string{x.Abbrev, x.Expansion, strconv.Itoa(x.Count)})
		}
		dq.Tables = append(dq.Tables, at)
	}
	partial := 0
	gaps := 0
	for _, mi := range s.Months {
		if mi.Partial {
			partial++
		}
		if mi.Gap {
			gaps++
		}
	}
	dq.Notes = append(dq.Notes, fmt.Sprintf("The monthly series covers %d months; %d are only partly covered by the data and %d have no narratives at all (shown as gaps, not zeros).", len(s.Months), partial, gaps))
	return dq
}

// writeExports writes the tidy exports beside the report. Everything published is redacted
// and suppressed; unsuppressed tables go only to *.private.* files when asked for.
func writeExports(ctx context.Context, f *jobFlags, p *prepared, m *topics.Model, d *report.Data, theta [][]float64, labels []string, tm report.ThemeMap, pub trend.Publish, copies copyResult) ([]string, error) {
	var files []string
	out := f.out
	k := m.K()
	folded := make([][]float64, len(theta))
	for i := range theta {
		folded[i] = tm.Fold(nil, theta[i])
	}
	ids := publishedIDs(p, f.publishIDs)
	add := func(name string, fn func(w io.Writer) error) error {
		path := filepath.Join(out, name)
		files = append(files, path)
		return writeFileAtomic(path, fn)
	}
	if err := add("narratives-wide.csv", func(w io.Writer) error {
		rows := make([]export.WideRow, len(theta))
		for i, r := range p.set.Records {
			rows[i] = export.WideRow{ID: ids[i], Groups: r.Groups, Theta: folded[i]}
			if r.HasDate {
				rows[i].Date = r.Date.Format("2006-01-02")
			}
		}
		return export.WriteWide(w, p.set.GroupNames, labels, rows)
	}); err != nil {
		return files, err
	}
	if err := add("narratives-long.csv", func(w io.Writer) error {
		var rows []export.LongRow
		for i := range folded {
			rows = export.LongRows(rows, ids[i], folded[i], 0.01)
		}
		return export.WriteLong(w, rows)
	}); err != nil {
		return files, err
	}
	if err := add("themes.csv", func(w io.Writer) error { return export.WriteThemes(w, export.ThemeRows(d)) }); err != nil {
		return files, err
	}
	if err := add("repairs.csv", p.corpus.WriteAudit); err != nil {
		return files, err
	}
	if err := add("boilerplate-sentences.csv", func(w io.Writer) error { return writeSentenceCSV(w, p.corpus.Sentences, pub) }); err != nil {
		return files, err
	}

	series, err := monthlySeries(p, folded)
	if err != nil {
		return files, err
	}
	flags := trend.Changes(series, trend.ChangeSettings{})
	tables := []struct {
		name string
		make func(trend.Publish) *trend.Table
	}{
		{"monthly.csv", func(pb trend.Publish) *trend.Table { return trend.SeriesTable(series, flags, labels, pb) }},
		{"flags.csv", func(pb trend.Publish) *trend.Table {
			return trend.FlagTable(series, flags, trend.ChangeSettings{}, labels, pb)
		}},
		{"trends.csv", func(pb trend.Publish) *trend.Table { return trend.TrendTable(series, labels, 0.95, pb) }},
	}
	for g, name := range p.set.GroupNames {
		gt, err := groupTable(p, folded, g)
		if err != nil {
			return files, err
		}
		slug := slugify(name)
		tables = append(tables,
			struct {
				name string
				make func(trend.Publish) *trend.Table
			}{"groups-" + slug + ".csv", func(pb trend.Publish) *trend.Table { return gt.Table(labels, pb) }},
			struct {
				name string
				make func(trend.Publish) *trend.Table
			}{"groups-" + slug + "-test.csv", func(pb trend.Publish) *trend.Table {
				return trend.GroupTestTable(gt, trend.GroupSettings{}, pb)
			}})
	}
	for g, name := range p.set.GroupNames {
		wt, err := groupWordsTable(p, g, pub)
		if err != nil {
			return files, err
		}
		gname, wtab := "words-"+slugify(name)+".csv", wt
		tables = append(tables, struct {
			name string
			make func(trend.Publish) *trend.Table
		}{gname, func(pb trend.Publish) *trend.Table {
			if pb.Everything {
				t, _ := groupWordsTable(p, g, pb)
				return t
			}
			return wtab
		}})
	}
	if copies.ran {
		tables = append(tables, struct {
			name string
			make func(trend.Publish) *trend.Table
		}{"repeated-text.csv", func(pb trend.Publish) *trend.Table {
			min := thresholdOf(pb)
			if pb.Everything {
				min = 0
			}
			return export.CopyTable(copyRows(p, copies, folded, labels, ids, min), pb)
		}})
	}
	for _, t := range tables {
		path := filepath.Join(out, t.name)
		if err := trend.WriteFiles(path, t.make(pub)); err != nil {
			return files, err
		}
		files = append(files, path, strings.TrimSuffix(path, ".csv")+".json")
		if f.everything {
			priv := strings.TrimSuffix(path, ".csv") + ".private.csv"
			if err := trend.WriteFiles(priv, t.make(trend.Publish{Everything: true})); err != nil {
				return files, err
			}
			files = append(files, priv)
		}
	}
	_ = k
	_ = ctx
	return files, nil
}

// wordsAlpha0 is α_0 of the informative Dirichlet prior of the distinctive-word comparisons:
// the prior's weight in pseudo-words, spread over the words by their share of the whole
// collection (Monroe, Colaresi & Quinn 2008, section 3.5). Our choice, not the paper's.
const wordsAlpha0 = 500

// groupWordsTable compares the words of each value of group column g with the words of all
// the other values (weighted log-odds with an informative Dirichlet prior), 15 words a side.
func groupWordsTable(p *prepared, g int, pub trend.Publish) (*trend.Table, error) {
	disp := p.corpus.Display
	byGroup := map[string]map[string]int{}
	total := map[string]int{}
	for i, r := range p.set.Records {
		v := r.Groups[g]
		m := byGroup[v]
		if m == nil {
			m = map[string]int{}
			byGroup[v] = m
		}
		cols, vals := p.corpus.Counts.Row(i)
		for k, c := range cols {
			w := strings.ReplaceAll(disp[c], "_", " ")
			m[w] += int(vals[k])
			total[w] += int(vals[k])
		}
	}
	groups := make([]string, 0, len(byGroup))
	for v := range byGroup {
		groups = append(groups, v)
	}
	sort.Strings(groups)
	var out *trend.Table
	for _, v := range groups {
		rest := map[string]int{}
		for w, c := range total {
			if d := c - byGroup[v][w]; d > 0 {
				rest[w] = d
			}
		}
		if len(rest) == 0 || len(byGroup[v]) == 0 {
			continue
		}
		scores, err := trend.LogOdds(byGroup[v], rest, trend.WordSettings{Background: total, Alpha0: wordsAlpha0})
		if err != nil {
			return nil, err
		}
		t := trend.WordTable(scores, v, "rest", 15, pub)
		if out == nil {
			out = t
		} else {
			out.Rows = append(out.Rows, t.Rows...)
		}
	}
	if out == nil {
		out = trend.WordTable(nil, "", "rest", 15, pub)
	}
	return out, nil
}

func slugify(s string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(s) {
		switch {
		case r >= 'a' && r <= 'z', r >= '0' && r <= '9':
			b.WriteRune(r)
		default:
			if b.Len() > 0 && !strings.HasSuffix(b.String(), "-") {
				b.WriteByte('-')
			}
		}
	}
	return strings.Trim(b.String(), "-")
}
