package text

import (
	"encoding/binary"
	"hash/maphash"
	"math/bits"
	"unsafe"
)

// internTable maps token texts to dense ids, first come first numbered. It is an
// open-addressing hash table (linear probing, power-of-two size, load at most 1/2) keyed by
// the packed bytes of texts up to 15 bytes and by maphash of longer ones; a lookup of a known
// text allocates nothing. It exists because the scan loop looks up every token, and this is
// about twice as fast as a map[string]int32 there; Build also keeps all its surfaces in one.
type internTable struct {
	seed  maphash.Seed
	slots []islot
	strs  []string
}

type islot struct {
	lo, hi uint64
	id     int32 // id+1; 0 marks an empty slot
	short  bool  // lo, hi hold the text's bytes (at most 15) and length, not a hash
}

func newInternTable(sizeHint int) *internTable {
	n := 1 << bits.Len(uint(2*sizeHint+16))
	return &internTable{seed: maphash.MakeSeed(), slots: make([]islot, n)}
}

// reset empties the table, keeping its storage.
func (t *internTable) reset() {
	clear(t.slots)
	t.strs = t.strs[:0]
}

// find returns the id of b, or -1 when b is not in the table. It only reads the table, so
// several goroutines may call it at once while nobody adds.
func (t *internTable) find(b []byte) int32 {
	if s := t.slot(b); s.id != 0 {
		return s.id - 1
	}
	return -1
}

// findString is find for a string.
func (t *internTable) findString(w string) int32 {
	return t.find(unsafe.Slice(unsafe.StringData(w), len(w)))
}

// idString returns the id of w, adding w itself (not a copy) when new.
func (t *internTable) idString(w string) int32 {
	b := unsafe.Slice(unsafe.StringData(w), len(w)) // read only
	s := t.slot(b)
	if s.id != 0 {
		return s.id - 1
	}
	return t.add(s, b, w)
}

// slot returns b's slot: the one holding b, or the empty slot where b would go.
func (t *internTable) slot(b []byte) *islot {
	lo, hi, short := t.key(b)
	mask := uint64(len(t.slots) - 1)
	for i := t.home(lo, hi); ; i = (i + 1) & mask {
		s := &t.slots[i]
		if s.id == 0 || (s.lo == lo && s.hi == hi && s.short == short && (short || t.strs[s.id-1] == string(b))) {
			return s
		}
	}
}

// add puts b (whose text is w) into the empty slot s and returns its new id.
func (t *internTable) add(s *islot, b []byte, w string) int32 {
	id := int32(len(t.strs))
	t.strs = append(t.strs, w)
	s.lo, s.hi, s.short = t.key(b)
	s.id = id + 1
	if 2*len(t.strs) > len(t.slots) {
		t.grow()
	}
	return id
}

// home is a key's first slot: multiplicative hashing (Knuth, TAOCP vol. 3, §6.4), the top
// bits of the product.
func (t *internTable) home(lo, hi uint64) uint64 {
	return ((lo*0x9e3779b97f4a7c15 ^ hi) * 0xbf58476d1ce4e5b9) >> (64 - bits.TrailingZeros(uint(len(t.slots))))
}

// key packs texts of at most 15 bytes, the length in the top byte of hi; longer texts get
// maphash in lo.
func (t *internTable) key(b []byte) (lo, hi uint64, short bool) {
	short = len(b) <= 15
	switch {
	case len(b) <= 7:
		hi = uint64(len(b)) << 56
		if cap(b) >= 8 {
			// One load of 8 bytes (those past len(b) are in b's own array) and a mask.
			lo = binary.LittleEndian.Uint64(b[:8]) & (1<<(8*len(b)) - 1)
		} else {
			for k, c := range b {
				lo |= uint64(c) << (8 * k)
			}
		}
	case short:
		// b[8:] are the high bytes of the last 8; shifting by 64 (len 8) gives 0.
		lo = binary.LittleEndian.Uint64(b)
		hi = binary.LittleEndian.Uint64(b[len(b)-8:])>>(8*(16-len(b))) | uint64(len(b))<<56
	default:
		lo = maphash.Bytes(t.seed, b)
	}
	return
}

// id returns the id of b, adding a copy of it when new. Texts of at most 15 bytes (nearly
// all words) are keyed by their bytes packed into two uint64s, the length in the top byte of
// the second, so that a lookup compares two integers and reads no string; longer texts are
// keyed by maphash and compared in full. The short flag keeps the two kinds of key apart.
func (t *internTable) id(b []byte) int32 {
	s := t.slot(b)
	if s.id != 0 {
		return s.id - 1
	}
	return t.add(s, b, string(b))
}

func (t *internTable) grow() {
	old := t.slots
	t.slots = make([]islot, 2*len(old))
	mask := uint64(len(t.slots) - 1)
	for _, s := range old {
		if s.id == 0 {
			continue
		}
		i := t.home(s.lo, s.hi)
		for t.slots[i].id != 0 {
			i = (i + 1) & mask
		}
		t.slots[i] = s
	}
}

// countTable counts uint64 keys: open addressing, linear probing, load at most 1/2, grown by
// doubling. It replaces a map[uint64]int in the pair-counting loop, where a map's generality
// costs about half the time.
type countTable struct {
	slots []cslot
	n     int
}

type cslot struct {
	key   uint64
	count int // 0 marks an empty slot
}

func newCountTable(sizeHint int) *countTable {
	n := 1 << bits.Len(uint(2*sizeHint+16))
	return &countTable{slots: make([]cslot, n)}
}

// splitmix64's finaliser (Steele, Lea and Flood 2014).
func mix64(z uint64) uint64 {
	z ^= z >> 30
	z *= 0xbf58476d1ce4e5b9
	z ^= z >> 27
	z *= 0x94d049bb133111eb
	return z ^ z>>31
}

// add adds c (> 0) to key's count.
func (t *countTable) add(key uint64, c int) {
	mask := uint64(len(t.slots) - 1)
	for i := mix64(key) & mask; ; i = (i + 1) & mask {
		s := &t.slots[i]
		if s.count == 0 {
			s.key, s.count = key, c
			t.n++
			if 2*t.n > len(t.slots) {
				t.grow()
			}
			return
		}
		if s.key == key {
			s.count += c
			return
		}
	}
}

func (t *countTable) grow() {
	old := t.slots
	t.slots = make([]cslot, 2*len(old))
	mask := uint64(len(t.slots) - 1)
	for _, s := range old {
		if s.count == 0 {
			continue
		}
		i := mix64(s.key) & mask
		for t.slots[i].count != 0 {
			i = (i + 1) & mask
		}
		t.slots[i] = s
	}
}

// each calls f for every key with its count, in no particular order.
func (t *countTable) each(f func(key uint64, c int)) {
	for _, s := range t.slots {
		if s.count != 0 {
			f(s.key, s.count)
		}
	}
}
