package text

import "testing"

func BenchmarkScan(b *testing.B) {
	docs := genCorpus(20000, 1)
	b.SetBytes(totalBytes(docs))
	var sc scanner
	tb := newInternTable(4096)
	for i := 0; i < b.N; i++ {
		c0 := cpuSeconds()
		for _, d := range docs {
			sc.scan(d, false)
			for _, t := range sc.toks {
				tb.id(sc.text[t.a:t.b])
			}
		}
		b.ReportMetric(float64(totalBytes(docs))/1e6/(cpuSeconds()-c0), "MB/cpu-s")
	}
}

func BenchmarkScanOnly(b *testing.B) {
	docs := genCorpus(20000, 1)
	b.SetBytes(totalBytes(docs))
	var sc scanner
	for i := 0; i < b.N; i++ {
		c0 := cpuSeconds()
		for _, d := range docs {
			sc.scan(d, false)
		}
		b.ReportMetric(float64(totalBytes(docs))/1e6/(cpuSeconds()-c0), "MB/cpu-s")
	}
}
