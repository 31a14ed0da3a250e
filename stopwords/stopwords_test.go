package stopwords

import (
	"errors"
	"strings"
	"testing"
)

func TestNamed(t *testing.T) {
	en, err := Named("en")
	if err != nil {
		t.Fatal(err)
	}
	bp, err := Named("boilerplate")
	if err != nil {
		t.Fatal(err)
	}
	both, err := Named("en+boilerplate")
	if err != nil {
		t.Fatal(err)
	}
	// Expected memberships are common practice for English function words and narrative
	// boilerplate (written from memory, like the lists).
	tests := []struct {
		set  *Set
		word string
		want bool
	}{
		{en, "the", true}, {en, "wasn't", true}, {en, "vehicle", false}, {en, "#", false},
		{bp, "stated", true}, {bp, "the", false},
		{both, "the", true}, {both, "advised", true}, {both, "suspect", false},
	}
	for _, tt := range tests {
		if got := tt.set.Has(tt.word); got != tt.want {
			t.Errorf("Has(%q) = %v, want %v", tt.word, got, tt.want)
		}
	}
	if both.Len() != en.Len()+bp.Len() {
		t.Errorf("lists overlap: %d + %d != %d", en.Len(), bp.Len(), both.Len())
	}
	if _, err := Named("fr"); err == nil {
		t.Error("Named(fr) did not fail")
	}
}

func TestLoad(t *testing.T) {
	var s Set
	err := s.Load(strings.NewReader("# user list\nFoo\n\n  bar  # trailing comment\n"))
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(s.Words(), ","); got != "bar,foo" {
		t.Errorf("Words = %q", got)
	}
	err = s.LoadNamed("mine.txt", strings.NewReader("ok\ntwo words\n"))
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Line != 2 || !strings.HasPrefix(err.Error(), "mine.txt:2:") {
		t.Errorf("err = %v", err)
	}
	var nilSet *Set
	if nilSet.Has("x") || nilSet.Len() != 0 {
		t.Error("nil set not empty")
	}
}
