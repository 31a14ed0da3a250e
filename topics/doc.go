// Package topics fits, describes, saves and applies LDA theme models over narrative
// document-term counts.
package topics
