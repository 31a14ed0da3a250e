package trend

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"
)

// readFixture decodes testdata/name into v.
func readFixture(t *testing.T, name string, v any) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, v); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
}

// close reports whether a and b agree within tol, absolutely or relative to |b|.
func close(a, b, tol float64) bool {
	if math.IsNaN(a) || math.IsNaN(b) {
		return math.IsNaN(a) && math.IsNaN(b)
	}
	return math.Abs(a-b) <= tol*math.Max(1, math.Abs(b))
}

func panics(f func()) (p bool) {
	defer func() { p = recover() != nil }()
	f()
	return false
}

func parseFloat(s string) (float64, error) { return strconv.ParseFloat(s, 64) }

// relClose reports whether a and b agree within tol relative to |b| (for p-values).
func relClose(a, b, tol float64) bool { return math.Abs(a-b) <= tol*math.Abs(b) }
