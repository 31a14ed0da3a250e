package routine

import (
	"math/rand/v2"
	"sync"
)

// Settings for near-duplicate detection. Zero values mean the defaults given.
type Settings struct {
	Shingle   int     `json:"shingle"`   // tokens per shingle; zero means 3
	Hashes    int     `json:"hashes"`    // signature length (bins), a power of two; zero means 64
	Bands     int     `json:"bands"`     // LSH bands, must divide Hashes; zero means 16
	Threshold float64 `json:"threshold"` // least estimated Jaccard similarity; zero means 0.8
	Seed      uint64  `json:"seed"`      // seeds the hash functions (rand.NewPCG(Seed, 0x726f7574))
}

func (s Settings) resolved() Settings {
	if s.Shingle <= 0 {
		s.Shingle = 3
	}
	if s.Hashes <= 0 {
		s.Hashes = 64
	}
	if s.Bands <= 0 {
		s.Bands = 16
	}
	if s.Hashes&(s.Hashes-1) != 0 {
		panic("routine: Hashes must be a power of two")
	}
	if s.Hashes%s.Bands != 0 {
		panic("routine: Bands must divide Hashes")
	}
	if s.Threshold <= 0 {
		s.Threshold = 0.8
	}
	return s
}

// mix is the splitmix64 finaliser (Steele, Lea and Flood 2014).
func mix(z uint64) uint64 {
	z ^= z >> 30
	z *= 0xbf58476d1ce4e5b9
	z ^= z >> 27
	z *= 0x94d049bb133111eb
	z ^= z >> 31
	return z
}

// HashString is 64-bit FNV-1a, used to hash tokens independently of any id numbering.
func HashString(s string) uint64 {
	h := uint64(14695981039346656037)
	for i := 0; i < len(s); i++ {
		h ^= uint64(s[i])
		h *= 1099511628211
	}
	return h
}

// Hasher computes MinHash signatures.
type Hasher struct {
	s     Settings
	seed  uint64
	shift uint
}

// NewHasher returns a Hasher for s. It panics if Hashes is not a power of two or Bands does
// not divide it.
func NewHasher(s Settings) *Hasher {
	s = s.resolved()
	r := rand.New(rand.NewPCG(s.Seed, 0x726f7574))
	shift := uint(64)
	for n := s.Hashes; n > 1; n >>= 1 {
		shift--
	}
	return &Hasher{s: s, seed: r.Uint64(), shift: shift}
}

// Len is the length of a (non-empty) signature: Settings.Hashes.
func (h *Hasher) Len() int { return h.s.Hashes }

const empty = ^uint64(0)

// Signature puts the signature of a narrative, given as its token hashes, into dst (grown as
// needed) and returns it. An empty narrative gets an empty signature.
func (h *Hasher) Signature(dst []uint64, tokens []uint64) []uint64 {
	dst = dst[:0]
	if len(tokens) == 0 {
		return dst
	}
	for i := 0; i < h.s.Hashes; i++ {
		dst = append(dst, empty)
	}
	k := h.s.Shingle
	if k > len(tokens) {
		k = len(tokens)
	}
	for i := 0; i+k <= len(tokens); i++ {
		sh := h.seed
		for _, t := range tokens[i : i+k] {
			sh = (sh ^ t) * 0x100000001b3 // FNV-style combine of the token hashes
		}
		sh = mix(sh)
		bin := 0
		if h.shift < 64 {
			bin = int(sh >> h.shift)
		}
		v := sh << (64 - h.shift) >> (64 - h.shift) // low bits order the shingles within a bin
		if h.shift == 64 {
			v = sh
		}
		if v < dst[bin] {
			dst[bin] = v
		}
	}
	return dst
}

// Groups returns, for each narrative, the index of the first narrative of its near-duplicate
// group (itself when it has none); nil or empty signatures are never grouped. The result does
// not depend on anything but the signatures and their order.
func (h *Hasher) Groups(sigs [][]uint64) []int {
	return h.GroupsParallel(sigs, nil)
}

// GroupsParallel is Groups with the work spread through run, which must call f(b) once
// for every b in [0, n), possibly concurrently (nil: one after another). The result is the
// same whatever the order of the calls: a group is a connected component, named by its
// smallest index.
func (h *Hasher) GroupsParallel(sigs [][]uint64, run func(n int, f func(b int))) []int {
	if run == nil {
		run = func(n int, f func(int)) {
			for b := 0; b < n; b++ {
				f(b)
			}
		}
	}
	rows := h.s.Hashes / h.s.Bands
	n := len(sigs)
	// Band keys first, band-major, so that each band's search reads its keys in order
	// instead of striding over every signature (the signatures are read again only for the
	// candidate pairs).
	keys := make([]uint64, h.s.Bands*n)
	used := make([]bool, h.s.Bands*n) // the band is filled (not all empty)
	const per = 1024
	run((n+per-1)/per, func(c int) {
		for i := c * per; i < min((c+1)*per, n); i++ {
			sig := sigs[i]
			if len(sig) != h.s.Hashes {
				continue
			}
			for b := 0; b < h.s.Bands; b++ {
				key := uint64(b)
				filled := false
				for _, v := range sig[b*rows : (b+1)*rows] {
					key = mix(key ^ v)
					filled = filled || v != empty
				}
				keys[b*n+i], used[b*n+i] = key, filled
			}
		}
	})
	pairs := make([][][2]int32, h.s.Bands)
	// One table per concurrent band search, emptied between bands (its contents never
	// outlive a band, so which table a band gets changes nothing).
	tables := sync.Pool{New: func() any { return newFirstTable(n) }}
	run(h.s.Bands, func(b int) {
		first := tables.Get().(*firstTable)
		defer func() {
			clear(first.slots)
			tables.Put(first)
		}()
		var out [][2]int32
		bk, bu := keys[b*n:(b+1)*n], used[b*n:(b+1)*n]
		for i, key := range bk {
			if !bu[i] {
				continue // no signature, or an all-empty band, which says nothing
			}
			j, ok := first.getOrPut(key, int32(i))
			if !ok {
				continue
			}
			if Similarity(sigs[i], sigs[j]) >= h.s.Threshold {
				out = append(out, [2]int32{int32(i), j})
			}
		}
		pairs[b] = out
	})
	parent := make([]int, len(sigs))
	for i := range parent {
		parent[i] = i
	}
	find := func(i int) int {
		for parent[i] != i {
			parent[i] = parent[parent[i]]
			i = parent[i]
		}
		return i
	}
	for _, ps := range pairs {
		for _, p := range ps {
			ri, rj := find(int(p[0])), find(int(p[1]))
			if ri < rj {
				parent[rj] = ri
			} else if rj < ri {
				parent[ri] = rj
			}
		}
	}
	out := make([]int, len(sigs))
	for i := range out {
		out[i] = find(i)
	}
	return out
}

// Similarity is the share of equal entries among the bins not empty in both signatures
// (0 when the lengths differ or no bin is filled).
func Similarity(a, b []uint64) float64 {
	if len(a) != len(b) || len(a) == 0 {
		return 0
	}
	eq, n := 0, 0
	for i := range a {
		if a[i] == empty && b[i] == empty {
			continue
		}
		n++
		if a[i] == b[i] {
			eq++
		}
	}
	if n == 0 {
		return 0
	}
	return float64(eq) / float64(n)
}

// firstTable maps a band key to the first narrative seen with it: open addressing with linear
// probing, sized for n keys at load at most 1/2, key and value side by side (one cache line
// per probe; faster than a map for this insert-heavy use).
type firstTable struct {
	slots []fslot
	mask  uint64
}

type fslot struct {
	key uint64
	val int32 // index+1; 0 marks an empty slot
}

func newFirstTable(n int) *firstTable {
	size := 16
	for size < 2*n {
		size *= 2
	}
	return &firstTable{slots: make([]fslot, size), mask: uint64(size - 1)}
}

// getOrPut returns the value stored under key and true, or stores v and returns false.
func (t *firstTable) getOrPut(key uint64, v int32) (int32, bool) {
	for i := mix(key) & t.mask; ; i = (i + 1) & t.mask {
		sl := &t.slots[i]
		if sl.val == 0 {
			sl.key, sl.val = key, v+1
			return 0, false
		}
		if sl.key == key {
			return sl.val - 1, true
		}
	}
}
