package redact

import (
	"reflect"
	"regexp"
	"strings"
	"testing"
)

// TestSuffixesASCIILetters checks the premise of the ASCII variants (see variants): every
// street suffix is lower-case ASCII letters, so a suffix followed by \b is the whole run of
// letters where it stands.
func TestSuffixesASCIILetters(t *testing.T) {
	for s := range streetSuffixes {
		if s == "" || strings.Trim(s, "abcdefghijklmnopqrstuvwxyz") != "" {
			t.Errorf("suffix %q is not lower-case ASCII letters", s)
		}
	}
}

// TestVariantsSameMatches checks the fast variants against the patterns they stand for,
// as the regexp package itself answers: findAll and findAllCross against
// FindAllStringSubmatchIndex, and the anchored variants against a match of the original
// that starts at 0. Inputs: hand-written street phrases (invented names) and the demo
// corpus cut into sentences.
func TestVariantsSameMatches(t *testing.T) {
	inputs := []string{
		"12 Elm St and 4th Ave", "at Larkmoor St & Fennowick Pl.", "1200 block of N Quennel Ave",
		"corner of Elm and Oak", "intersection of Main St & 4th Ave", "Elm Strt/Oak Streets",
		"99 Alder Stationary Rd", "7 Oak Stra St", "Elm St and Oak Ave and Pine Rd", "x12 Elm St",
		"Elm ſt and Oak Ave", "12 Elm Ct and Oak Parkway", "3 Thistlecombe Way, Apt 4", "",
		"4 Elm St_ and Oak Ave", "4 Elm Stré and Oak Ave", "ELM ST AND OAK AVE", "12 elm st",
	}
	for _, n := range demoTexts()[:2000] {
		inputs = append(inputs, strings.SplitAfter(n, ". ")...)
	}
	for i, re := range []*regexp.Regexp{addressRe, blockRe, crossRe, cornerRe} {
		for _, in := range inputs {
			want := re.FindAllStringSubmatchIndex(in, -1)
			if got := findAll(re, in); !reflect.DeepEqual(got, want) {
				t.Fatalf("pattern %d on %q: findAll %v, FindAll %v", i, in, got, want)
			}
			var want0 []int
			if m := re.FindStringSubmatchIndex(in); m != nil && m[0] == 0 {
				want0 = m
			}
			if got := pick(re, in, true).FindStringSubmatchIndex(in); !reflect.DeepEqual(got, want0) {
				t.Fatalf("pattern %d on %q: anchored %v, original at 0 %v", i, in, got, want0)
			}
		}
	}
}
