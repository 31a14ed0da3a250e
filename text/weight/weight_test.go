package weight

import (
	"math"
	"reflect"
	"testing"

	"undercurrent/text/sparse"
)

const tol = 1e-8

func matrix(rows [][]float64) *sparse.Matrix {
	b := sparse.NewBuilder(len(rows[0]))
	for _, r := range rows {
		var cols []int32
		var vals []float64
		for j, v := range r {
			if v != 0 {
				cols = append(cols, int32(j))
				vals = append(vals, v)
			}
		}
		b.AddRow(cols, vals)
	}
	return b.Matrix()
}

// The worked example of the scikit-learn user guide, section 6.2.3.4 "Tf–idf term weighting"
// (TfidfTransformer(smooth_idf=False) on these counts): row 1 (0-based 0) is
// [0.81940995, 0, 0.57320793] and row 5 (0-based 4) is [0.47330339, 0.88089948, 0]. The other
// rows are from the same page's printed array.
func TestSklearnUserGuide(t *testing.T) {
	counts := matrix([][]float64{{3, 0, 1}, {2, 0, 0}, {3, 0, 0}, {4, 0, 0}, {3, 2, 0}, {3, 0, 2}})
	w, idf := TFIDF(counts, Scheme{TF: TFRaw, IDF: IDFPlain, Norm: NormL2})
	want := [][]float64{
		{0.81940995, 0, 0.57320793},
		{1, 0, 0},
		{1, 0, 0},
		{1, 0, 0},
		{0.47330339, 0.88089948, 0},
		{0.58149261, 0, 0.81355169},
	}
	got := w.Dense()
	for i := range want {
		for j := range want[i] {
			if math.Abs(got[i][j]-want[i][j]) > tol {
				t.Errorf("w[%d][%d] = %.8f, want %.8f", i, j, got[i][j], want[i][j])
			}
		}
	}
	// idf = ln(6/6)+1, ln(6/1)+1, ln(6/2)+1 (the user guide's hand computation).
	wantIDF := []float64{1, math.Log(6) + 1, math.Log(3) + 1}
	for j := range wantIDF {
		if math.Abs(idf[j]-wantIDF[j]) > 1e-12 {
			t.Errorf("idf[%d] = %v, want %v", j, idf[j], wantIDF[j])
		}
	}
	// counts is not modified
	if counts.At(0, 0) != 3 {
		t.Error("counts modified")
	}
}

// Variants computed by hand from the doc-comment formulas on the 2-document corpus
// [[2,1],[0,1]] (n=2, df=[1,2]).
func TestVariants(t *testing.T) {
	counts := matrix([][]float64{{2, 1}, {0, 1}})
	tests := []struct {
		s    Scheme
		row0 []float64
	}{
		{Scheme{TFRaw, IDFNone, NormNone}, []float64{2, 1}},
		{Scheme{TFBinary, IDFNone, NormNone}, []float64{1, 1}},
		{Scheme{TFLog, IDFNone, NormNone}, []float64{1 + math.Log(2), 1}},
		{Scheme{TFRaw, IDFPlain, NormNone}, []float64{2 * (math.Log(2) + 1), 1}},
		{Scheme{TFRaw, IDFSmooth, NormNone}, []float64{2 * (math.Log(1.5) + 1), 1}},
	}
	for _, tt := range tests {
		got := tt.s
		w, _ := TFIDF(counts, got)
		for j, v := range tt.row0 {
			if math.Abs(w.At(0, j)-v) > 1e-12 {
				t.Errorf("%+v: w[0][%d] = %v, want %v", tt.s, j, w.At(0, j), v)
			}
		}
	}
	if err := (Scheme{TF: "square"}).Validate(); err == nil {
		t.Error("unknown tf accepted")
	}
}

func TestPrune(t *testing.T) {
	terms := []string{"b", "a", "c", "d", "e"}
	df := []int{3, 3, 1, 10, 3}
	total := []float64{5, 5, 1, 10, 6}
	tests := []struct {
		p    Pruning
		want []int
	}{
		{Pruning{}, []int{1, 0, 2, 3, 4}},
		{Pruning{MinDocs: 2}, []int{1, 0, 3, 4}},
		{Pruning{MaxDocShare: 0.5}, []int{1, 0, 2, 4}},
		// MaxTerms 2 after share: df 3,3,3 tie; total 6 wins (e), then a < b.
		{Pruning{MaxDocShare: 0.5, MaxTerms: 2}, []int{1, 4}},
	}
	for _, tt := range tests {
		if got := Prune(terms, df, total, 10, tt.p); !reflect.DeepEqual(got, tt.want) {
			t.Errorf("%+v: got %v, want %v", tt.p, got, tt.want)
		}
	}
}

// TFIDFWith with the idf TFIDF computed gives the same weights.
func TestTFIDFWith(t *testing.T) {
	counts := matrix([][]float64{{3, 0, 1}, {2, 0, 0}, {3, 2, 0}})
	s := Scheme{TF: TFLog, IDF: IDFSmooth, Norm: NormL2}
	w, idf := TFIDF(counts, s)
	if got := TFIDFWith(counts, s, idf); !reflect.DeepEqual(got, w) {
		t.Errorf("TFIDFWith %v, TFIDF %v", got.Dense(), w.Dense())
	}
	defer func() {
		if recover() == nil {
			t.Error("short idf did not panic")
		}
	}()
	TFIDFWith(counts, s, idf[:2])
}
