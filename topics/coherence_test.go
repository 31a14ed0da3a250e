package topics

import (
	"encoding/json"
	"math"
	"os"
	"testing"

	"undercurrent/text/sparse"
)

// TestCoherenceMatchesGensim compares UMass and NPMI with gensim 4.2.0's CoherenceModel
// (Debian python3-gensim): testdata/gensim_coherence.json was made by
// testdata/gen_gensim_coherence.py (u_mass on the bag-of-words corpus; c_npmi with
// window_size = longest text, so each text is one boolean window).
func TestCoherenceMatchesGensim(t *testing.T) {
	raw, err := os.ReadFile("testdata/gensim_coherence.json")
	if err != nil {
		t.Fatal(err)
	}
	var fx struct {
		Texts  [][]string `json:"texts"`
		Topics [][]string `json:"topics"`
		UMass  []float64  `json:"u_mass"`
		NPMI   []float64  `json:"c_npmi"`
	}
	if err := json.Unmarshal(raw, &fx); err != nil {
		t.Fatal(err)
	}
	ids := map[string]int32{}
	var docs [][]int32
	for _, tx := range fx.Texts {
		var d []int32
		for _, w := range tx {
			if _, ok := ids[w]; !ok {
				ids[w] = int32(len(ids))
			}
			d = append(d, ids[w])
		}
		docs = append(docs, d)
	}
	b := sparse.NewBuilder(len(ids))
	for _, d := range docs {
		b.AddCounts(d)
	}
	ci := NewCoherenceIndex(b.Matrix())
	const tol = 1e-12
	for i, tp := range fx.Topics {
		top := make([]int, len(tp))
		for j, w := range tp {
			top[j] = int(ids[w])
		}
		if got := ci.UMass(top); math.Abs(got-fx.UMass[i]) > tol {
			t.Errorf("topic %d: UMass %v, gensim u_mass %v", i, got, fx.UMass[i])
		}
		if got := ci.NPMI(top); math.Abs(got-fx.NPMI[i]) > tol {
			t.Errorf("topic %d: NPMI %v, gensim c_npmi %v", i, got, fx.NPMI[i])
		}
	}
}
