// Package phrase scores two-word collocations and picks those that become single tokens
// ("traffic_stop").
//
// For a pair (a, b) of adjacent tokens, with N adjacent pairs in the corpus, the 2×2
// contingency table is
//
//	k11 = count(a b)      k12 = count(a ¬b)
//	k21 = count(¬a b)     k22 = count(¬a ¬b)
//
// and the score is Dunning's log-likelihood ratio (Dunning 1993, "Accurate methods for the
// statistics of surprise and coincidence", Computational Linguistics 19(1)), the G statistic
//
//	G² = 2 * sum_ij k_ij * ln(k_ij / E_ij),   E_ij = (row_i total) * (column_j total) / N
//
// with 0*ln(0) = 0. Under independence G² is asymptotically chi-squared with one degree of
// freedom, so 10.83 is the p = 0.001 critical value (common practice). Only pairs seen more
// often than expected (k11 > E11) are kept. NPMI (Bouma 2009, "Normalized (pointwise) mutual
// information in collocation extraction") is given too:
//
//	NPMI = ln(p(ab) / (p(a) p(b))) / -ln p(ab)
package phrase
