package topics

import (
	"bytes"
	"strings"
	"testing"
)

// FuzzLoad: Load never panics, whatever the bytes (RULES.md: bad input gives an error).
func FuzzLoad(f *testing.F) {
	m := handModel()
	var buf bytes.Buffer
	if err := m.Save(&buf); err != nil {
		f.Fatal(err)
	}
	f.Add(buf.Bytes())
	f.Add([]byte(fileMagic + "\n{}\n"))
	f.Add([]byte(fileMagic + "\n{\"format_version\":1,\"k\":1,\"v\":1}\n"))
	f.Fuzz(func(t *testing.T, b []byte) {
		Load(bytes.NewReader(b))
	})
}

// FuzzReadSeedThemes: the seed file reader never panics.
func FuzzReadSeedThemes(f *testing.F) {
	f.Add("theme: a\nwords: x, y\n")
	f.Add("words: x\n")
	f.Add("theme: \n:\n")
	f.Fuzz(func(t *testing.T, s string) {
		ReadSeedThemes(strings.NewReader(s), "f")
	})
}
