package cluster_test

import (
	"fmt"

	"undercurrent/cluster"
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
