package trend

import (
	"strings"
	"testing"
)

func countWords(s string) map[string]int {
	m := map[string]int{}
	for _, w := range strings.Fields(s) {
		m[w]++
	}
	return m
}

func TestLogOddsFox(t *testing.T) {
	// Expected values: the worked check of issue 7, z = ±0.6894227886807968, which is
	// Monroe, Colaresi & Quinn (2008) eqs. 16, 20 and 22 with the uniform prior
	// α_w = 0.05 for each of the 11 words and α_0 = 11 × 0.05 = 0.55, the variance
	// without the n − y terms (1/(y_a+α) + 1/(y_b+α)). Including those terms gives
	// 0.685784445131469 instead (computed here), so that is not the formulation.
	a := countWords("the quick brown fox jumps over the lazy pig")
	b := countWords("the lazy purple pig jumps over the lazier donkey")
	scores, err := LogOdds(a, b, WordSettings{Alpha: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	if len(scores) != 11 {
		t.Fatalf("%d words, want 11", len(scores))
	}
	want := map[string]float64{
		"brown": 0.6894227886807968, "fox": 0.6894227886807968, "quick": 0.6894227886807968,
		"purple": -0.6894227886807968, "lazier": -0.6894227886807968, "donkey": -0.6894227886807968,
		"the": 0, "lazy": 0, "pig": 0, "jumps": 0, "over": 0,
	}
	for _, s := range scores {
		if !close(s.Z, want[s.Word], 1e-15) {
			t.Errorf("z(%s) = %.16g, want %.16g", s.Word, s.Z, want[s.Word])
		}
	}
	var order []string
	for _, s := range scores {
		order = append(order, s.Word)
	}
	if got := strings.Join(order, " "); got != "brown fox quick jumps lazy over pig the donkey lazier purple" {
		t.Errorf("order %s", got)
	}
	// The zero value means α_w = 0.05.
	again, _ := LogOdds(a, b, WordSettings{})
	if again[0].Z != scores[0].Z {
		t.Errorf("zero settings z %v", again[0].Z)
	}
}

func TestLogOddsInformative(t *testing.T) {
	// Expected values: testdata/words.json, computed with numpy from the equations by
	// testdata/gen_words.py.
	var fx struct {
		A, B, Background map[string]int
		Alpha0           float64
		Scores           []struct {
			Word         string
			Delta, SE, Z float64
		}
	}
	readFixture(t, "words.json", &fx)
	scores, err := LogOdds(fx.A, fx.B, WordSettings{Background: fx.Background, Alpha0: fx.Alpha0})
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]WordScore{}
	for _, s := range scores {
		got[s.Word] = s
	}
	if len(got) != len(fx.Scores) {
		t.Fatalf("%d words, want %d", len(got), len(fx.Scores))
	}
	for _, w := range fx.Scores {
		g := got[w.Word]
		if !close(g.Delta, w.Delta, 1e-13) || !close(g.SE, w.SE, 1e-13) || !close(g.Z, w.Z, 1e-13) {
			t.Errorf("%s: %+v, numpy %+v", w.Word, g, w)
		}
	}
	if _, err := LogOdds(map[string]int{"x": 1}, fx.B, WordSettings{Background: fx.Background, Alpha0: 1}); err == nil || !strings.Contains(err.Error(), `"x"`) {
		t.Errorf("word missing from background: %v", err)
	}
	if _, err := LogOdds(fx.A, fx.B, WordSettings{Background: fx.Background}); err == nil {
		t.Error("no α_0: no error")
	}
}

func TestGroupWords(t *testing.T) {
	docs := []Doc{
		{Group: "day", Words: countWords("the quick brown fox")},
		{Group: "day", Words: countWords("jumps over the lazy pig")},
		{Group: "night", Words: countWords("the lazy purple pig jumps over")},
		{Group: "late", Words: countWords("the lazier donkey")},
	}
	rest, err := GroupWords(docs, "day", nil, WordSettings{})
	if err != nil {
		t.Fatal(err)
	}
	two, err := GroupWords(docs, "day", []string{"night", "late"}, WordSettings{})
	if err != nil {
		t.Fatal(err)
	}
	if rest[0].Word != "brown" || !close(rest[0].Z, 0.6894227886807968, 1e-15) || two[0] != rest[0] {
		t.Errorf("day against the rest: %+v / %+v", rest[0], two[0])
	}
	if _, err := GroupWords(docs, "day", []string{"day"}, WordSettings{}); err == nil {
		t.Error("same group on both sides: no error")
	}
	if _, err := GroupWords(docs, "dusk", nil, WordSettings{}); err == nil || !strings.Contains(err.Error(), `"dusk"`) {
		t.Errorf("empty group: %v", err)
	}
}
