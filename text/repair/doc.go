// Package repair finds OCR and typing noise in a corpus's rare words and maps each to a
// frequent word, only when the match is unambiguous, keeping an audit of every correction.
//
// The distance is the optimal-string-alignment form of the Damerau–Levenshtein distance
// (Damerau 1964; insertions, deletions, substitutions and adjacent transpositions, each
// substring edited at most once), with costs of our own choosing for OCR confusions:
//
//	insert, delete, substitute, transpose adjacent     1
//	substitute a confusable pair (0/o, 1/l, 1/i, l/i, 5/s, e/c)   0.5
//	replace "rn" by "m", "cl" by "d", "vv" by "w" or back     0.5
//
// The confusion pairs are common practice for OCR of typed forms (written from memory).
// Candidates are found with a deletion index over OCR-canonical forms (see keys), then
// checked with the distance above.
package repair
