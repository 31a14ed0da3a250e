package topics

import (
	"context"
	"encoding/json"
	"os"
	"testing"
)

// TestHeldOutAtLeastSklearn compares held-out document completion (Wallach et al. 2009)
// with scikit-learn 1.x batch LDA on the same generated corpus: testdata/sklearn_heldout.json
// was made by testdata/gen_sklearn_heldout.py (Debian python3-sklearn). Our fit must score
// at least as well as scikit-learn's φ, both scored by the same estimator (our fold-in with
// α = 0.1), and at least as well as scikit-learn's own figure (θ from its transform()).
func TestHeldOutAtLeastSklearn(t *testing.T) {
	raw, err := os.ReadFile("testdata/sklearn_heldout.json")
	if err != nil {
		t.Fatal(err)
	}
	var fx struct {
		K, V      int
		Alpha     float64
		Train     [][]int32   `json:"train"`
		Test      [][]int32   `json:"test"`
		SkPhi     [][]float64 `json:"sklearn_phi"`
		SkLL      float64     `json:"sklearn_ll_per_token"`
		SkVersion string      `json:"sklearn_version"`
	}
	if err := json.Unmarshal(raw, &fx); err != nil {
		t.Fatal(err)
	}
	m, err := Fit(context.Background(), Corpus{Counts: countMatrix(fx.Train, fx.V)}, Settings{K: fx.K, Iterations: 200, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	ours, _ := DocumentCompletion(NewTagger(m, InferSettings{}), fx.Test)
	sk := &Model{k: fx.K, v: fx.V, alpha: make([]float64, fx.K)}
	for k := range sk.alpha {
		sk.alpha[k] = fx.Alpha
	}
	for _, r := range fx.SkPhi {
		sk.phi = append(sk.phi, r...)
	}
	skOurs, _ := DocumentCompletion(NewTagger(sk, InferSettings{}), fx.Test)
	t.Logf("held-out LL/token: ours %.4f; sklearn %s φ with our fold-in %.4f, with its transform %.4f",
		ours, fx.SkVersion, skOurs, fx.SkLL)
	if ours < skOurs || ours < fx.SkLL {
		t.Errorf("ours %.4f below scikit-learn (%.4f same estimator, %.4f its own)", ours, skOurs, fx.SkLL)
	}
}
