package topics

import (
	"context"
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// TestSweepFindsTrueK draws a corpus from 6 known topics (ours: disjoint 10-word topics,
// α = 0.2) and checks that the sweep's rule recommends K = 6 and reports every figure.
func TestSweepFindsTrueK(t *testing.T) {
	phi := make([][]float64, 6)
	for k := range phi {
		phi[k] = make([]float64, 60)
		for w := 0; w < 10; w++ {
			phi[k][k*10+w] = 0.1
		}
	}
	g := generate(11, phi, 400, 40, 0.2)
	calls := 0
	tab, err := Sweep(context.Background(), Corpus{Counts: countMatrix(g.docs, 60)}, SweepSettings{
		Ks:  []int{3, 6, 12},
		Fit: Settings{Iterations: 80, Seed: 3, Progress: func(done, total int) { calls++ }},
	})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range tab.Rows {
		t.Logf("K %2d  LL %.4f  NPMI %.3f  UMass %.3f  stability %.2f", r.K, r.HeldOutLL, r.NPMI, r.UMass, r.Stability)
		if math.IsNaN(r.HeldOutLL) || math.IsNaN(r.Stability) || len(r.ThemeNPMI) != r.K {
			t.Errorf("K %d: missing figures", r.K)
		}
	}
	for _, s := range tab.Reasons {
		t.Log(s)
	}
	if _, err := json.Marshal(tab); err != nil {
		t.Errorf("table does not encode as JSON: %v", err)
	}
	one := SweepRow{K: 2, Stability: math.NaN()}
	if b, _ := json.Marshal(one); !strings.Contains(string(b), `"Stability":null`) {
		t.Errorf("NaN stability encodes as %s", b)
	}
	if tab.Recommended != 6 {
		t.Errorf("recommended K = %d, want 6", tab.Recommended)
	}
	if calls != 3*2*80 || tab.HeldOutDocs != 80 {
		t.Errorf("progress calls %d, held-out docs %d", calls, tab.HeldOutDocs)
	}
}
