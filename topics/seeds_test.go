package topics

import (
	"context"
	"errors"
	"fmt"
	"reflect"
	"strings"
	"testing"
)

func TestReadSeedThemes(t *testing.T) {
	good := "# guided themes\n\ntheme: mental health crisis\nwords: mental, crisis , suicidal\nWords: overdose\n  theme: use of force\nwords: taser\n"
	got, err := ReadSeedThemes(strings.NewReader(good), "seeds.txt")
	if err != nil {
		t.Fatal(err)
	}
	want := []SeedTheme{
		{Name: "mental health crisis", Words: []string{"mental", "crisis", "suicidal", "overdose"}, Line: 3},
		{Name: "use of force", Words: []string{"taser"}, Line: 6},
	}
	if !reflect.DeepEqual(got, want) {
		t.Fatalf("got %+v", got)
	}
	bad := []struct{ in, want string }{
		{"words: a\n", "seeds.txt:1:1: seed file syntax: \"words:\" before any \"theme:\""},
		{"theme: a\ntheme: b\nwords: x\n", "seeds.txt:2:1: seed file syntax: theme \"a\" (line 1) has no words"},
		{"theme: a\nwords: x,,y\n", "seeds.txt:2:10: seed file syntax: empty word in list"},
		{"theme: a\nwords: x\ntheme: A\nwords: y\n", "seeds.txt:3:1: seed file syntax: theme \"A\" already named on line 1"},
		{"  colour: red\n", "seeds.txt:1:3: seed file syntax: unknown key \"colour\""},
		{"theme:\n", "seeds.txt:1:1: seed file syntax: theme has no name"},
		{"theme: a\n", "seeds.txt:1:1: seed file syntax: theme \"a\" has no words"},
		{"just text\n", "seeds.txt:1:1: seed file syntax: expected"},
	}
	for _, c := range bad {
		_, err := ReadSeedThemes(strings.NewReader(c.in), "seeds.txt")
		var se *SeedFileError
		if err == nil || !errors.As(err, &se) || !errors.Is(err, ErrSeedSyntax) || !strings.HasPrefix(err.Error(), c.want) {
			t.Errorf("%q: got %v, want prefix %q", c.in, err, c.want)
		}
	}
}

// TestGuidedThemeIsTracked: a corpus from 5 known topics; the seed file names one of them
// by 3 of its words. In refits with different seeds, theme 0 must be that topic (Hellinger
// < 0.2 to the truth) and carry the seed theme's name; a seed word absent from the
// vocabulary is an error naming it.
func TestGuidedThemeIsTracked(t *testing.T) {
	V := 50
	phi := make([][]float64, 5)
	for k := range phi {
		phi[k] = make([]float64, V)
		for w := 0; w < 10; w++ {
			phi[k][k*10+w] = 0.1
		}
	}
	g := generate(21, phi, 300, 40, 0.3)
	vocab := make([]string, V)
	for i := range vocab {
		vocab[i] = fmt.Sprintf("w%02d", i)
	}
	seeds, err := ReadSeedThemes(strings.NewReader("theme: crisis\nwords: w31, w33, w35\n"), "seeds.txt")
	if err != nil {
		t.Fatal(err)
	}
	c := Corpus{Counts: countMatrix(g.docs, V), Vocabulary: vocab}
	for seed := uint64(1); seed <= 3; seed++ {
		m, err := Fit(context.Background(), c, Settings{K: 5, Iterations: 80, Seed: seed, Seeds: seeds})
		if err != nil {
			t.Fatal(err)
		}
		if h := Hellinger(phi[3], m.TopicTerms(0)); h > 0.2 || m.ThemeName(0) != "crisis" {
			t.Errorf("seed %d: theme 0 %q at Hellinger %.3f from the seeded topic", seed, m.ThemeName(0), h)
		}
	}
	seeds[0].Words = append(seeds[0].Words, "nonesuch")
	_, err = Fit(context.Background(), c, Settings{K: 5, Seeds: seeds})
	if err == nil || !strings.Contains(err.Error(), `"nonesuch" is not in the vocabulary`) || !strings.Contains(err.Error(), "line 1") {
		t.Fatalf("got %v", err)
	}
}
