package sparse

import (
	"reflect"
	"slices"
	"testing"
)

// The 3×3 example below is checked by hand against the CSR definition (Saad, §3.4): row 0 holds
// (0,1)=2, row 1 is empty, row 2 holds (2,0)=1 and (2,2)=4.
func TestBuilder(t *testing.T) {
	b := NewBuilder(3)
	b.AddRow([]int32{1, 1}, []float64{1, 1})
	b.AddRow(nil, nil)
	b.AddCounts([]int32{2, 0, 2, 2, 2})
	b.AddRow([]int32{0}, []float64{0}) // zero dropped
	m := b.Matrix()
	// last row had only a zero, so AddCounts row is [1,0,4]
	want := [][]float64{{0, 2, 0}, {0, 0, 0}, {1, 0, 4}, {0, 0, 0}}
	if got := m.Dense(); !reflect.DeepEqual(got, want) {
		t.Fatalf("Dense = %v, want %v", got, want)
	}
	if !reflect.DeepEqual(m.Indptr, []int{0, 1, 1, 3, 3}) {
		t.Fatalf("Indptr = %v", m.Indptr)
	}
	if m.At(2, 2) != 4 || m.At(1, 1) != 0 {
		t.Fatal("At wrong")
	}
	if got := m.DocumentFrequency(); !reflect.DeepEqual(got, []int{1, 1, 1}) {
		t.Fatalf("df = %v", got)
	}
	if got := m.ColumnSums(nil); !reflect.DeepEqual(got, []float64{1, 2, 4}) {
		t.Fatalf("sums = %v", got)
	}
}

// AddIDs must give the same rows as AddCounts (checked against it).
func TestAddIDs(t *testing.T) {
	a, b := NewBuilder(4), NewBuilder(4)
	rows := [][]int32{{3, 1, 3, 0, 3}, nil, {2}}
	for _, r := range rows {
		a.AddCounts(append([]int32(nil), r...))
		b.AddIDs(append([]int32(nil), r...))
	}
	if !reflect.DeepEqual(a.Matrix(), b.Matrix()) {
		t.Fatalf("AddIDs %+v != AddCounts %+v", b.Matrix(), a.Matrix())
	}
}

// Stack of row blocks equals building all rows in one Builder.
func TestStack(t *testing.T) {
	rows := [][]int32{{0, 2}, nil, {1, 1}, {2}}
	all := NewBuilder(3)
	a, b := NewBuilder(3), NewBuilder(3)
	for i, r := range rows {
		all.AddIDs(append([]int32(nil), r...))
		if i < 2 {
			a.AddIDs(append([]int32(nil), r...))
		} else {
			b.AddIDs(append([]int32(nil), r...))
		}
	}
	if got, want := Stack(a.Matrix(), b.Matrix()), all.Matrix(); !reflect.DeepEqual(got.Dense(), want.Dense()) || !reflect.DeepEqual(got.Indptr, want.Indptr) {
		t.Fatalf("Stack %+v, want %+v", got, want)
	}
	if m := Stack(); m.Rows != 0 || len(m.Indptr) != 1 {
		t.Fatal("empty Stack")
	}
}

// AddSortedCounts gives the same rows as AddIDs on the same occurrences, and leaves the
// scratch array zeroed.
func TestAddSortedCounts(t *testing.T) {
	rows := [][]int32{{3, 1, 3, 0, 3}, {}, {4}, {2, 2, 1}}
	a, b := NewBuilder(5), NewBuilder(5)
	cnt := make([]int32, 5)
	for _, r := range rows {
		a.AddIDs(append([]int32(nil), r...))
		var cols []int32
		for _, c := range r {
			if cnt[c] == 0 {
				cols = append(cols, c)
			}
			cnt[c]++
		}
		slices.Sort(cols)
		b.AddSortedCounts(cols, cnt)
	}
	ma, mb := a.Matrix(), b.Matrix()
	if !reflect.DeepEqual(ma, mb) {
		t.Fatalf("AddSortedCounts %+v, AddIDs %+v", mb, ma)
	}
	for _, v := range cnt {
		if v != 0 {
			t.Fatal("scratch not zeroed")
		}
	}
}
