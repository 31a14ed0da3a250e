//go:build !linux

package cluster

func adviseHuge(s []float64) {}
