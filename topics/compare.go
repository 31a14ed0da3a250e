package topics

import (
	"maps"
	"math"
	"slices"
)

// Assign solves the square assignment problem: it returns perm with perm[i] = the column
// assigned to row i so that Σ_i cost[i][perm[i]] is least (Kuhn 1955, Munkres 1957; the
// O(n³) shortest-augmenting-path form with potentials, as in Jonker & Volgenant 1987).
// Ties are resolved by the lower column index, so the result is deterministic. It panics if
// cost is not square.
func Assign(cost [][]float64) []int {
	n := len(cost)
	for _, r := range cost {
		if len(r) != n {
			panic("topics: assignment cost matrix is not square")
		}
	}
	inf := math.Inf(1)
	u := make([]float64, n+1)
	v := make([]float64, n+1)
	p := make([]int, n+1) // p[j] = row matched to column j (1-based), 0 = none
	way := make([]int, n+1)
	minv := make([]float64, n+1)
	used := make([]bool, n+1)
	for i := 1; i <= n; i++ {
		p[0] = i
		j0 := 0
		for j := range minv {
			minv[j] = inf
			used[j] = false
		}
		for {
			used[j0] = true
			i0 := p[j0]
			delta, j1 := inf, 0
			for j := 1; j <= n; j++ {
				if used[j] {
					continue
				}
				cur := cost[i0-1][j-1] - u[i0] - v[j]
				if cur < minv[j] {
					minv[j] = cur
					way[j] = j0
				}
				if minv[j] < delta {
					delta = minv[j]
					j1 = j
				}
			}
			for j := 0; j <= n; j++ {
				if used[j] {
					u[p[j]] += delta
					v[j] -= delta
				} else {
					minv[j] -= delta
				}
			}
			j0 = j1
			if p[j0] == 0 {
				break
			}
		}
		for j0 != 0 {
			j1 := way[j0]
			p[j0] = p[j1]
			j0 = j1
		}
	}
	perm := make([]int, n)
	for j := 1; j <= n; j++ {
		if p[j] > 0 {
			perm[p[j]-1] = j - 1
		}
	}
	return perm
}

// Jaccard returns |a ∩ b| / |a ∪ b| of two sets of ids (1 when both are empty).
func Jaccard(a, b []int) float64 {
	set := make(map[int]bool, len(a))
	for _, x := range a {
		set[x] = true
	}
	inter := 0
	seen := make(map[int]bool, len(b))
	for _, x := range b {
		if seen[x] {
			continue
		}
		seen[x] = true
		if set[x] {
			inter++
		}
	}
	union := len(set) + len(seen) - inter
	if union == 0 {
		return 1
	}
	return float64(inter) / float64(union)
}

// MatchedJaccard returns the agreement of two theme sets given by their top-word ids: themes
// are paired one-to-one to maximise the total Jaccard similarity of their top words
// (Hungarian matching) and the mean over pairs is returned (Greene, O'Callaghan & Cunningham
// 2014, "How many topics? Stability analysis for topic models", with plain Jaccard in place
// of their average Jaccard over ranks). Both sets must have the same number of themes.
func MatchedJaccard(a, b [][]int) float64 {
	if len(a) != len(b) {
		panic("topics: theme sets differ in size")
	}
	if len(a) == 0 {
		return math.NaN()
	}
	cost := make([][]float64, len(a))
	sim := make([][]float64, len(a))
	for i := range a {
		cost[i] = make([]float64, len(b))
		sim[i] = make([]float64, len(b))
		for j := range b {
			sim[i][j] = Jaccard(a[i], b[j])
			cost[i][j] = -sim[i][j]
		}
	}
	perm := Assign(cost)
	s := 0.0
	for i, j := range perm {
		s += sim[i][j]
	}
	return s / float64(len(a))
}

// Hellinger returns the Hellinger distance between discrete distributions p and q:
//
//	H(p, q) = sqrt(1 − Σ_i sqrt(p_i q_i))
//
// (equivalently (1/√2)‖√p − √q‖₂ for normalised p, q), in [0, 1].
func Hellinger(p, q []float64) float64 {
	if len(p) != len(q) {
		panic("topics: distribution lengths do not match")
	}
	bc := 0.0
	for i := range p {
		bc += math.Sqrt(p[i] * q[i])
	}
	return math.Sqrt(max(0, 1-bc))
}

// MatchHellinger pairs each reference distribution (rows of ref) with one row of got so that
// the total Hellinger distance is least, and returns the pairing (match[i] = row of got) and
// the distance of each pair. Both must have the same number of rows.
func MatchHellinger(ref, got [][]float64) (match []int, dist []float64) {
	if len(ref) != len(got) {
		panic("topics: numbers of distributions do not match")
	}
	cost := make([][]float64, len(ref))
	for i := range ref {
		cost[i] = make([]float64, len(got))
		for j := range got {
			cost[i][j] = Hellinger(ref[i], got[j])
		}
	}
	match = Assign(cost)
	dist = make([]float64, len(ref))
	for i, j := range match {
		dist[i] = cost[i][j]
	}
	return match, dist
}

// NMI returns the normalised mutual information of two labelings of the same items,
//
//	NMI = I(a; b) / ((H(a) + H(b)) / 2)
//
// with natural logarithms: the arithmetic-mean normalisation that is scikit-learn's default
// for normalized_mutual_info_score (Vinh, Epps & Bailey 2010 list the variants). It is 1
// when both labelings are constant. Items with a negative label in either are skipped.
func NMI(a, b []int) float64 {
	if len(a) != len(b) {
		panic("topics: label slices differ in length")
	}
	type pair struct{ x, y int }
	joint := map[pair]float64{}
	ca := map[int]float64{}
	cb := map[int]float64{}
	n := 0.0
	for i := range a {
		if a[i] < 0 || b[i] < 0 {
			continue
		}
		joint[pair{a[i], b[i]}]++
		ca[a[i]]++
		cb[b[i]]++
		n++
	}
	if n == 0 {
		return math.NaN()
	}
	ent := func(c map[int]float64) float64 {
		h := 0.0
		for _, k := range slices.Sorted(maps.Keys(c)) {
			p := c[k] / n
			h -= p * math.Log(p)
		}
		return h
	}
	ha, hb := ent(ca), ent(cb)
	keys := make([]pair, 0, len(joint))
	for k := range joint {
		keys = append(keys, k)
	}
	slices.SortFunc(keys, func(p, q pair) int {
		if p.x != q.x {
			return p.x - q.x
		}
		return p.y - q.y
	})
	mi := 0.0
	for _, k := range keys {
		nij := joint[k]
		mi += nij / n * math.Log(n*nij/(ca[k.x]*cb[k.y]))
	}
	if ha == 0 && hb == 0 {
		return 1
	}
	return max(0, mi) / ((ha + hb) / 2)
}
