package cluster

import (
	"fmt"
	"math"
	"slices"

	"undercurrent/text/sparse"
)

// CopySettings tunes CopyGroups. The zero value is ready to use.
type CopySettings struct {
	// Eps is the blocking distance on the theme vectors: only rows linked by a
	// chain of Euclidean steps of at most Eps (LinkedSets) are compared by
	// their words. Zero means DefaultCopyEps.
	Eps float64
	// MaxBlock bounds the work: a set of rows linked within Eps that has more
	// than MaxBlock rows is split into the sets linked within Eps/2 among its
	// rows, and so on, at most 6 times. Zero means DefaultCopyMaxBlock.
	MaxBlock int
	// Similarity is the least cosine similarity of the words of any two rows
	// of a group (the cut of complete linkage at 1 − Similarity). Zero means
	// DefaultCopySimilarity; it must be in (0, 1].
	Similarity float64
	// MinSize is the least number of rows of a group; zero means 3.
	MinSize int
	// Workers as in Settings; results never depend on it.
	Workers int
}

// Defaults of CopySettings. The similarity was chosen on the demo corpus
// (text/demotown with planted template copies): at 0.7 every group found
// held copies of one planted template only, while 0.8 split most templates
// into several groups (see the measurements in cmd/undercurrent's tests).
// The blocking distance is far above the distances between the theme
// vectors of copies of one template there (mostly below 0.02); on that
// corpus (6,000 narratives) the blocked search finds exactly the groups of
// the search that compares every pair. The largest block costs
// MaxBlock²/2 comparisons (8 million, about half a CPU-second).
const (
	DefaultCopyEps        = 0.2
	DefaultCopyMaxBlock   = 4000
	DefaultCopySimilarity = 0.7
)

// copySplits is the most times a block is split by halving the distance.
const copySplits = 6

// CopyGroup is a group of rows whose words are all close: every two of its
// rows have a cosine similarity of at least LeastSimilarity, which is at
// least CopySettings.Similarity.
type CopyGroup struct {
	Rows            []int // ascending
	LeastSimilarity float64
	// Medoid is the row of the group with the least sum of cosine distances to
	// the others (the lowest such row on ties): a representative copy.
	Medoid int
}

// CopyStats says how much work CopyGroups did, for a methods note.
type CopyStats struct {
	Blocks       int // sets of rows linked on the theme vectors (of at least MinSize rows)
	InBlocks     int // rows in those sets
	LargestBlock int
	// LeastEps is the smallest blocking distance used (below Eps when a set
	// was split because it had more than MaxBlock rows).
	LeastEps float64
	Pairs    int64 // word comparisons made
}

// CopyGroups finds groups of near-identical rows, such as templated
// narratives (one text pasted into report after report with a few details
// changed). Row i has a theme vector theta[i] (for example its
// document-theme shares θ) and a row of words, row i of words (for example
// its TF-IDF weights; rows need not be normalised, but an empty row is a
// caller bug and panics). The groups are those of complete linkage on the
// cosine distances between the word rows,
//
//	d(a, b) = 1 − a·b / (‖a‖ ‖b‖)
//
// cut at height 1 − Similarity, with at least MinSize rows, largest first
// (ties by first row): every two rows of a group share a cosine similarity
// of at least Similarity.
//
// What is exact and what is approximate. Comparing every pair of words
// costs n² work, so the theme vectors block the search: the rows are split
// into the sets linked by chains of steps of at most Eps between theme
// vectors (LinkedSets; single linkage at Eps, exact), a set of more than
// MaxBlock rows is split again into the sets linked within Eps/2 among its
// rows (and so on, at most 6 times), and words are compared only within
// the final sets, the blocks. Within each block everything is exact: every
// pair is compared, the pairs at distance ≤ 1 − Similarity form a graph,
// and complete linkage (Link, on the condensed matrix of cosine distances
// of each connected component of that graph alone) is cut at that height;
// complete linkage never merges across those components below the cut, so
// this is exactly complete linkage on the whole set. The approximation is
// the blocking: a pair of rows similar in words but whose theme vectors
// are not chained within the block's distance is never compared, so such
// copies can be missed or a group found split. The result equals complete
// linkage on all rows whenever no pair closer than the cut in words lies in
// two different blocks (CopyStats.LeastEps says how far the splitting
// went).
//
// Cost: O(n·d) memory for the blocking, O(Σ b²) word comparisons for
// blocks of b rows (split over Settings.Workers goroutines, each row's
// comparisons on one of them; each worker keeps its own union–find, merged
// at the end, so results do not depend on the number), and the condensed
// matrix of the largest component of similar pairs. It returns an error if
// such a component exceeds MaxComponent rows, or for bad theme vectors.
// It panics if len(theta) != words.Rows or the settings are out of range.
func CopyGroups(theta [][]float64, words *sparse.Matrix, set *CopySettings) ([]CopyGroup, CopyStats, error) {
	var st CopyStats
	cs := CopySettings{}
	if set != nil {
		cs = *set
	}
	if cs.Eps == 0 {
		cs.Eps = DefaultCopyEps
	}
	if cs.Similarity == 0 {
		cs.Similarity = DefaultCopySimilarity
	}
	if cs.MinSize == 0 {
		cs.MinSize = 3
	}
	if cs.Eps < 0 || !(cs.Similarity > 0 && cs.Similarity <= 1) || cs.MinSize < 1 {
		panic("cluster: CopyGroups needs Eps ≥ 0, Similarity in (0, 1] and MinSize ≥ 1")
	}
	if len(theta) != words.Rows {
		panic("cluster: len(theta) != words.Rows")
	}
	n := len(theta)
	s := &Settings{Workers: cs.Workers}
	if cs.MaxBlock == 0 {
		cs.MaxBlock = DefaultCopyMaxBlock
	}
	if cs.MaxBlock < 1 {
		panic("cluster: CopyGroups needs MaxBlock ≥ 1")
	}
	all := make([]int, n)
	for i := range all {
		all[i] = i
	}
	st.LeastEps = cs.Eps
	blocks, err := copyBlocks(theta, all, cs.Eps, cs.MinSize, cs.MaxBlock, copySplits, s, &st)
	if err != nil {
		return nil, st, err
	}
	inv := make([]float64, n)
	for _, b := range blocks {
		st.InBlocks += len(b)
		st.LargestBlock = max(st.LargestBlock, len(b))
		for _, i := range b {
			_, v := words.Row(i)
			var ss float64
			for _, x := range v {
				ss += x * x
			}
			if !(ss > 0) || math.IsInf(ss, 0) {
				panic(fmt.Sprintf("cluster: CopyGroups: word row %d is empty or not finite", i))
			}
			inv[i] = 1 / math.Sqrt(ss)
		}
	}
	st.Blocks = len(blocks)
	h := 1 - cs.Similarity

	// Every pair within every block, in tasks of one row each (its pairs
	// with the later rows of its block), taken by the workers in turn.
	type task struct{ b, k int }
	var tasks []task
	for b, rows := range blocks {
		for k := 0; k+1 < len(rows); k++ {
			tasks = append(tasks, task{b, k})
			st.Pairs += int64(len(rows) - 1 - k)
		}
	}
	found := newForest(n)
	bufs := make([][]float64, s.workers())
	forEachTask(len(tasks), s.workers(), n, func(k, t int, f forest) {
		if bufs[k] == nil {
			bufs[k] = make([]float64, words.Cols)
		}
		buf := bufs[k]
		rows := blocks[tasks[t].b]
		a := rows[tasks[t].k]
		scatter(buf, words, a, inv[a])
		for _, b := range rows[tasks[t].k+1:] {
			if cosDist(buf, words, b, inv[b]) <= h {
				f.union(a, b)
			}
		}
		unscatter(buf, words, a)
	}, found)

	var out []CopyGroup
	buf := make([]float64, words.Cols)
	for _, comp := range found.sets(cs.MinSize) {
		if len(comp) > MaxComponent {
			return nil, st, fmt.Errorf("cluster: %d rows are chained by word similarities of at least %v (more than %d); use a higher similarity", len(comp), cs.Similarity, MaxComponent)
		}
		m := len(comp)
		dist := make([]float64, CondensedLen(m))
		for p := 0; p < m; p++ {
			a := comp[p]
			scatter(buf, words, a, inv[a])
			for q := p + 1; q < m; q++ {
				dist[cidx(m, p, q)] = cosDist(buf, words, comp[q], inv[comp[q]])
			}
			unscatter(buf, words, a)
		}
		t, err := Link(dist, Complete, s)
		if err != nil {
			return nil, st, err
		}
		for _, g := range groupsAt(t, h, cs.MinSize) {
			cg := CopyGroup{Rows: make([]int, len(g.Themes)), LeastSimilarity: 1 - g.Height}
			best := math.Inf(1)
			for k, v := range g.Themes {
				cg.Rows[k] = comp[v]
				var sum float64
				for _, u := range g.Themes {
					if u != v {
						sum += dist[cidx(m, u, v)]
					}
				}
				if sum < best {
					best, cg.Medoid = sum, comp[v]
				}
			}
			out = append(out, cg)
		}
	}
	slices.SortStableFunc(out, func(a, b CopyGroup) int {
		if len(a.Rows) != len(b.Rows) {
			return len(b.Rows) - len(a.Rows)
		}
		return a.Rows[0] - b.Rows[0]
	})
	return out, st, nil
}

// copyBlocks returns the sets of rows (indices into theta) linked within eps
// among rows, each set of more than maxBlock rows replaced by its own sets
// linked within eps/2, and so on, at most splits times.
func copyBlocks(theta [][]float64, rows []int, eps float64, minSize, maxBlock, splits int, s *Settings, st *CopyStats) ([][]int, error) {
	sub := make([][]float64, len(rows))
	for k, i := range rows {
		sub[k] = theta[i]
	}
	sets, err := LinkedSets(sub, eps, minSize, s)
	if err != nil {
		return nil, err
	}
	var out [][]int
	for _, set := range sets {
		for k, v := range set {
			set[k] = rows[v]
		}
		if len(set) > maxBlock && splits > 0 && eps > 0 {
			st.LeastEps = min(st.LeastEps, eps/2)
			parts, err := copyBlocks(theta, set, eps/2, minSize, maxBlock, splits-1, s, st)
			if err != nil {
				return nil, err
			}
			out = append(out, parts...)
			continue
		}
		out = append(out, set)
	}
	return out, nil
}

// scatter writes row i of m, times scale, into the dense buf.
func scatter(buf []float64, m *sparse.Matrix, i int, scale float64) {
	c, v := m.Row(i)
	for k, j := range c {
		buf[j] = v[k] * scale
	}
}

func unscatter(buf []float64, m *sparse.Matrix, i int) {
	c, _ := m.Row(i)
	for _, j := range c {
		buf[j] = 0
	}
}

// cosDist is 1 − the cosine similarity of the scattered row in buf (already
// scaled to unit length) and row j of m (scaled by scale), summed in the
// order of row j's columns and clamped to [0, 2].
func cosDist(buf []float64, m *sparse.Matrix, j int, scale float64) float64 {
	c, v := m.Row(j)
	var s float64
	for k, col := range c {
		s += buf[col] * v[k]
	}
	return min(2, max(0, 1-s*scale))
}

// forest is a union–find over 0..n-1 whose roots are the smallest members.
// The sets it ends with depend only on the unions made, not on their order.
type forest []int32

func newForest(n int) forest {
	f := make(forest, n)
	for i := range f {
		f[i] = int32(i)
	}
	return f
}

func (f forest) find(x int) int {
	for int(f[x]) != x {
		f[x] = f[f[x]]
		x = int(f[x])
	}
	return x
}

func (f forest) union(a, b int) {
	ra, rb := f.find(a), f.find(b)
	if ra != rb {
		f[max(ra, rb)] = int32(min(ra, rb))
	}
}

// merge adds the unions of g to f.
func (f forest) merge(g forest) {
	for i := range g {
		if r := g.find(i); r != i {
			f.union(i, r)
		}
	}
}

// sets returns the sets of at least minSize members, each ascending, in
// order of their smallest member.
func (f forest) sets(minSize int) [][]int {
	n := len(f)
	size := make([]int32, n)
	for i := 0; i < n; i++ {
		size[f.find(i)]++
	}
	at := make(map[int]int)
	var out [][]int
	for i := 0; i < n; i++ {
		r := f.find(i)
		if int(size[r]) < minSize {
			continue
		}
		k, ok := at[r]
		if !ok {
			k = len(out)
			at[r] = k
			out = append(out, make([]int, 0, size[r]))
		}
		out[k] = append(out[k], i)
	}
	return out
}
