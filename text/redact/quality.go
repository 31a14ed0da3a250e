package redact

import (
	"fmt"
	"sort"
	"strconv"
)

// Score is the quality of one type's redactions against ground truth.
type Score struct {
	Type  Type
	Truth int // ground-truth spans of the type
	Found int // redactions of the type
	// Recalled counts truth spans whose letters and digits are all covered by redactions of
	// the same type; Covered counts those covered by redactions of any type (what matters
	// for privacy: a date of birth replaced as [AGE] is still hidden).
	Recalled, Covered int
	// Correct counts redactions of the type that overlap a truth span of the same type;
	// False counts those that overlap no truth span of any type.
	Correct, False int
}

// Precision is Correct/Found, or 1 when nothing was found.
func (s Score) Precision() float64 {
	if s.Found == 0 {
		return 1
	}
	return float64(s.Correct) / float64(s.Found)
}

// Recall is Recalled/Truth, or 1 when there is no truth span.
func (s Score) Recall() float64 {
	if s.Truth == 0 {
		return 1
	}
	return float64(s.Recalled) / float64(s.Truth)
}

// Evaluate scores found against truth for one narrative text, type by type, in type order.
// Spans are byte ranges of text; Placeholder and Text are ignored. Scores of several
// narratives add field by field (see Score.Add).
func Evaluate(text string, truth, found []Span) []Score {
	byType := make([]Score, numTypes)
	for t := range byType {
		byType[t].Type = Type(t)
	}
	covered := func(s Span, same bool) bool {
		for i := s.Start; i < s.End; i++ {
			if !isAlnumByte(text[i]) && text[i] < 0x80 {
				continue
			}
			ok := false
			for _, f := range found {
				if f.Start <= i && i < f.End && (!same || f.Type == s.Type) {
					ok = true
					break
				}
			}
			if !ok {
				return false
			}
		}
		return true
	}
	for _, s := range truth {
		sc := &byType[s.Type]
		sc.Truth++
		if covered(s, true) {
			sc.Recalled++
		}
		if covered(s, false) {
			sc.Covered++
		}
	}
	for _, f := range found {
		sc := &byType[f.Type]
		sc.Found++
		same, any := false, false
		for _, s := range truth {
			if f.Start < s.End && s.Start < f.End {
				any = true
				if s.Type == f.Type {
					same = true
				}
			}
		}
		if same {
			sc.Correct++
		}
		if !any {
			sc.False++
		}
	}
	out := byType[1:]
	sort.SliceStable(out, func(i, j int) bool { return out[i].Type < out[j].Type })
	return out
}

// Add adds o's counts to s. Both must be of the same type.
func (s *Score) Add(o Score) {
	if s.Type != o.Type {
		panic("redact: adding scores of different types")
	}
	s.Truth += o.Truth
	s.Found += o.Found
	s.Recalled += o.Recalled
	s.Covered += o.Covered
	s.Correct += o.Correct
	s.False += o.False
}

func isAlnumByte(b byte) bool {
	return b >= '0' && b <= '9' || b >= 'a' && b <= 'z' || b >= 'A' && b <= 'Z'
}

// BenchLine formats s as one line of the project's benchmark JSON:
//
//	{"bench":"redact","system":"undercurrent","corpus":...,"type":...,"truth":...,"found":...,
//	 "precision":...,"recall":...,"covered":...,"false_per_1k_tokens":...}
//
// label names the type (s.Type.String() when empty); tokens is the number of
// whitespace-separated tokens of the narratives scored, for the false-redaction rate.
// Covered is the share of truth spans hidden by a redaction of any type.
func BenchLine(corpus, label string, s Score, tokens int) string {
	if label == "" {
		label = s.Type.String()
	}
	covered, per := 0.0, 0.0
	if s.Truth > 0 {
		covered = float64(s.Covered) / float64(s.Truth)
	}
	if tokens > 0 {
		per = 1000 * float64(s.False) / float64(tokens)
	}
	return fmt.Sprintf(`{"bench":"redact","system":"undercurrent","corpus":%s,"type":%s,"truth":%d,"found":%d,"precision":%.4f,"recall":%.4f,"covered":%.4f,"false_per_1k_tokens":%.3f}`,
		strconv.Quote(corpus), strconv.Quote(label), s.Truth, s.Found, s.Precision(), s.Recall(), covered, per)
}
