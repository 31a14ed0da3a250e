package text

import (
	"bufio"
	_ "embed"
	"fmt"
	"io"
	"sort"
	"strings"
	"sync"
)

//go:embed abbrev.txt
var shippedAbbrev string

// AbbrevError reports a bad line in an abbreviation table.
type AbbrevError struct {
	Name string // file name, may be empty
	Line int    // 1-based
	Msg  string
}

func (e *AbbrevError) Error() string {
	name := e.Name
	if name == "" {
		name = "abbreviations"
	}
	return fmt.Sprintf("%s:%d: %s", name, e.Line, e.Msg)
}

// ParseAbbrev reads an abbreviation table in undercurrent's format: one entry a line,
//
//	abbreviation = expansion words   # comment
//
// '#' starts a comment, blank lines are skipped, keys are lowercased single tokens and
// expansions are lowercased words. An empty expansion ("res =") removes a shipped entry when
// the table is used as a user table. name is used in error messages (usually the file name).
func ParseAbbrev(name string, r io.Reader) (map[string]string, error) {
	out := make(map[string]string)
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 4096), 1<<20)
	line := 0
	for sc.Scan() {
		line++
		t := sc.Text()
		if i := strings.IndexByte(t, '#'); i >= 0 {
			t = t[:i]
		}
		if strings.TrimSpace(t) == "" {
			continue
		}
		k, v, ok := strings.Cut(t, "=")
		if !ok {
			return nil, &AbbrevError{name, line, fmt.Sprintf("missing '=' in %q", strings.TrimSpace(t))}
		}
		k = strings.ToLower(strings.TrimSpace(k))
		if k == "" || strings.ContainsAny(k, " \t") {
			return nil, &AbbrevError{name, line, fmt.Sprintf("abbreviation must be one word, got %q", k)}
		}
		if _, dup := out[k]; dup {
			return nil, &AbbrevError{name, line, fmt.Sprintf("abbreviation %q listed twice", k)}
		}
		out[k] = strings.Join(strings.Fields(strings.ToLower(v)), " ")
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("text: reading %s: %w", name, err)
	}
	return out, nil
}

// ShippedAbbrev returns a copy of the shipped abbreviation table (common practice, written
// from memory; see abbrev.txt).
func ShippedAbbrev() map[string]string {
	shippedOnce.Do(func() {
		m, err := ParseAbbrev("abbrev.txt", strings.NewReader(shippedAbbrev))
		if err != nil {
			panic(err) // checked by the tests
		}
		shippedTable = m
	})
	out := make(map[string]string, len(shippedTable))
	for k, v := range shippedTable {
		out[k] = v
	}
	return out
}

var (
	shippedOnce  sync.Once
	shippedTable map[string]string
)

// Abbrev expands abbreviations. The zero value expands nothing.
type Abbrev struct {
	m map[string][]string
}

// NewAbbrev returns the shipped table (when shipped is true) with user entries added or
// overriding; a user entry with an empty expansion removes the abbreviation.
func NewAbbrev(shipped bool, user map[string]string) *Abbrev {
	a := &Abbrev{m: make(map[string][]string)}
	if shipped {
		for k, v := range ShippedAbbrev() {
			a.m[k] = strings.Fields(v)
		}
	}
	for k, v := range user {
		k = strings.ToLower(strings.TrimSpace(k))
		if f := strings.Fields(strings.ToLower(v)); len(f) > 0 {
			a.m[k] = f
		} else {
			delete(a.m, k)
		}
	}
	return a
}

// Lookup returns the expansion of w, or nil, false.
func (a *Abbrev) Lookup(w string) ([]string, bool) {
	if a == nil {
		return nil, false
	}
	e, ok := a.m[w]
	return e, ok
}

// Keys returns the abbreviations in ascending order.
func (a *Abbrev) Keys() []string {
	out := make([]string, 0, len(a.m))
	for k := range a.m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}
