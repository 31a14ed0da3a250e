package phrase

import (
	"bufio"
	"os"
	"strconv"
	"strings"
	"testing"
)

type llrCase struct {
	k [4]float64
	g float64
}

func loadFixture(t *testing.T) []llrCase {
	t.Helper()
	f, err := os.Open("testdata/llr_scipy.txt")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var out []llrCase
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") || strings.TrimSpace(line) == "" {
			continue
		}
		f := strings.Fields(line)
		var c llrCase
		for i := 0; i < 5; i++ {
			v, err := strconv.ParseFloat(f[i], 64)
			if err != nil {
				t.Fatal(err)
			}
			if i < 4 {
				c.k[i] = v
			} else {
				c.g = v
			}
		}
		out = append(out, c)
	}
	if len(out) == 0 {
		t.Fatal("empty fixture")
	}
	return out
}
