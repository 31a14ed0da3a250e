package topics_test

import (
	"bytes"
	"context"
	"fmt"
	"strings"

	"undercurrent/text/sparse"
	"undercurrent/topics"
)

// Invented narratives with two obvious themes: fit, describe, freeze, tag. (Priors are fixed
// here: re-estimating α on eight narratives is not meaningful.)
func Example() {
	texts := []string{
		"ladder fell roof ladder fell", "roof fell ladder scaffold", "scaffold fell roof",
		"press finger guard press", "finger press guard machine", "machine guard finger",
		"ladder roof fell scaffold", "press machine finger guard",
	}
	var vocab []string
	id := map[string]int32{}
	b := sparse.NewBuilder(8) // 8 distinct words
	for _, t := range texts {
		var ids []int32
		for _, w := range strings.Fields(t) {
			if _, ok := id[w]; !ok {
				id[w] = int32(len(vocab))
				vocab = append(vocab, w)
			}
			ids = append(ids, id[w])
		}
		b.AddCounts(ids)
	}
	m, err := topics.Fit(context.Background(), topics.Corpus{Counts: b.Matrix(), Vocabulary: vocab},
		topics.Settings{K: 2, Iterations: 200, Alpha: 0.1, FixedPriors: true, Seed: 1})
	if err != nil {
		fmt.Println(err)
		return
	}
	for k := 0; k < m.K(); k++ {
		var ws []string
		for _, w := range m.TopWords(k, 3, 1) {
			ws = append(ws, w.Term)
		}
		fmt.Printf("theme %d: %s (dominant in %d)\n", k, strings.Join(ws, ", "), m.Sizes()[k].Dominant)
	}
	var file bytes.Buffer
	m.Save(&file)
	frozen, _ := topics.Load(&file)
	tg := topics.NewTagger(frozen, topics.InferSettings{})
	th := tg.Infer("new-1", []int32{id["finger"], id["press"], id["guard"]})
	fmt.Printf("new narrative: theme 0 %.2f, theme 1 %.2f\n", th[0], th[1])
	// Output:
	// theme 0: press, finger, guard (dominant in 4)
	// theme 1: fell, ladder, roof (dominant in 4)
	// new narrative: theme 0 0.97, theme 1 0.03
}
