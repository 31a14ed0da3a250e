package topics

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"strings"
)

// SeedTheme names a guided theme by its seed words.
type SeedTheme struct {
	Name  string   `json:"name"`
	Words []string `json:"words"`
	// Line is the line of the "theme:" entry in the seed file (0 if not read from a file).
	Line int `json:"-"`
}

// SeedFileError reports a problem in a seed-theme file at a 1-based line and column
// (column counts bytes).
type SeedFileError struct {
	File         string
	Line, Column int
	Err          error
}

func (e *SeedFileError) Error() string {
	return fmt.Sprintf("%s:%d:%d: %v", e.File, e.Line, e.Column, e.Err)
}

func (e *SeedFileError) Unwrap() error { return e.Err }

// ErrSeedSyntax is wrapped by every SeedFileError about the file's layout.
var ErrSeedSyntax = errors.New("seed file syntax")

// ReadSeedThemes reads guided themes from a seed file. The format is our own:
//
//	# lines starting with # and blank lines are ignored
//	theme: mental health crisis
//	words: mental, crisis, suicidal
//	words: overdose            (more "words:" lines add to the theme above)
//	theme: use of force
//	words: taser, baton, force
//
// Keys are case-insensitive, words are separated by commas and trimmed; a word may contain
// spaces only if the vocabulary does. Every theme needs a non-empty name, at least one word,
// and a name not used before. name is used in error messages.
func ReadSeedThemes(r io.Reader, name string) ([]SeedTheme, error) {
	var out []SeedTheme
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 64*1024), 1<<20)
	line := 0
	fail := func(col int, format string, args ...any) error {
		return &SeedFileError{name, line, col, fmt.Errorf("%w: "+format, append([]any{ErrSeedSyntax}, args...)...)}
	}
	seen := map[string]int{}
	for sc.Scan() {
		line++
		raw := sc.Text()
		text := strings.TrimSpace(raw)
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		lead := strings.Index(raw, text) + 1
		colon := strings.IndexByte(text, ':')
		if colon < 0 {
			return nil, fail(lead, "expected \"theme:\" or \"words:\", got %q", text)
		}
		key := strings.ToLower(strings.TrimSpace(text[:colon]))
		val := strings.TrimSpace(text[colon+1:])
		switch key {
		case "theme":
			if val == "" {
				return nil, fail(lead, "theme has no name")
			}
			if prev, ok := seen[strings.ToLower(val)]; ok {
				return nil, fail(lead, "theme %q already named on line %d", val, prev)
			}
			seen[strings.ToLower(val)] = line
			if n := len(out); n > 0 && len(out[n-1].Words) == 0 {
				return nil, fail(lead, "theme %q (line %d) has no words", out[n-1].Name, out[n-1].Line)
			}
			out = append(out, SeedTheme{Name: val, Line: line})
		case "words":
			if len(out) == 0 {
				return nil, fail(lead, "\"words:\" before any \"theme:\"")
			}
			col := lead + colon + 1
			for _, w := range strings.Split(text[colon+1:], ",") {
				ww := strings.TrimSpace(w)
				if ww == "" {
					return nil, fail(col, "empty word in list")
				}
				out[len(out)-1].Words = append(out[len(out)-1].Words, ww)
				col += len(w) + 1
			}
		default:
			return nil, fail(lead, "unknown key %q (want \"theme\" or \"words\")", key)
		}
	}
	if err := sc.Err(); err != nil {
		return nil, &SeedFileError{name, line + 1, 1, err}
	}
	if n := len(out); n > 0 && len(out[n-1].Words) == 0 {
		line = out[n-1].Line
		return nil, fail(1, "theme %q has no words", out[n-1].Name)
	}
	return out, nil
}

// resolveSeeds maps each seed word to a column, by vocabulary term first and then display
// form. A word found in neither is an error naming the theme.
func resolveSeeds(seeds []SeedTheme, vocab, display []string) ([][]int32, error) {
	if len(seeds) == 0 {
		return nil, nil
	}
	if vocab == nil {
		return nil, errors.New("topics: seed themes need a vocabulary")
	}
	byTerm := make(map[string]int32, len(vocab))
	for i, w := range vocab {
		byTerm[w] = int32(i)
	}
	byDisplay := make(map[string]int32, len(display))
	for i, w := range display {
		if _, ok := byDisplay[w]; !ok {
			byDisplay[w] = int32(i)
		}
	}
	out := make([][]int32, len(seeds))
	for t, st := range seeds {
		for _, w := range st.Words {
			id, ok := byTerm[w]
			if !ok {
				id, ok = byDisplay[w]
			}
			if !ok {
				id, ok = byTerm[strings.ToLower(w)]
			}
			if !ok {
				where := ""
				if st.Line > 0 {
					where = fmt.Sprintf(" (seed file line %d)", st.Line)
				}
				return nil, fmt.Errorf("topics: seed theme %q%s: word %q is not in the vocabulary", st.Name, where, w)
			}
			out[t] = append(out[t], id)
		}
	}
	return out, nil
}
