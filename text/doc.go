// Package text turns raw incident narratives into the tokens and weighted document-term
// matrices the theme models read, keeping every token traceable to its byte offsets in the
// original narrative.
package text
