package main

import (
	"bytes"
	"context"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"testing"

	"undercurrent/cluster"
	"undercurrent/report/export"
	"undercurrent/text/demotown"
	"undercurrent/topics"
)

// plantedFixture is the demo corpus (seed 1, 6,000 narratives, the demo's template rate:
// the corpus `make demo` writes) read, redacted, through the text pipeline and fitted once
// with 12 themes, for the tests of the search for repeated text.
var plantedFixture struct {
	once     sync.Once
	p        *prepared
	m        *topics.Model
	template map[string]string // incident id -> planted template family ("" for none)
	dir      string
	err      error
}

func planted(t *testing.T) (*prepared, *topics.Model, map[string]string) {
	t.Helper()
	f := &plantedFixture
	f.once.Do(func() {
		dir, err := os.MkdirTemp("", "undercurrent-copies-")
		if err != nil {
			f.err = err
			return
		}
		f.dir = dir
		c := demotown.Generate(demotown.Config{Seed: 1, N: 6000, TemplateRate: demotown.DemoTemplateRate})
		if f.err = c.WriteDir(dir); f.err != nil {
			return
		}
		f.template = map[string]string{}
		for _, tr := range c.Truth {
			f.template[tr.ID] = tr.Template
		}
		e := &env{stdout: io.Discard, stderr: io.Discard, quiet: true}
		var jf jobFlags
		jf.in.id, jf.in.date, jf.in.text, jf.in.now = "incident_id", "reported", "narrative", "2026-01-01"
		jf.model.seed, jf.model.chains, jf.model.themes = 1, 1, 12
		ctx := context.Background()
		f.p, f.err = prepare(ctx, e, &jf.in, &jf.text, &jf.redact, "", []string{filepath.Join(dir, demotown.IncidentsFile)})
		if f.err != nil {
			return
		}
		f.m, f.err = fitModel(ctx, e, f.p, &jf.model, 12)
	})
	if f.err != nil {
		t.Fatal(f.err)
	}
	return f.p, f.m, f.template
}

// copyScore compares the groups found with the planted copies (the demo's answer key,
// Truth.Template): recall is the share of the planted copies that were compared (fitted,
// not set aside as routine or near-exact duplicates, and long enough) found in a group;
// precision the share of the narratives in groups that are copies of their group's most
// common family. families counts the families that are the most common one of some group.
func copyScore(p *prepared, res copyResult, template map[string]string) (recall, precision float64, families int) {
	compared := 0
	for q, j := range p.fitRows {
		_, vals := p.fitCounts.Row(q)
		n := 0.0
		for _, v := range vals {
			n += v
		}
		if n >= copyMinWords && template[p.set.Records[j].ID] != "" {
			compared++
		}
	}
	found, pure, in := 0, 0, 0
	seen := map[string]bool{}
	for _, g := range res.groups {
		by := map[string]int{}
		for _, i := range g.Rows {
			by[template[p.set.Records[i].ID]]++
		}
		best, bestN := "", 0
		for fam, n := range by {
			if fam != "" && (n > bestN || n == bestN && fam < best) {
				best, bestN = fam, n
			}
		}
		found += len(g.Rows) - by[""]
		pure += bestN
		in += len(g.Rows)
		if best != "" {
			seen[best] = true
		}
	}
	return float64(found) / float64(compared), float64(pure) / float64(max(in, 1)), len(seen)
}

// TestRepeatedTextPlanted: on the demo corpus, the groups found hold the planted template
// copies (recall and precision against the answer key), every planted family is found,
// and the blocking by theme shares loses little against comparing every pair (the same
// search with an infinite blocking distance, which is exact complete linkage). The
// minimums are ours, set below the figures measured when the search was written (logged).
func TestRepeatedTextPlanted(t *testing.T) {
	p, m, template := planted(t)
	names, _ := demotown.TemplateFamilies()
	for _, tc := range []struct {
		sim                  float64
		recall, precision    float64
		families             int
		blockRecall, blockIn float64
	}{
		{0.7, 0.9, 0.98, len(names), 0.97, 0.9},
		{0.8, 0.7, 0.98, len(names), 0.97, 0.9},
	} {
		res := findCopies(p, m, tc.sim, cluster.DefaultCopyEps)
		exact := findCopies(p, m, tc.sim, math.Inf(1))
		if !res.ran || !exact.ran {
			t.Fatalf("sim %v: search not made: %v %v", tc.sim, res.err, exact.err)
		}
		recall, precision, fams := copyScore(p, res, template)
		// Blocking: the share of the exact groups' narratives found in some group, and the
		// share of exact groups found whole.
		inExact, kept, whole := 0, 0, 0
		inFound := map[int]int{}
		for gi, g := range res.groups {
			for _, i := range g.Rows {
				inFound[i] = gi + 1
			}
		}
		for _, g := range exact.groups {
			inExact += len(g.Rows)
			same := true
			for _, i := range g.Rows {
				if inFound[i] > 0 {
					kept++
				}
				if inFound[i] == 0 || inFound[i] != inFound[g.Rows[0]] {
					same = false
				}
			}
			if same && len(res.groups[inFound[g.Rows[0]]-1].Rows) == len(g.Rows) {
				whole++
			}
		}
		blockRecall := float64(kept) / float64(inExact)
		blockWhole := float64(whole) / float64(len(exact.groups))
		t.Logf("similarity %v: %d groups (%d narratives compared, %d short); planted copies: recall %.3f, precision %.3f, families %d of %d; "+
			"against every pair compared (%d groups): %.3f of their narratives found, %.3f of the groups found whole; %d comparisons instead of %d",
			tc.sim, len(res.groups), res.checked, res.short, recall, precision, fams, len(names), len(exact.groups), blockRecall, blockWhole, res.stats.Pairs, exact.stats.Pairs)
		if recall < tc.recall || precision < tc.precision || fams < tc.families {
			t.Errorf("similarity %v: recall %.3f (want ≥ %.2f), precision %.3f (want ≥ %.2f), families %d (want %d)", tc.sim, recall, tc.recall, precision, tc.precision, fams, tc.families)
		}
		if blockRecall < tc.blockRecall || blockWhole < tc.blockIn {
			t.Errorf("similarity %v: blocking kept %.3f of the exact groups' narratives (want ≥ %.2f) and %.3f of the groups whole (want ≥ %.2f)", tc.sim, blockRecall, tc.blockRecall, blockWhole, tc.blockIn)
		}
	}
}

// TestRepeatedTextExports runs the report on the demo corpus with a threshold of 5 and
// record ids published: repeated-text.csv holds exactly the groups of at least 5
// narratives (one row per narrative, numbered as in the report), the private file every
// group of 3 or more, the report lists each published group with one example, and the
// groups are made of planted copies (the answer key).
func TestRepeatedTextExports(t *testing.T) {
	_, _, template := planted(t)
	// Run under GOMAXPROCS 2 and 1: the outputs are byte-identical (the determinism rule;
	// TestDemoDeterministic checks every file of a smaller demo, whose groups are too small
	// to be published).
	var out, stderr string
	var outs []string
	for _, procs := range []int{2, 1} {
		old := runtime.GOMAXPROCS(procs)
		o := t.TempDir()
		args := append([]string{"report", "-out", o, "-themes", "12", "-iterations", "100", "-chains", "1",
			"-min-count", "5", "-publish-small-counts", "-publish-ids"}, inputArgs...)
		code, _, se := runArgs(t, append(args, filepath.Join(plantedFixture.dir, demotown.IncidentsFile))...)
		runtime.GOMAXPROCS(old)
		if code != exitOK {
			t.Fatalf("report: exit %d\n%s", code, se)
		}
		if out == "" {
			out, stderr = o, se
		}
		outs = append(outs, o)
	}
	for _, name := range []string{"report.html", "repeated-text.csv", "repeated-text.json", "repeated-text.private.csv", "repeated-text.private.json"} {
		a, errA := os.ReadFile(filepath.Join(outs[0], name))
		b, errB := os.ReadFile(filepath.Join(outs[1], name))
		if errA != nil || errB != nil || !bytes.Equal(a, b) {
			t.Errorf("%s differs between GOMAXPROCS 2 and 1 (%v, %v)", name, errA, errB)
		}
	}
	if !strings.Contains(stderr, "repeated text: ") {
		t.Errorf("stderr does not report the search:\n%s", stderr)
	}
	pub := readCSVFile(t, filepath.Join(out, "repeated-text.csv"))
	priv := readCSVFile(t, filepath.Join(out, "repeated-text.private.csv"))
	if _, err := os.Stat(filepath.Join(out, "repeated-text.json")); err != nil {
		t.Error(err)
	}
	head := make([]string, len(export.CopyColumns))
	for i, c := range export.CopyColumns {
		head[i] = c.Name
	}
	for _, f := range [][][]string{pub, priv} {
		if strings.Join(f[0], ",") != strings.Join(head, ",") {
			t.Fatalf("header %v, want %v", f[0], head)
		}
	}
	type group struct {
		size int
		ids  []string
	}
	read := func(rows [][]string) []group {
		var gs []group
		for _, r := range rows[1:] {
			g, size := atoi(t, r[0]), atoi(t, r[1])
			for len(gs) < g {
				gs = append(gs, group{})
			}
			gs[g-1].size = size
			gs[g-1].ids = append(gs[g-1].ids, r[3])
		}
		return gs
	}
	pg, vg := read(pub), read(priv)
	if len(pg) == 0 {
		t.Fatal("no published group")
	}
	for i, g := range pg {
		if g.size < 5 || len(g.ids) != g.size {
			t.Errorf("published group %d: size %d, %d rows (want at least 5, one row each)", i+1, g.size, len(g.ids))
		}
		if i >= len(vg) || strings.Join(vg[i].ids, ",") != strings.Join(g.ids, ",") {
			t.Errorf("published group %d is not the private file's group %d", i+1, i+1)
		}
	}
	small := 0
	for _, g := range vg[len(pg):] {
		if g.size < 3 || g.size >= 5 || len(g.ids) != g.size {
			t.Errorf("private-only group of size %d with %d rows (want 3 or 4)", g.size, len(g.ids))
		}
		small++
	}
	// Precision against the answer key: narratives in published groups that are copies of
	// their group's most common planted family.
	pure, in := 0, 0
	for _, g := range pg {
		by := map[string]int{}
		for _, id := range g.ids {
			by[template[id]]++
		}
		best := 0
		for fam, n := range by {
			if fam != "" {
				best = max(best, n)
			}
		}
		pure += best
		in += len(g.ids)
	}
	t.Logf("%d published groups (%d narratives), %d more of 3 or 4 in the private file; %d of the published narratives are copies of their group's planted family", len(pg), in, small, pure)
	if float64(pure) < 0.98*float64(in) {
		t.Errorf("only %d of %d narratives in published groups are copies of their group's planted family", pure, in)
	}
	page, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	if n := strings.Count(string(page), `class="uc-example uc-copy"`); n != min(len(pg), copyListMax) {
		t.Errorf("the report shows %d group examples, want %d", n, min(len(pg), copyListMax))
	}
	for _, want := range []string{`id="repeated-text"`, `uc-chart-mixture`, "repeated text: least similarity"} {
		if !strings.Contains(string(page), want) {
			t.Errorf("report lacks %q", want)
		}
	}
}

func atoi(t *testing.T, s string) int {
	t.Helper()
	n, err := strconv.Atoi(s)
	if err != nil {
		t.Fatalf("%q: %v", s, err)
	}
	return n
}

// TestMixtureSmall: with at most 150 fitted narratives the mixture heatmap has one column
// per narrative (cluster.HeatmapOrder), each named as the exports name it, with its shares
// in the table; beyond, groups (the other tests' corpora).
func TestMixtureSmall(t *testing.T) {
	dir := t.TempDir()
	if err := demotown.Generate(demotown.Config{Seed: 5, N: 140}).WriteDir(dir); err != nil {
		t.Fatal(err)
	}
	out := t.TempDir()
	args := append([]string{"report", "-out", out, "-themes", "4", "-iterations", "40", "-chains", "1"}, inputArgs...)
	code, _, stderr := runArgs(t, append(args, filepath.Join(dir, demotown.IncidentsFile))...)
	if code != exitOK {
		t.Fatalf("report: exit %d\n%s", code, stderr)
	}
	b, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	page := string(b)
	m := regexp.MustCompile(`Columns: the ([0-9]+) narratives fitted, ordered by Ward&#39;s method`).FindStringSubmatch(page)
	if m == nil {
		t.Fatal("the mixture heatmap does not say it shows every narrative")
	}
	n := atoi(t, m[1])
	if got := strings.Count(page, `<tr><th scope="row">incidents.csv:`); got != n || n == 0 || n > mixtureColumns {
		t.Errorf("%d narrative columns in the mixture table, want %d (at most %d)", got, n, mixtureColumns)
	}
}
