//go:build !amd64 || purego

package cluster

func ward8(x *[8]float64, c []float64, d int, w []float64, out []float64, mask []uint64, ww, lim, limwx float64) {
	ward8Go(x, c, d, w, out, mask, ww, lim, limwx)
}

func sqdist(a, b []float64) float64 { return sqdistGo(a, b) }

func ward12(x *[12]float64, c []float64, d int, w []float64, out []float64, mask []uint64, ww, lim, limwx float64) {
	ward12Go(x, c, d, w, out, mask, ww, lim, limwx)
}

func ward16(x *[16]float64, c []float64, d int, w []float64, out []float64, mask []uint64, ww, lim, limwx float64) {
	ward16Go(x, c, d, w, out, mask, ww, lim, limwx)
}

func rowDist(x, c []float64, out []float64) { rowDistGo(x, c, out) }
