package trend

import (
	"bytes"
	"testing"
	"time"
)

// FuzzPipeline feeds arbitrary bytes as narratives (date offset, group, θ) through every
// step and table: none may panic, and the written tables must be the same twice.
func FuzzPipeline(f *testing.F) {
	f.Add([]byte{0, 1, 200, 3, 40, 5, 6, 7, 8, 9, 10, 11})
	f.Add(bytes.Repeat([]byte{7, 0, 255, 1}, 40))
	f.Fuzz(func(t *testing.T, data []byte) {
		var docs []Doc
		base := time.Date(2022, 1, 1, 0, 0, 0, 0, time.UTC)
		for len(data) >= 4 {
			a, b := float64(data[2])+1, float64(data[3])
			theta := []float64{a / (a + b), b / (a + b)}
			docs = append(docs, Doc{Date: base.AddDate(0, 0, int(data[0])*3), Group: string('A' + data[1]%4),
				Theta: theta, Words: map[string]int{string('a' + data[1]%5): int(data[3] % 7)}})
			data = data[4:]
		}
		s, err := Monthly(docs, Settings{})
		if err != nil {
			if len(docs) == 0 {
				return
			}
			t.Fatalf("valid docs rejected: %v", err)
		}
		flags := Changes(s, ChangeSettings{})
		g, err := Groups(docs, GroupSettings{})
		if err != nil {
			t.Fatal(err)
		}
		words, _ := GroupWords(docs, "A", nil, WordSettings{})
		render := func() []byte {
			var out bytes.Buffer
			for _, tb := range []*Table{SeriesTable(s, flags, nil, Publish{}), FlagTable(s, flags, ChangeSettings{}, nil, Publish{}),
				TrendTable(s, nil, 0, Publish{}), g.Table(nil, Publish{}), GroupTestTable(g, GroupSettings{}, Publish{}),
				WordTable(words, "A", "rest", 3, Publish{})} {
				if err := tb.WriteCSV(&out); err != nil {
					t.Fatal(err)
				}
				if err := tb.WriteJSON(&out); err != nil {
					t.Fatal(err)
				}
			}
			return out.Bytes()
		}
		if !bytes.Equal(render(), render()) {
			t.Fatal("tables differ between two renderings")
		}
	})
}
