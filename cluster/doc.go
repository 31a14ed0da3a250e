// Package cluster builds hierarchical, agglomerative clusterings of themes
// and incidents and reads them: merge lists, cuts, cophenetic distances and
// leaf orders for display.
//
// # Methods and algorithms
//
// Seven linkages (the Linkage constants) follow Müllner (2011), "Modern
// hierarchical, agglomerative clustering algorithms", arXiv:1109.2378:
//
//   - Single: the minimum-spanning-tree algorithm (Prim-like), O(n²) time,
//     O(n) memory beyond the input.
//   - Complete, Average (UPGMA), Weighted (WPGMA) and Ward: the
//     nearest-neighbour chain, valid because these methods are reducible.
//   - Centroid and Median: the generic algorithm with a heap of
//     nearest-neighbour candidates (these methods can invert: a merge can be
//     lower than an earlier one).
//
// Link takes a condensed distance matrix in scipy's layout (d(i,j), i<j, at
// n*i - i*(i+1)/2 + j - i - 1; never modified). LinkVectors takes rows of
// numbers under the Euclidean distance; for Single, Ward, Centroid and
// Median it needs only O(n·d) memory (no n² matrix), computing distances
// (for Ward, Centroid and Median from centroids and sizes) on the fly, and
// for Ward and Centroid it accepts weights: a row of weight w
// behaves exactly as w coincident rows (Lance–Williams with sizes equal to
// the weights), which is what the micro-cluster route (Summarize) builds on.
//
// # Output convention and ties
//
// A Dendrogram is scipy's Z matrix: merge i joins clusters A < B into
// cluster n+i, at Height, with Size leaves. Heights are full distances (the
// UPGMA/WPGMA articles' half-height "branch lengths" are Height/2); Ward
// heights are sqrt(2·ΔSSE) as in scipy.
//
// Ties are broken deterministically, step by step as scipy 1.10 does: scans
// run in increasing index with strict comparisons, so the lowest index
// wins; the NN chain starts at the lowest active index and keeps the
// previous chain element on a tie; the merged cluster takes the slot of the
// larger index; the merge lists of the MST and NN-chain algorithms are
// stably sorted by height and relabelled; the generic algorithm's heap
// resolves equal keys as a plain binary heap does. On a condensed matrix
// the result therefore equals scipy's Z exactly, ties included (tested on
// integer-valued distances). LinkVectors applies the same rules to
// distances computed from centroids, which differ from scipy's
// Lance–Williams values in the last bits; merges whose heights agree to
// about 1e-15 may then be taken in another order, and with exact ties the
// tree can differ where scipy's choice itself hinges on rounding. What the
// tests check on vectors: identical pairs and sizes, heights to 1e-9,
// including a grid whose heights differ only by a 1e-9 jitter, and the
// same partition at every level.
//
// # Reading a tree
//
// Dendrogram.Cophenetic and CopheneticCorrelation (as scipy's cophenet),
// CutCount (at most k clusters, scipy's maxclust) and CutHeight (scipy's
// distance criterion) give flat clusters; labels are 0, 1, ... by each
// cluster's smallest leaf. Leaves gives the plain dendrogram order;
// OptimalLeafOrder the order that minimises the sum of adjacent distances
// (Bar-Joseph, Gifford & Jaakkola 2001); DisplayOrder picks the optimal one
// up to OptimalOrderLimit leaves.
//
// # Pipeline helpers
//
// JensenShannon and Hellinger compare word distributions; NewThemeTree
// clusters themes with them (average linkage) and suggests merges.
// TightGroups finds groups of near-identical rows (templated narratives)
// exactly as complete linkage cut at a small height, without an n² matrix;
// LinkedSets gives the sets of rows chained within a distance (single
// linkage cut there). CopyGroups finds templated narratives by their words
// (complete linkage on cosine distances of sparse rows), blocked by their
// theme vectors; its documentation says what is exact and what is not.
// HeatmapOrder orders rows for a heatmap. Summarize handles 100k+ rows:
// seeded k-means++ micro-clusters, then exact weighted Ward on their
// centroids (see Summary for what is exact and what is approximate).
//
// # Determinism, cores and speed
//
// Distance scans are split over Settings.Workers goroutines and reduced in
// a fixed order with an associative tie rule; k-means sums run over fixed
// chunks. Results are byte-identical for any GOMAXPROCS. Ward's scan on
// vectors first sums 8, 12 or 16 coordinates of 256 candidates at a time
// and drops those already farther than the best one (AVX2 assembly on
// amd64, computing the same bits as the portable code, which -tags purego
// selects). The matrix methods on vectors keep a full n×n matrix up to
// n = 16384, so that the NN chain reads rows, and the condensed matrix
// above. On the condensed matrix the chain keeps, for every cluster, the
// exact minimum of its column (the entries d(i, j), i < j, one per row)
// and re-reads a column only when the merge of its minimum's row made it
// stale, so a scan mostly reads one contiguous row; the merges are the
// same as a full scan's. Transparent huge pages are not requested: on the
// machine measured, faulting in a 1.6 GB matrix with them cost more CPU
// than they saved on the strided reads left (average linkage at n = 20000:
// 14.4 against 11.4 CPU-s, three runs each).
//
// # Caution
//
// A cluster of narratives groups what their writers wrote, in the words
// they chose; it is not a finding of fact about what happened. Small
// clusters can identify people: check counts against the release rules of
// your data-sharing terms, public-records law and ethics review before
// publishing them.
package cluster
