package stopwords

import (
	"bufio"
	_ "embed"
	"fmt"
	"io"
	"sort"
	"strings"
)

//go:embed en.txt
var enList string

//go:embed boilerplate.txt
var boilerplateList string

// Set is a set of lowercased stopwords. The zero value is an empty set ready to use.
type Set struct {
	m map[string]struct{}
}

// New returns a set holding words (lowercased, trimmed; empty strings skipped).
func New(words ...string) *Set {
	s := &Set{}
	for _, w := range words {
		s.Add(w)
	}
	return s
}

// Add puts w (lowercased, trimmed) into the set; an empty word is ignored.
func (s *Set) Add(w string) {
	w = strings.ToLower(strings.TrimSpace(w))
	if w == "" {
		return
	}
	if s.m == nil {
		s.m = make(map[string]struct{})
	}
	s.m[w] = struct{}{}
}

// Has reports whether w, exactly as given, is in the set. Callers pass lowercased words.
func (s *Set) Has(w string) bool {
	if s == nil {
		return false
	}
	_, ok := s.m[w]
	return ok
}

// Len returns the number of words in the set.
func (s *Set) Len() int {
	if s == nil {
		return 0
	}
	return len(s.m)
}

// Words returns the words in ascending byte order.
func (s *Set) Words() []string {
	if s == nil {
		return nil
	}
	out := make([]string, 0, len(s.m))
	for w := range s.m {
		out = append(out, w)
	}
	sort.Strings(out)
	return out
}

// Union adds every word of o to s and returns s.
func (s *Set) Union(o *Set) *Set {
	if o == nil {
		return s
	}
	for w := range o.m {
		s.Add(w)
	}
	return s
}

// ParseError reports a bad line in a stopword list.
type ParseError struct {
	Name string // list name or file name, may be empty
	Line int    // 1-based
	Msg  string
}

func (e *ParseError) Error() string {
	if e.Name == "" {
		return fmt.Sprintf("stopwords: line %d: %s", e.Line, e.Msg)
	}
	return fmt.Sprintf("%s:%d: %s", e.Name, e.Line, e.Msg)
}

// Load reads a list from r into s: one word a line, '#' starts a comment, blank lines are
// skipped. A line holding more than one whitespace-separated word is an error (a list of
// single words, never phrases), reported with its line number.
func (s *Set) Load(r io.Reader) error {
	return s.load("", r)
}

// LoadNamed is Load with a name (usually the file name) used in error messages.
func (s *Set) LoadNamed(name string, r io.Reader) error {
	return s.load(name, r)
}

func (s *Set) load(name string, r io.Reader) error {
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 4096), 1<<20)
	line := 0
	for sc.Scan() {
		line++
		t := sc.Text()
		if i := strings.IndexByte(t, '#'); i >= 0 {
			t = t[:i]
		}
		f := strings.Fields(t)
		switch len(f) {
		case 0:
		case 1:
			s.Add(f[0])
		default:
			return &ParseError{Name: name, Line: line, Msg: fmt.Sprintf("more than one word on a line: %q", strings.TrimSpace(t))}
		}
	}
	if err := sc.Err(); err != nil {
		return fmt.Errorf("stopwords: reading %s: %w", name, err)
	}
	return nil
}

// Names lists the names Named accepts.
func Names() []string { return []string{"boilerplate", "en", "en+boilerplate"} }

// Named returns a fresh copy of an embedded list: "en", "boilerplate" or "en+boilerplate".
// It returns an error for any other name.
func Named(name string) (*Set, error) {
	s := &Set{}
	for _, part := range strings.Split(name, "+") {
		var src string
		switch part {
		case "en":
			src = enList
		case "boilerplate":
			src = boilerplateList
		default:
			return nil, fmt.Errorf("stopwords: unknown list %q (known: %s)", name, strings.Join(Names(), ", "))
		}
		if err := s.load(part+".txt", strings.NewReader(src)); err != nil {
			panic(err) // embedded lists are checked by the tests
		}
	}
	return s, nil
}
