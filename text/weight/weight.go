package weight

import (
	"fmt"
	"math"
	"sort"

	"undercurrent/text/sparse"
)

// TF names a term-frequency variant.
type TF string

// IDF names an inverse-document-frequency variant.
type IDF string

// Norm names a row normalisation.
type Norm string

const (
	TFRaw    TF = "raw"
	TFLog    TF = "log"
	TFBinary TF = "binary"

	IDFPlain  IDF = "plain"
	IDFSmooth IDF = "smooth"
	IDFNone   IDF = "none"

	NormL2   Norm = "l2"
	NormNone Norm = "none"
)

// Scheme is one TF-IDF variant. The zero value (empty strings) means raw tf, smoothed idf and
// l2 normalisation, scikit-learn's TfidfVectorizer defaults.
type Scheme struct {
	TF   TF   `json:"tf"`
	IDF  IDF  `json:"idf"`
	Norm Norm `json:"norm"`
}

func (s Scheme) resolved() Scheme {
	if s.TF == "" {
		s.TF = TFRaw
	}
	if s.IDF == "" {
		s.IDF = IDFSmooth
	}
	if s.Norm == "" {
		s.Norm = NormL2
	}
	return s
}

// Validate reports an unknown variant name.
func (s Scheme) Validate() error {
	r := s.resolved()
	switch r.TF {
	case TFRaw, TFLog, TFBinary:
	default:
		return fmt.Errorf("weight: unknown tf variant %q (use raw, log or binary)", s.TF)
	}
	switch r.IDF {
	case IDFPlain, IDFSmooth, IDFNone:
	default:
		return fmt.Errorf("weight: unknown idf variant %q (use plain, smooth or none)", s.IDF)
	}
	switch r.Norm {
	case NormL2, NormNone:
	default:
		return fmt.Errorf("weight: unknown norm %q (use l2 or none)", s.Norm)
	}
	return nil
}

// IDFWeights puts idf(t) for each document frequency into dst (allocated when nil; otherwise
// len(dst) must equal len(df)) and returns dst. n is the number of documents. A term with
// df = 0 gets plain idf ln(n/1)+1 (it is treated as occurring once; scikit-learn never sees
// such terms). It panics on an unknown variant.
func IDFWeights(dst []float64, df []int, n int, kind IDF) []float64 {
	if dst == nil {
		dst = make([]float64, len(df))
	}
	if len(dst) != len(df) {
		panic("weight: destination length does not match df length")
	}
	if kind == "" {
		kind = IDFSmooth
	}
	for i, d := range df {
		switch kind {
		case IDFPlain:
			if d == 0 {
				d = 1
			}
			dst[i] = math.Log(float64(n)/float64(d)) + 1
		case IDFSmooth:
			dst[i] = math.Log(float64(1+n)/float64(1+d)) + 1
		case IDFNone:
			dst[i] = 1
		default:
			panic(fmt.Sprintf("weight: unknown idf variant %q", kind))
		}
	}
	return dst
}

// TFIDF returns the weighted copy of counts (counts is not modified) and the idf vector
// used. It panics if the scheme names an unknown variant (check with Validate first).
func TFIDF(counts *sparse.Matrix, s Scheme) (*sparse.Matrix, []float64) {
	if err := s.Validate(); err != nil {
		panic(err.Error())
	}
	idf := IDFWeights(nil, counts.DocumentFrequency(), counts.Rows, s.resolved().IDF)
	return TFIDFWith(counts, s, idf), idf
}

// TFIDFWith weights counts with a given idf vector (for example the training corpus's, so
// that new narratives are weighted as the training ones were; see text.Frozen.IDF). It panics
// if len(idf) != counts.Cols or the scheme names an unknown variant.
func TFIDFWith(counts *sparse.Matrix, s Scheme, idf []float64) *sparse.Matrix {
	if err := s.Validate(); err != nil {
		panic(err.Error())
	}
	if len(idf) != counts.Cols {
		panic("weight: idf length does not match column count")
	}
	r := s.resolved()
	out := &sparse.Matrix{
		Rows:    counts.Rows,
		Cols:    counts.Cols,
		Indptr:  append([]int(nil), counts.Indptr...),
		Indices: append([]int32(nil), counts.Indices...),
		Data:    make([]float64, len(counts.Data)),
	}
	for i := 0; i < counts.Rows; i++ {
		a, b := counts.Indptr[i], counts.Indptr[i+1]
		var ss float64
		for k := a; k < b; k++ {
			c := counts.Data[k]
			var tf float64
			switch r.TF {
			case TFRaw:
				tf = c
			case TFLog:
				if c > 0 {
					tf = 1 + math.Log(c)
				}
			case TFBinary:
				if c != 0 {
					tf = 1
				}
			}
			w := tf * idf[counts.Indices[k]]
			out.Data[k] = w
			ss += w * w
		}
		if r.Norm == NormL2 && ss > 0 {
			inv := 1 / math.Sqrt(ss)
			for k := a; k < b; k++ {
				out.Data[k] *= inv
			}
		}
	}
	return out
}

// Pruning says which terms a vocabulary keeps. The zero value keeps every term.
type Pruning struct {
	// MinDocs drops terms found in fewer documents. Zero or one keeps all.
	MinDocs int `json:"min_docs"`
	// MaxDocShare drops terms found in more than this share of the documents
	// (df > MaxDocShare*n). Zero means 1 (keep all).
	MaxDocShare float64 `json:"max_doc_share"`
	// MaxTerms keeps at most this many terms, those with the highest document frequency, ties
	// broken by higher total count, then by ascending term (byte order). Zero: no limit.
	MaxTerms int `json:"max_terms"`
}

// Prune returns the indices of the terms kept, in ascending term (byte) order. df, total and
// terms are parallel (document frequency, total count and text of each term); n is the number
// of documents. It panics if the slices differ in length.
func Prune(terms []string, df []int, total []float64, n int, p Pruning) []int {
	if len(df) != len(terms) || len(total) != len(terms) {
		panic("weight: terms, df and total differ in length")
	}
	share := p.MaxDocShare
	if share <= 0 {
		share = 1
	}
	var keep []int
	for i := range terms {
		if df[i] < p.MinDocs || float64(df[i]) > share*float64(n) || df[i] == 0 {
			continue
		}
		keep = append(keep, i)
	}
	if p.MaxTerms > 0 && len(keep) > p.MaxTerms {
		sort.Slice(keep, func(a, b int) bool {
			i, j := keep[a], keep[b]
			if df[i] != df[j] {
				return df[i] > df[j]
			}
			if total[i] != total[j] {
				return total[i] > total[j]
			}
			return terms[i] < terms[j]
		})
		keep = keep[:p.MaxTerms]
	}
	sort.Slice(keep, func(a, b int) bool { return terms[keep[a]] < terms[keep[b]] })
	return keep
}
