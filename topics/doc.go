// Package topics fits, describes, saves and applies LDA theme models over narrative
// document-term counts.
//
// Fit samples LDA (Blei, Ng & Jordan 2003) by collapsed Gibbs sampling (Griffiths & Steyvers
// 2004) — with the SparseLDA bucket sampler (Yao, Mimno & McCallum 2009) from K = 50 up, the
// plain sampler below, as measured faster on each side — re-estimating an
// asymmetric α and a symmetric β by Minka's fixed-point iteration (Wallach, Mimno & McCallum
// 2009), over fixed document blocks swept in parallel and merged after every sweep (AD-LDA,
// Newman et al. 2009). The same corpus, Settings and seed give a byte-identical model file
// whatever GOMAXPROCS is.
//
// Guided themes come from a seed file (ReadSeedThemes) through seeded word priors.
// Describing a theme: Model.TopWords (probability or Sievert & Shirley relevance),
// Model.Representative, Model.Sizes. Coherence (CoherenceIndex: UMass, NPMI) agrees with
// gensim. Sweep compares numbers of themes. Model.Save and Load read and write the frozen,
// checksummed model file; Tagger folds new narratives in, deterministically per narrative,
// one at a time or as an ordered parallel stream.
//
// Themes summarise what narrative writers wrote; they are not findings of fact. Small
// themes and representative narratives can identify people: check public-records law,
// data-sharing terms and ethics review before publishing them.
package topics
