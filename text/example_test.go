package text_test

import (
	"context"
	"fmt"

	"undercurrent/text"
)

func ExampleAnalyze() {
	raw := "RP&#39;s veh was struck at 9:45 a.m. (10-50); resi-\ndence checked"
	for _, tk := range text.Analyze(raw, text.DefaultSettings()) {
		fmt.Printf("%-10s %-5s %q\n", tk.Text, tk.Kind, raw[tk.Start:tk.End])
	}
	// Output:
	// reporting  word  "RP&#39;s"
	// party      word  "RP&#39;s"
	// vehicle    word  "veh"
	// was        word  "was"
	// struck     word  "struck"
	// at         word  "at"
	// 10-50      code  "10-50"
	// residence  word  "resi-\ndence"
	// checked    word  "checked"
}

func ExampleFrozen_Segments() {
	docs := []string{
		"Driver stopped for a traffic violation; vehicle towed.",
		"Vehicle parked across the driveway, driver cited.",
		"Bicycle stolen from the porch overnight.",
		"Neighbor reported a stolen bicycle and a towed vehicle.",
	}
	s := text.DefaultSettings()
	s.Vocab.MaxDocShare = 1
	_, f, err := text.Build(context.Background(), docs, s)
	if err != nil {
		panic(err)
	}
	for _, seg := range f.Segments("Stolen vehicle towed by the city.", nil) {
		if seg.Term >= 0 {
			fmt.Printf("[%s=%s]", seg.Text, f.Display[seg.Term])
		} else {
			fmt.Print(seg.Text)
		}
	}
	fmt.Println()
	// Output:
	// [Stolen=stolen] [vehicle=vehicle] [towed=towed] by the city.
}
