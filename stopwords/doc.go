// Package stopwords holds the embedded stopword lists (English and incident boilerplate) and
// loads user lists.
//
// A list is plain UTF-8 text, one word a line; everything after a '#' on a line is a comment,
// blank lines are ignored and words are lowercased. The embedded lists are:
//
//	en          English function words, written from memory by the undercurrent authors
//	            (common practice; not copied from any published list)
//	boilerplate words that nearly every incident narrative carries without saying what
//	            happened ("advised", "stated", "responded"); common practice, written from memory
//
// Named("en+boilerplate") returns the union of both.
package stopwords
