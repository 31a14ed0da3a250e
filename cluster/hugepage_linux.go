//go:build linux

package cluster

import (
	"runtime"
	"syscall"
	"unsafe"
)

// adviseHuge asks the kernel to back s with transparent huge pages
// (madvise MADV_HUGEPAGE) when s is large. The NN chain on a distance
// matrix reads columns of the condensed matrix with strides of whole rows;
// with 4 KiB pages nearly every such read misses the TLB. It is only a
// hint: errors are ignored and results are unaffected. Call it before the
// memory is first written.
func adviseHuge(s []float64) {
	const page = 4096
	if len(s)*8 < 64<<20 {
		return
	}
	start := uintptr(unsafe.Pointer(&s[0]))
	end := start + uintptr(len(s))*8
	a := (start + page - 1) &^ (page - 1)
	b := end &^ (page - 1)
	if b <= a {
		return
	}
	syscall.Syscall(syscall.SYS_MADVISE, a, b-a, syscall.MADV_HUGEPAGE)
	runtime.KeepAlive(s)
}
