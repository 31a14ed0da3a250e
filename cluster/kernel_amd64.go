//go:build amd64 && !purego

package cluster

import "golang.org/x/sys/cpu"

// haveAVX2 selects the assembly kernels (kernel_amd64.s). They compute
// the same bits as the portable code (no fused multiply–add; the same
// order of additions), which the tests check, so results do not depend on
// the machine. Build with -tags purego to use the portable code only.
var haveAVX2 = cpu.X86.HasAVX2

//go:noescape
func ward8AVX2(x *[8]float64, c *float64, d int, w *float64, out []float64, mask *uint64, ww, lim, limwx float64)

// ward8 fills out with the partial sums of len(out) rows of c (stride d)
// and mask with the rows that survive Ward's pruning test
//
//	w[k]·(out[k]·ww − lim) ≤ limwx
//
// (bit k%64 of mask[k/64]); len(mask) must be ≥ (len(out)+63)/64.
func ward8(x *[8]float64, c []float64, d int, w []float64, out []float64, mask []uint64, ww, lim, limwx float64) {
	if len(out) == 0 {
		return
	}
	if (len(out)-1)*d+8 > len(c) || len(w) < len(out) || len(mask) < (len(out)+63)/64 {
		panic("cluster: ward8 out of range")
	}
	if haveAVX2 {
		ward8AVX2(x, &c[0], d, &w[0], out, &mask[0], ww, lim, limwx)
		return
	}
	ward8Go(x, c, d, w, out, mask, ww, lim, limwx)
}

//go:noescape
func sqdistAVX2(a, b *float64, n int) float64

// sqdist returns ‖a−b‖² for len(a) == len(b), summed in four lanes (see
// sqdistGo); the AVX2 path gives the same bits.
func sqdist(a, b []float64) float64 {
	if haveAVX2 && len(a) >= 8 {
		b = b[:len(a)]
		return sqdistAVX2(&a[0], &b[0], len(a))
	}
	return sqdistGo(a, b)
}

//go:noescape
func ward12AVX2(x *[12]float64, c *float64, d int, w *float64, out []float64, mask *uint64, ww, lim, limwx float64)

// ward12 is ward8 over the first twelve coordinates (sumHead12's order).
func ward12(x *[12]float64, c []float64, d int, w []float64, out []float64, mask []uint64, ww, lim, limwx float64) {
	if len(out) == 0 {
		return
	}
	if (len(out)-1)*d+12 > len(c) || len(w) < len(out) || len(mask) < (len(out)+63)/64 {
		panic("cluster: ward12 out of range")
	}
	if haveAVX2 {
		ward12AVX2(x, &c[0], d, &w[0], out, &mask[0], ww, lim, limwx)
		return
	}
	ward12Go(x, c, d, w, out, mask, ww, lim, limwx)
}

//go:noescape
func ward16AVX2(x *[16]float64, c *float64, d int, w *float64, out []float64, mask *uint64, ww, lim, limwx float64)

// ward16 is ward8 over the first sixteen coordinates (sumHead16's order).
func ward16(x *[16]float64, c []float64, d int, w []float64, out []float64, mask []uint64, ww, lim, limwx float64) {
	if len(out) == 0 {
		return
	}
	if (len(out)-1)*d+16 > len(c) || len(w) < len(out) || len(mask) < (len(out)+63)/64 {
		panic("cluster: ward16 out of range")
	}
	if haveAVX2 {
		ward16AVX2(x, &c[0], d, &w[0], out, &mask[0], ww, lim, limwx)
		return
	}
	ward16Go(x, c, d, w, out, mask, ww, lim, limwx)
}

//go:noescape
func rowDistAVX2(x *float64, c *float64, d int, out []float64)

// rowDist stores in out[k] the Euclidean distance between x and row k of
// c (stride len(x)), as euclid computes it.
func rowDist(x, c []float64, out []float64) {
	d := len(x)
	if len(out) == 0 {
		return
	}
	if len(out)*d > len(c) {
		panic("cluster: rowDist out of range")
	}
	if haveAVX2 && d >= 8 {
		rowDistAVX2(&x[0], &c[0], d, out)
		return
	}
	rowDistGo(x, c, out)
}
