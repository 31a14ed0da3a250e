package trend_test

import (
	"fmt"
	"os"
	"strings"
	"time"

	"undercurrent/report/trend"
)

func ExampleWilson() {
	// 81 of 263: Newcombe's (1998) first example (attribution from memory).
	low, high := trend.Wilson(81, 263, 0.95)
	fmt.Printf("%.4f–%.4f\n", low, high)
	// Output: 0.2553–0.3662
}

func ExampleLogOdds() {
	count := func(s string) map[string]int {
		m := map[string]int{}
		for _, w := range strings.Fields(s) {
			m[w]++
		}
		return m
	}
	scores, _ := trend.LogOdds(count("the quick brown fox jumps over the lazy pig"),
		count("the lazy purple pig jumps over the lazier donkey"), trend.WordSettings{Alpha: 0.05})
	for _, s := range scores[:3] {
		fmt.Printf("%s %.6f\n", s.Word, s.Z)
	}
	// Output:
	// brown 0.689423
	// fox 0.689423
	// quick 0.689423
}

func ExampleSeriesTable() {
	d := func(s string) time.Time { t, _ := time.Parse(time.DateOnly, s); return t }
	var docs []trend.Doc
	add := func(start string, n int, theta []float64) {
		for i := 0; i < n; i++ {
			docs = append(docs, trend.Doc{Date: d(start).AddDate(0, 0, i), Theta: theta})
		}
	}
	entry, noise := []float64{0.7, 0.3}, []float64{0.2, 0.8}
	add("2023-01-01", 30, entry)
	add("2023-01-02", 12, noise)
	add("2023-03-01", 4, noise) // nothing in February: a gap
	add("2023-04-01", 15, entry)
	add("2023-04-03", 11, noise)
	s, err := trend.Monthly(docs, trend.Settings{From: d("2023-01-01"), To: d("2023-04-20")})
	if err != nil {
		fmt.Println(err)
		return
	}
	// March has 4 narratives: its counts are "<10". The number of narratives in all
	// months is published elsewhere, so April's total (the smallest other month total)
	// is withheld too, or March's could be found by subtraction; then April's cells
	// follow, because the theme totals are known.
	t := trend.SeriesTable(s, nil, []string{"entry", "noise"}, trend.Publish{})
	t.WriteCSV(os.Stdout)
	// Output:
	// month,theme,label,count,expected,total,share,low,high,coverage,partial,gap,flag
	// 2023-01,0,entry,30,23.400000,42,0.714286,0.564328,0.828330,1.000000,false,false,
	// 2023-01,1,noise,12,18.600000,42,0.285714,0.171670,0.435672,1.000000,false,false,
	// 2023-02,0,entry,,,,,,,1.000000,false,true,
	// 2023-02,1,noise,,,,,,,1.000000,false,true,
	// 2023-03,0,entry,<10,<10,<10,withheld,withheld,withheld,1.000000,false,false,
	// 2023-03,1,noise,<10,<10,<10,withheld,withheld,withheld,1.000000,false,false,
	// 2023-04,0,entry,withheld,withheld,withheld,withheld,withheld,withheld,0.666667,true,false,
	// 2023-04,1,noise,withheld,withheld,withheld,withheld,withheld,withheld,0.666667,true,false,
}

func ExampleChanges() {
	// Ten months of 100 invented narratives, 10 or 11 of them mostly about theme 0,
	// then a month with 30.
	var docs []trend.Doc
	for m := 0; m < 11; m++ {
		k := 10 + m%2
		if m == 10 {
			k = 30
		}
		for i := 0; i < 100; i++ {
			theta := []float64{0.2, 0.8}
			if i < k {
				theta = []float64{0.9, 0.1}
			}
			docs = append(docs, trend.Doc{Date: time.Date(2023, time.Month(1+m), 1+i%28, 0, 0, 0, 0, time.UTC), Theta: theta})
		}
	}
	s, _ := trend.Monthly(docs, trend.Settings{From: time.Date(2023, 1, 1, 0, 0, 0, 0, time.UTC), To: time.Date(2023, 11, 30, 0, 0, 0, 0, time.UTC)})
	for _, f := range trend.Changes(s, trend.ChangeSettings{Methods: []trend.Method{trend.C1}}) {
		fmt.Println(f.Explanation)
	}
	// Output:
	// In 2023-11 this theme's share (30.0%) was above the upper limit expected from the previous 7 months with data (2023-04 to 2023-10: mean 10.6%, sd 3.1% (the binomial floor for the month's number of narratives); C1 = 6.29 > 3). This marks the month for a closer reading of its narratives; it does not show that anything changed in what happened.
}
