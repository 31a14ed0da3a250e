// Package routine finds near-duplicate narratives with MinHash signatures over word shingles.
//
// A narrative's shingles are its runs of k consecutive tokens (k = 3 by default; a narrative
// shorter than k is one shingle). The signature is a one-permutation MinHash (Li, Owen and
// Zhang 2012, "One permutation hashing", NIPS): each shingle is hashed once with a seeded
// hash, the hash's top bits choose one of h bins and each bin keeps its least hash (an empty
// bin holds the all-ones value). The share of equal entries among the bins that are not empty
// in both signatures estimates the Jaccard similarity of the shingle sets (Broder 1997, "On
// the resemblance and containment of documents"; Li et al.'s estimator without
// densification). Candidate pairs come from banding (b bands of
// h/b rows: two narratives are candidates when any band matches exactly; Leskovec, Rajaraman
// and Ullman, "Mining of Massive Datasets", ch. 3) and are kept when the estimate reaches the
// threshold. Groups are the connected components of kept pairs.
package routine
