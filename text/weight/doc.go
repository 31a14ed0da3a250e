// Package weight turns document-term counts into TF-IDF weights and prunes vocabularies.
//
// For a corpus of n documents, a term t with document frequency df(t) (the number of
// documents holding it) and a count c(t,d) in document d, the weight is
//
//	w(t,d) = tf(c(t,d)) * idf(t)
//
// followed by an optional row normalisation. The variants are named:
//
//	tf:   raw     tf = c
//	      log     tf = 1 + ln(c)           (c > 0; scikit-learn's sublinear_tf)
//	      binary  tf = 1                   (c > 0)
//	idf:  plain   idf = ln(n / df) + 1
//	      smooth  idf = ln((1 + n) / (1 + df)) + 1
//	      none    idf = 1
//	norm: l2      each row divided by its Euclidean length sqrt(sum_t w(t,d)^2) (empty rows stay empty)
//	      none    no normalisation
//
// The idf formulas follow scikit-learn's TfidfTransformer convention (the "+1" keeps terms that
// occur in every document from being ignored); see the scikit-learn user guide, section
// "Tf–idf term weighting". The textbook idf ln(n/df) of Salton and Buckley (1988) is plain
// minus one.
package weight
