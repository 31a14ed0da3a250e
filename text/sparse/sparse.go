// Package sparse holds the compressed sparse row (CSR) matrix that carries document-term counts
// and weights between the text pipeline, the topic models and the clustering code.
//
// The layout is the common CSR layout (as in Saad, "Iterative Methods for Sparse Linear
// Systems", 2nd ed., §3.4, and scipy.sparse.csr_matrix): row i's entries are
// Indices[Indptr[i]:Indptr[i+1]] (column numbers, strictly increasing within a row) with values
// Data[Indptr[i]:Indptr[i+1]].
package sparse

import (
	"fmt"
	"slices"
	"sort"
)

// Matrix is a compressed sparse row matrix of float64 values.
//
// The zero value is an empty 0×0 matrix. Indptr has Rows+1 entries; columns within a row are
// strictly increasing and no stored value is zero unless the caller stored one explicitly.
type Matrix struct {
	Rows, Cols int
	Indptr     []int
	Indices    []int32
	Data       []float64
}

// Builder appends rows one at a time to make a Matrix.
type Builder struct {
	m   Matrix
	tmp []entry
}

type entry struct {
	col int32
	val float64
}

// NewBuilder returns a Builder for a matrix with cols columns.
func NewBuilder(cols int) *Builder {
	return &Builder{m: Matrix{Cols: cols, Indptr: []int{0}}}
}

// AddRow appends a row given as parallel column and value slices in any order. Duplicate
// columns are summed; zero sums are dropped. It panics if a column is out of range or the
// slices differ in length.
func (b *Builder) AddRow(cols []int32, vals []float64) {
	if len(cols) != len(vals) {
		panic("sparse: column and value slices differ in length")
	}
	b.tmp = b.tmp[:0]
	for i, c := range cols {
		if c < 0 || int(c) >= b.m.Cols {
			panic(fmt.Sprintf("sparse: column %d out of range [0,%d)", c, b.m.Cols))
		}
		b.tmp = append(b.tmp, entry{c, vals[i]})
	}
	sort.Slice(b.tmp, func(i, j int) bool { return b.tmp[i].col < b.tmp[j].col })
	for i := 0; i < len(b.tmp); {
		j, s := i, 0.0
		for ; j < len(b.tmp) && b.tmp[j].col == b.tmp[i].col; j++ {
			s += b.tmp[j].val
		}
		if s != 0 {
			b.m.Indices = append(b.m.Indices, b.tmp[i].col)
			b.m.Data = append(b.m.Data, s)
		}
		i = j
	}
	b.m.Rows++
	b.m.Indptr = append(b.m.Indptr, len(b.m.Indices))
}

// AddCounts appends a row of counts from a list of column ids (one entry per occurrence).
func (b *Builder) AddCounts(ids []int32) {
	vals := make([]float64, len(ids))
	for i := range vals {
		vals[i] = 1
	}
	b.AddRow(ids, vals)
}

// Matrix returns the built matrix. The Builder must not be used afterwards.
func (b *Builder) Matrix() *Matrix {
	m := b.m
	return &m
}

// Row returns the column indices and values of row i. The slices alias the matrix.
func (m *Matrix) Row(i int) ([]int32, []float64) {
	if i < 0 || i >= m.Rows {
		panic(fmt.Sprintf("sparse: row %d out of range [0,%d)", i, m.Rows))
	}
	a, b := m.Indptr[i], m.Indptr[i+1]
	return m.Indices[a:b], m.Data[a:b]
}

// At returns the value at row i, column j (zero when not stored).
func (m *Matrix) At(i, j int) float64 {
	cols, vals := m.Row(i)
	k := sort.Search(len(cols), func(k int) bool { return int(cols[k]) >= j })
	if k < len(cols) && int(cols[k]) == j {
		return vals[k]
	}
	return 0
}

// NNZ returns the number of stored entries.
func (m *Matrix) NNZ() int { return len(m.Indices) }

// ColumnSums adds each column's values into dst, which must have length Cols (or be nil, in
// which case a new slice is made), and returns dst.
func (m *Matrix) ColumnSums(dst []float64) []float64 {
	if dst == nil {
		dst = make([]float64, m.Cols)
	}
	if len(dst) != m.Cols {
		panic("sparse: destination length does not match column count")
	}
	for k, c := range m.Indices {
		dst[c] += m.Data[k]
	}
	return dst
}

// DocumentFrequency returns, for each column, the number of rows with a stored non-zero value.
func (m *Matrix) DocumentFrequency() []int {
	df := make([]int, m.Cols)
	for k, c := range m.Indices {
		if m.Data[k] != 0 {
			df[c]++
		}
	}
	return df
}

// Dense returns the matrix as a row-major dense slice of slices (for tests and small data).
func (m *Matrix) Dense() [][]float64 {
	out := make([][]float64, m.Rows)
	for i := range out {
		out[i] = make([]float64, m.Cols)
		cols, vals := m.Row(i)
		for k, c := range cols {
			out[i][c] = vals[k]
		}
	}
	return out
}

// AddIDs appends a row of counts from a list of column ids (one entry per occurrence), like
// AddCounts, but sorts ids in place (the caller's slice is reordered) and allocates nothing
// beyond the matrix's own growth. It panics if a column is out of range.
func (b *Builder) AddIDs(ids []int32) {
	slices.Sort(ids)
	for i := 0; i < len(ids); {
		c := ids[i]
		if c < 0 || int(c) >= b.m.Cols {
			panic(fmt.Sprintf("sparse: column %d out of range [0,%d)", c, b.m.Cols))
		}
		j := i + 1
		for j < len(ids) && ids[j] == c {
			j++
		}
		b.m.Indices = append(b.m.Indices, c)
		b.m.Data = append(b.m.Data, float64(j-i))
		i = j
	}
	b.m.Rows++
	b.m.Indptr = append(b.m.Indptr, len(b.m.Indices))
}

// AddSortedCounts appends a row of counts: the columns cols, in increasing order and each
// once, with the values counts[c] (counts is a dense scratch array of at least Cols entries).
// It sets counts[c] back to 0 for every c in cols, so that one array serves every row. It
// panics if cols is not increasing or a column is out of range.
func (b *Builder) AddSortedCounts(cols []int32, counts []int32) {
	prev := int32(-1)
	for _, c := range cols {
		if c <= prev || int(c) >= b.m.Cols {
			panic(fmt.Sprintf("sparse: column %d out of order or out of range [0,%d)", c, b.m.Cols))
		}
		prev = c
		b.m.Indices = append(b.m.Indices, c)
		b.m.Data = append(b.m.Data, float64(counts[c]))
		counts[c] = 0
	}
	b.m.Rows++
	b.m.Indptr = append(b.m.Indptr, len(b.m.Indices))
}

// Grow reserves room for about rows more rows and nnz more stored entries.
func (b *Builder) Grow(rows, nnz int) {
	b.m.Indptr = slices.Grow(b.m.Indptr, rows)
	b.m.Indices = slices.Grow(b.m.Indices, nnz)
	b.m.Data = slices.Grow(b.m.Data, nnz)
}

// Stack returns the rows of parts one after another (vertical concatenation). Every part must
// have the same number of columns; Stack panics otherwise. With no parts it returns an empty
// 0×0 matrix.
func Stack(parts ...*Matrix) *Matrix {
	out := &Matrix{Indptr: []int{0}}
	if len(parts) == 0 {
		return out
	}
	out.Cols = parts[0].Cols
	nnz, rows := 0, 0
	for _, p := range parts {
		if p.Cols != out.Cols {
			panic("sparse: stacked matrices differ in column count")
		}
		nnz += p.NNZ()
		rows += p.Rows
	}
	out.Indptr = slices.Grow(out.Indptr, rows)
	out.Indices = make([]int32, 0, nnz)
	out.Data = make([]float64, 0, nnz)
	for _, p := range parts {
		base := len(out.Indices)
		for _, v := range p.Indptr[1:] {
			out.Indptr = append(out.Indptr, base+v)
		}
		out.Indices = append(out.Indices, p.Indices...)
		out.Data = append(out.Data, p.Data...)
		out.Rows += p.Rows
	}
	return out
}
