package cluster_test

import (
	"fmt"

	"undercurrent/cluster"
	"undercurrent/text/sparse"
)

// Average linkage (UPGMA) on the five-element example of Wikipedia's
// "UPGMA" article: elements a–e, condensed distances ab, ac, ad, ae, bc,
// bd, be, cd, ce, de.
func ExampleLink() {
	d := []float64{17, 21, 31, 23, 30, 34, 21, 28, 39, 43}
	t, err := cluster.Link(d, cluster.Average, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, m := range t.Merges {
		fmt.Printf("cluster %d = %d + %d at %g (%d leaves)\n", t.N+i, m.A, m.B, m.Height, m.Size)
	}
	fmt.Println("two clusters:", t.CutCount(nil, 2))
	// Output:
	// cluster 5 = 0 + 1 at 17 (2 leaves)
	// cluster 6 = 4 + 5 at 22 (3 leaves)
	// cluster 7 = 2 + 3 at 28 (2 leaves)
	// cluster 8 = 6 + 7 at 33 (5 leaves)
	// two clusters: [0 0 1 1 0]
}

// Ward's method on rows of numbers, without a distance matrix; heights
// follow scipy's convention (sqrt of twice the increase in the sum of
// squares).
func ExampleLinkVectors() {
	x := [][]float64{{0}, {1}, {3}, {7}, {15}}
	t, err := cluster.LinkVectors(x, nil, cluster.Ward, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, m := range t.Merges {
		fmt.Printf("%d + %d at %.6f\n", m.A, m.B, m.Height)
	}
	// Output:
	// 0 + 1 at 1.000000
	// 2 + 5 at 2.886751
	// 3 + 6 at 6.940221
	// 4 + 7 at 15.495161
}

// Themes whose word distributions are close are suggested for merging.
// The rows are invented word distributions over five words.
func ExampleNewThemeTree() {
	phi := [][]float64{
		{0.50, 0.30, 0.10, 0.05, 0.05}, // theme 0
		{0.48, 0.32, 0.10, 0.05, 0.05}, // theme 1: nearly theme 0
		{0.05, 0.05, 0.10, 0.30, 0.50}, // theme 2
		{0.20, 0.20, 0.20, 0.20, 0.20}, // theme 3
	}
	tt, err := cluster.NewThemeTree(phi, cluster.JensenShannon, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range tt.Suggestions(0.05) {
		fmt.Printf("themes %v (Jensen–Shannon distance %.3f)\n", s.Themes, s.Height)
	}
	// Output:
	// themes [0 1] (Jensen–Shannon distance 0.016)
}

// Near-identical rows (for example the theme mixtures of templated
// narratives) come back as tight groups.
func ExampleTightGroups() {
	x := [][]float64{
		{0.70, 0.20, 0.10},
		{0.10, 0.10, 0.80},
		{0.70, 0.21, 0.09},
		{0.40, 0.30, 0.30},
		{0.71, 0.20, 0.09},
	}
	groups, err := cluster.TightGroups(x, 0.02, 2, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, g := range groups {
		fmt.Printf("rows %v, diameter %.4f\n", g.Rows, g.Diameter)
	}
	// Output:
	// rows [0 2 4], diameter 0.0141
}

// Narratives that repeat one text: their word rows (here four terms) are compared only
// when their theme shares are close, and a group needs every two of its rows to share a
// cosine similarity of at least 0.7. Row 3 has the same words as row 0 but other theme
// shares (1.13 away), so it is never compared: the blocking's approximation. By hand:
// cos(row 0, row 2) = 3 / (√3 · √3.25) = 0.961, cos(row 1, row 2) = 2.9 / (√2.81 · √3.25)
// = 0.960, cos(row 0, row 1) = 2.9 / (√3 · √2.81) = 0.999; row 0 is closest to the others.
func ExampleCopyGroups() {
	b := sparse.NewBuilder(4)
	b.AddRow([]int32{0, 1, 2}, []float64{1, 1, 1})         // the template
	b.AddRow([]int32{0, 1, 2}, []float64{1, 1, 0.9})       // a copy, one detail changed
	b.AddRow([]int32{0, 1, 2, 3}, []float64{1, 1, 1, 0.5}) // a copy with a detail added
	b.AddRow([]int32{0, 1, 2}, []float64{1, 1, 1})         // the same words, another theme
	b.AddRow([]int32{3}, []float64{1})                     // something else
	theta := [][]float64{{0.9, 0.1}, {0.9, 0.1}, {0.88, 0.12}, {0.1, 0.9}, {0.9, 0.1}}
	groups, _, err := cluster.CopyGroups(theta, b.Matrix(), &cluster.CopySettings{Similarity: 0.7})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, g := range groups {
		fmt.Printf("rows %v, every two at least %.3f alike, representative row %d\n", g.Rows, g.LeastSimilarity, g.Medoid)
	}
	// Output:
	// rows [0 1 2], every two at least 0.960 alike, representative row 0
}
