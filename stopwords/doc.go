// Package stopwords holds the embedded stopword lists (English and incident boilerplate) and
// loads user lists.
package stopwords
