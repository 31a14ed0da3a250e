package main

import (
	"fmt"
	"sort"
	"strconv"

	"undercurrent/cluster"
	"undercurrent/report"
	"undercurrent/report/export"
	"undercurrent/report/trend"
	"undercurrent/text/weight"
	"undercurrent/topics"
)

// Repeated text: narratives that repeat one text (templated narratives, one text pasted into
// report after report with a few details changed), found by cluster.CopyGroups.
const (
	// copyMinWords is the least number of counted words (vocabulary terms after stopwords,
	// stemming and pruning) of a narrative compared: short narratives coincide by chance
	// ("verbal warning given, cleared"), so a group of them says nothing about copying. On
	// the demo corpus without this rule, every one of the 418 narratives grouped at a
	// similarity of 0.8 that was no planted copy had fewer than 15 counted words; planted
	// copies have 25 or more.
	copyMinWords = 20
	// copyMinSize is the least number of narratives of a group.
	copyMinSize = 3
	// copyListMax is the largest number of groups the report lists (all of them are in
	// repeated-text.csv).
	copyListMax = 50
)

// copyResult is the outcome of the search for repeated text.
type copyResult struct {
	ran     bool
	sim     float64
	eps     float64 // blocking distance
	checked int     // fitted narratives compared (long enough)
	short   int     // fitted narratives too short to compare
	stats   cluster.CopyStats
	// groups are the groups found, largest first; their rows are indices of kept
	// records (p.set.Records), and so is Medoid.
	groups []cluster.CopyGroup
	err    error // why the search could not be made
}

// findCopies looks for groups of fitted narratives that repeat one text: complete linkage
// on the cosine distances of their TF-IDF rows (the text pipeline's weighting, with the idf
// of the fitted narratives), cut at similarity sim, blocked by the model's document-theme
// shares θ (cluster.CopyGroups says what is exact and what is not). Routine narratives,
// which include the near-exact duplicates, were set aside before fitting and are not
// compared. sim 0 switches the search off. eps is the blocking distance
// (cluster.DefaultCopyEps in the job; +Inf compares every pair).
func findCopies(p *prepared, m *topics.Model, sim, eps float64) copyResult {
	res := copyResult{sim: sim, eps: eps}
	if sim == 0 {
		res.err = fmt.Errorf("the search was switched off (-repeat-similarity 0)")
		return res
	}
	var rows []int // indices into p.fitRows
	for j := range p.fitRows {
		_, v := p.fitCounts.Row(j)
		n := 0.0
		for _, x := range v {
			n += x
		}
		if n >= copyMinWords {
			rows = append(rows, j)
		}
	}
	res.checked, res.short = len(rows), len(p.fitRows)-len(rows)
	res.ran = true
	if len(rows) < copyMinSize {
		return res
	}
	// TF-IDF of the compared rows only, with the idf of all the fitted narratives.
	idf := weight.IDFWeights(nil, p.fitCounts.DocumentFrequency(), p.fitCounts.Rows, p.settings.Weight.IDF)
	words := weight.TFIDFWith(subRows(p.fitCounts, rows), p.settings.Weight, idf)
	theta := make([][]float64, len(rows))
	for q, j := range rows {
		theta[q] = m.DocTopics(j)
	}
	groups, st, err := cluster.CopyGroups(theta, words, &cluster.CopySettings{Similarity: sim, Eps: eps, MinSize: copyMinSize})
	res.stats = st
	if err != nil {
		res.ran, res.err = false, err
		return res
	}
	for g := range groups {
		for k, q := range groups[g].Rows {
			groups[g].Rows[k] = p.fitRows[rows[q]]
		}
		groups[g].Medoid = p.fitRows[rows[groups[g].Medoid]]
	}
	res.groups = groups
	return res
}

// copiesData fills the report's repeated-text section and each shown theme's share of
// narratives in groups, from the folded θ (after the labels file), with the report's
// suppression: only groups of at least the threshold are listed, and counts below it are
// withheld.
func copiesData(d *report.Data, p *prepared, res copyResult, folded [][]float64, labels []string, pub trend.Publish, publishIDs bool) {
	if !res.ran {
		if res.err != nil {
			d.Copies.Note = "The search for narratives that repeat one text was not made: " + res.err.Error() + "."
		}
		return
	}
	th := thresholdOf(pub)
	c := report.Copies{Ran: true, Checked: res.checked, Short: res.short, Groups: len(res.groups)}
	split := ""
	if res.stats.LeastEps < res.eps {
		split = fmt.Sprintf(", down to %s within sets of more than %s narratives", fmtFloat(res.stats.LeastEps), fmtInt64(cluster.DefaultCopyMaxBlock))
	}
	c.Method = fmt.Sprintf("Narratives with at least %d counted words were compared by their words (TF-IDF weights) "+
		"with complete linkage on cosine similarities: in every group, every two narratives have a cosine similarity of at least %s. "+
		"To keep the work small, only narratives with nearly the same theme shares were compared "+
		"(linked by steps of at most %s between their theme-share vectors%s), so two copies whose theme shares differ more than that can be missed "+
		"(%s comparisons in %d sets of at most %s narratives). "+
		"Routine narratives and near-exact duplicates were already set aside before fitting and are not counted here.",
		copyMinWords, fmtFloat(res.sim), fmtFloat(res.eps), split, fmtInt64(res.stats.Pairs), res.stats.Blocks, fmtInt64(int64(res.stats.LargestBlock)))
	if p.corpus.Sentences != nil {
		c.Method += " Boilerplate sentences were set aside from the counts (-set-aside-repeated-sentences), so the narratives were compared by the words left; a copy whose shared sentences were all set aside is compared by its details alone and is not found."
	}
	in := 0
	byTheme := map[int]int{}
	small := 0
	for gi, g := range res.groups {
		in += len(g.Rows)
		counts := map[int]int{}
		first, last := "", ""
		for _, i := range g.Rows {
			t := trend.Dominant(folded[i])
			counts[t]++
			byTheme[t]++
			if r := p.set.Records[i]; r.HasDate {
				mo := r.Date.Format("2006-01")
				if first == "" || mo < first {
					first = mo
				}
				last = max(last, mo)
			}
		}
		if len(g.Rows) < th {
			small++
			continue
		}
		if len(c.Listed) == copyListMax {
			continue
		}
		cg := report.CopyGroup{Number: gi + 1, Size: strconv.Itoa(len(g.Rows)), LeastSimilarity: g.LeastSimilarity, First: first, Last: last}
		themes := make([]int, 0, len(counts))
		for t := range counts {
			themes = append(themes, t)
		}
		sort.Slice(themes, func(a, b int) bool {
			if counts[themes[a]] != counts[themes[b]] {
				return counts[themes[a]] > counts[themes[b]]
			}
			return themes[a] < themes[b]
		})
		// The group's size is shown; its theme counts are withheld below the threshold,
		// with whatever would let one be recovered from the size (trend.Suppress).
		vals := []float64{float64(len(g.Rows))}
		rel := []int{0}
		for k, t := range themes {
			vals = append(vals, float64(counts[t]))
			rel = append(rel, k+1)
		}
		hide := trend.Suppress(nil, vals, [][]int{rel}, float64(th))
		for k, t := range themes {
			ct := report.CopyTheme{Theme: t, Label: labels[t], Count: strconv.Itoa(counts[t])}
			if hide[k+1] {
				ct.Count = trend.Hidden
				if counts[t] < th {
					ct.Count = pub.Withheld()
				}
			}
			cg.Themes = append(cg.Themes, ct)
		}
		cg.Example = copyExample(p, g, publishIDs)
		c.Listed = append(c.Listed, cg)
	}
	c.InGroups = publishCount(in, pub)
	var notes []string
	if small > 0 {
		notes = append(notes, fmt.Sprintf("%d group%s of fewer than %d narratives %s counted but not listed.", small, plural(small), th, isAre(small)))
	}
	if big := len(res.groups) - small; big > copyListMax {
		notes = append(notes, fmt.Sprintf("The %d largest groups are listed; all %d groups of at least %d narratives are in repeated-text.csv.", copyListMax, big, th))
	}
	for k, n := range notes {
		if k > 0 {
			c.Note += " "
		}
		c.Note += n
	}
	d.Copies = c

	// Each shown theme: its narratives in groups, over its narratives (strongest theme).
	dominant := map[int]int{}
	for i := range folded {
		dominant[trend.Dominant(folded[i])]++
	}
	for k := range d.Themes {
		t := &d.Themes[k]
		n := byTheme[t.ID]
		t.Copies = publishCount(n, pub)
		if n < th || dominant[t.ID] == 0 {
			t.CopiesWithheld = true
			t.CopiesShare = 0
			continue
		}
		t.CopiesShare = float64(n) / float64(dominant[t.ID])
	}
}

// copyExample is the group's medoid narrative, redacted, with the words marked that not
// every narrative of the group has: the details that change from copy to copy.
func copyExample(p *prepared, g cluster.CopyGroup, publishIDs bool) report.Example {
	in := map[int32]int{}
	for _, i := range g.Rows {
		cols, _ := p.corpus.Counts.Row(i)
		for _, c := range cols {
			in[c]++
		}
	}
	r := p.set.Records[g.Medoid]
	ex := report.Example{ID: recordRef(r), Share: 1}
	if publishIDs {
		ex.ID = r.ID
	}
	if r.HasDate {
		ex.Date = r.Date.Format("2006-01-02")
	}
	n := len(g.Rows)
	ex.Segments = segments(p, p.published[g.Medoid], func(term int32) bool { return in[term] > 0 && in[term] < n })
	return ex
}

// copyRows are the rows of repeated-text.csv: every narrative of every group of at least
// min narratives, by group, in input order within a group.
func copyRows(p *prepared, res copyResult, folded [][]float64, labels []string, ids []string, min int) []export.CopyRow {
	var out []export.CopyRow
	for gi, g := range res.groups {
		if len(g.Rows) < min {
			continue
		}
		for _, i := range g.Rows {
			t := trend.Dominant(folded[i])
			out = append(out, export.CopyRow{Group: gi + 1, Size: len(g.Rows), LeastSimilarity: g.LeastSimilarity, ID: ids[i], Theme: t, Label: labels[t]})
		}
	}
	return out
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

func isAre(n int) string {
	if n == 1 {
		return "is"
	}
	return "are"
}

func fmtInt64(n int64) string {
	s := strconv.FormatInt(n, 10)
	var b []byte
	for i := range s {
		if i > 0 && (len(s)-i)%3 == 0 {
			b = append(b, ',')
		}
		b = append(b, s[i])
	}
	return string(b)
}

// mixtureColumns is the largest number of columns of the mixture heatmap: beyond it the
// narratives are summarised into that many groups.
const mixtureColumns = 150

// mixtureData fills the narrative-by-theme heatmap from the folded θ of the fitted
// narratives: rows are the shown themes in the order of the theme tree, columns the
// narratives ordered by cluster.HeatmapOrder (Ward's tree in optimal leaf order) when there
// are at most mixtureColumns of them; otherwise mixtureColumns groups of narratives with
// similar theme shares (cluster.Summarize: seeded k-means++ micro-clusters), ordered by
// the exact weighted Ward tree over the groups' mean shares, in optimal leaf order.
func mixtureData(d *report.Data, p *prepared, m *topics.Model, folded [][]float64, seed uint64, ids []string, pub trend.Publish) error {
	shown := map[int]bool{}
	for _, t := range d.Themes {
		shown[t.ID] = true
	}
	var rows []int
	k := m.K()
	if k >= 2 {
		phi := make([][]float64, k)
		for t := range phi {
			phi[t] = m.TopicTerms(t)
		}
		tree, err := cluster.NewThemeTree(phi, cluster.Hellinger, nil)
		if err != nil {
			return err
		}
		for _, t := range tree.Tree.Leaves(nil) { // the order the theme tree is drawn in
			if shown[t] {
				rows = append(rows, t)
			}
		}
	} else {
		for _, t := range d.Themes {
			rows = append(rows, t.ID)
		}
	}
	if len(rows) == 0 || len(p.fitRows) == 0 {
		return nil
	}
	x := make([][]float64, len(p.fitRows))
	for j, i := range p.fitRows {
		v := make([]float64, len(rows))
		for r, t := range rows {
			v[r] = folded[i][t]
		}
		x[j] = v
	}
	mx := report.Mixture{Themes: rows}
	n := len(x)
	if n <= mixtureColumns {
		order, err := cluster.HeatmapOrder(x, seed, nil)
		if err != nil {
			return err
		}
		for _, j := range order {
			mx.Columns = append(mx.Columns, report.MixColumn{Label: ids[p.fitRows[j]], Count: "1", Shares: clamp01(x[j])})
		}
		mx.Method = fmt.Sprintf("Columns: the %d narratives fitted, ordered by Ward's method on their theme shares in the optimal leaf order (Bar-Joseph, Gifford & Jaakkola 2001). Rows: the themes in the order of the theme tree.", n)
	} else {
		sum, err := cluster.Summarize(x, nil, &cluster.SummarySettings{K: mixtureColumns, Seed: seed})
		if err != nil {
			return err
		}
		order := sum.Tree.DisplayOrder(cluster.EuclideanCondensed(nil, sum.Centroids, nil), nil)
		for c, g := range order {
			mx.Columns = append(mx.Columns, report.MixColumn{Label: fmt.Sprintf("group %d", c+1),
				Count: publishCount(int(sum.Weights[g]), pub), Shares: clamp01(sum.Centroids[g])})
		}
		mx.Method = fmt.Sprintf("Columns: the %s narratives fitted, summarised into %d groups of narratives with similar theme shares "+
			"(k-means++ with seed %d and Lloyd's iterations), each shown by its narratives' mean shares; "+
			"the groups are ordered by Ward's method on those means weighted by the groups' sizes, in the optimal leaf order (Bar-Joseph, Gifford & Jaakkola 2001). "+
			"Rows: the themes in the order of the theme tree.", fmtInt64(int64(n)), len(order), seed)
	}
	d.Mixture = mx
	return nil
}

// clamp01 copies v with each value rounded into [0, 1] (means of shares can exceed 1 by a
// rounding error).
func clamp01(v []float64) []float64 {
	out := make([]float64, len(v))
	for i, x := range v {
		out[i] = min(1, max(0, x))
	}
	return out
}
