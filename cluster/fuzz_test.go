package cluster

import (
	"encoding/binary"
	"math"
	"testing"
)

// FuzzLink: any input gives a tree or an error, never a panic (project
// rule on bad input); a tree has n-1 merges with sizes that add up.
func FuzzLink(f *testing.F) {
	f.Add([]byte{0, 0, 0, 0, 0, 0, 240, 63}, uint8(0))
	f.Add(make([]byte, 8*10), uint8(3))
	f.Add([]byte{0, 0, 0, 0, 0, 0, 248, 127, 0, 0, 0, 0, 0, 0, 240, 63, 1, 2, 3, 4, 5, 6, 7, 8}, uint8(5))
	f.Fuzz(func(t *testing.T, b []byte, m uint8) {
		d := make([]float64, len(b)/8)
		for i := range d {
			d[i] = math.Float64frombits(binary.LittleEndian.Uint64(b[8*i:]))
		}
		method := Linkage(1 + int(m)%7)
		tr, err := Link(d, method, nil)
		if err != nil {
			return
		}
		if len(tr.Merges) != tr.N-1 {
			t.Fatalf("%d merges for %d leaves", len(tr.Merges), tr.N)
		}
		if tr.N > 1 && tr.Merges[len(tr.Merges)-1].Size != tr.N {
			t.Fatalf("root size %d, want %d", tr.Merges[len(tr.Merges)-1].Size, tr.N)
		}
	})
}

// FuzzLinkVectors: as FuzzLink for rows of three numbers, every method,
// with and without weights taken from the data.
func FuzzLinkVectors(f *testing.F) {
	f.Add(make([]byte, 8*12), uint8(4), false)
	f.Add([]byte{0, 0, 0, 0, 0, 0, 240, 127, 0, 0, 0, 0, 0, 0, 240, 63, 1, 2, 3, 4, 5, 6, 7, 8}, uint8(5), true)
	f.Fuzz(func(t *testing.T, b []byte, m uint8, weighted bool) {
		v := make([]float64, len(b)/8)
		for i := range v {
			v[i] = math.Float64frombits(binary.LittleEndian.Uint64(b[8*i:]))
		}
		var x [][]float64
		var w []float64
		for i := 0; i+3 <= len(v); i += 3 {
			x = append(x, v[i:i+3])
			w = append(w, math.Abs(v[i])+1)
		}
		method := Linkage(1 + int(m)%7)
		if !weighted || (method != Ward && method != Centroid && method != Median) {
			w = nil
		}
		tr, err := LinkVectors(x, w, method, &Settings{Workers: 2})
		if err != nil {
			return
		}
		if len(tr.Merges) != max(0, tr.N-1) {
			t.Fatalf("%d merges for %d leaves", len(tr.Merges), tr.N)
		}
	})
}
