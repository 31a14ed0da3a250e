package main

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"

	"undercurrent/report"
	"undercurrent/report/trend"
	"undercurrent/text"
)

// The boilerplate-sentence step's place in the report and the exports. A sentence is shown by
// its key (text.SentenceReport.Keys): the words of the redacted text the pipeline read, lower
// case, with numbers, times and dates written by kind; never the raw text.

// sentenceTop is the number of sentences the data-quality appendix lists (the export lists
// them all).
const sentenceTop = 15

// sentenceQuality adds the step's note and tables to the data-quality appendix. Counts below
// the threshold are withheld, and the histogram's buckets (which add up to the narratives
// read, a published total) are suppressed together with a complementary bucket
// (trend.Suppress), so that a withheld one cannot be recovered by subtraction.
func sentenceQuality(dq *report.DataQuality, p *prepared, pub trend.Publish) {
	r := p.corpus.Sentences
	if r == nil {
		dq.Notes = append(dq.Notes, "Sentences repeated word for word across many narratives (boilerplate) were kept in the counts; -set-aside-repeated-sentences leaves them out of fitting and lists them.")
		return
	}
	dq.Notes = append(dq.Notes, fmt.Sprintf("Sentences found word for word in at least %d narratives (boilerplate: disclaimers, sign-offs, procedure), and sentences repeated within one narrative, were left out of fitting the themes; they stay in the text and in every example shown. %d distinct sentences were judged boilerplate; %d sentence occurrences (%d of them repeats within a narrative) and %d words were set aside; each boilerplate sentence is listed in boilerplate-sentences.csv. Boilerplate is judged by repetition alone: a sentence many writers legitimately repeat is set aside too, so review the list.",
		r.Threshold, len(r.Keys), r.Sentences, r.Repeats, r.Tokens))
	if len(r.Keys) > 0 {
		t := report.Table{Title: "Boilerplate sentences (most frequent; numbers, times and dates shown by kind)", Columns: []string{"sentence", "narratives", "words"}}
		for i, k := range r.Keys {
			if i == sentenceTop {
				break
			}
			t.Rows = append(t.Rows, []string{k.Key, publishCount(k.Narratives, pub), strconv.Itoa(k.Tokens)})
		}
		dq.Tables = append(dq.Tables, t)
	}
	labels, counts := sentenceHistogram(r)
	hidden := trend.Suppress(nil, counts, [][]int{seq(len(counts))}, float64(thresholdOf(pub)))
	h := report.Table{Title: "Narratives by sentences set aside", Columns: []string{"sentences set aside", "narratives"}}
	for i, l := range labels {
		v := strconv.Itoa(int(counts[i]))
		if hidden[i] && !pub.Everything {
			v = trend.Hidden
			if int(counts[i]) < thresholdOf(pub) {
				v = pub.Withheld()
			}
		}
		h.Rows = append(h.Rows, []string{l, v})
	}
	dq.Tables = append(dq.Tables, h)
}

// sentenceHistogram folds SentenceReport.Narratives into the buckets 0, 1, 2 and 3 or more.
func sentenceHistogram(r *text.SentenceReport) ([]string, []float64) {
	labels := []string{"0", "1", "2", "3 or more"}
	counts := make([]float64, len(labels))
	for n, c := range r.Narratives {
		counts[min(n, len(labels)-1)] += float64(c)
	}
	return labels, counts
}

func seq(n int) []int {
	out := make([]int, n)
	for i := range out {
		out[i] = i
	}
	return out
}

// writeSentenceCSV writes boilerplate-sentences.csv: one row per boilerplate sentence, most
// narratives first: sentence (its key), narratives (holding it; withheld below the threshold),
// words (its length in tokens). With the step off it holds the header only.
func writeSentenceCSV(w io.Writer, r *text.SentenceReport, pub trend.Publish) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"sentence", "narratives", "words"})
	if r != nil {
		for _, k := range r.Keys {
			cw.Write([]string{k.Key, publishCount(k.Narratives, pub), strconv.Itoa(k.Tokens)})
		}
	}
	cw.Flush()
	return cw.Error()
}

// sentenceSetting describes the step's settings for the methods section.
func sentenceSetting(s text.Settings) string {
	ss := s.Sentences.Resolved()
	if !ss.Enabled {
		return "no"
	}
	out := fmt.Sprintf("found in at least %d narratives and %s of them, at least %d words", ss.MinNarratives, fmtFloat(ss.MinShare), ss.MinTokens)
	if ss.Repeats {
		out += "; repeats within a narrative too"
	}
	return out
}
