package report_test

import (
	"bytes"
	"fmt"
	"log"
	"strings"

	"undercurrent/report"
)

// A reviewer renames a theme, merges two and hides one, without refitting the model;
// the report then shows the reviewer's label as a person's.
func ExampleApply() {
	d := report.Sample(report.SampleSettings{Themes: 4, Seed: 1})
	labels := `# review of 2026-11-30
theme 1: label = Noise from parties
merge 3 into 1
hide 2
`
	c, err := report.ParseLabels("labels.txt", strings.NewReader(labels))
	if err != nil {
		log.Fatal(err)
	}
	if err := report.Apply(d, c, nil); err != nil {
		log.Fatal(err)
	}
	for _, t := range d.Themes {
		fmt.Printf("theme %d: %s (named by a person: %v, merged in: %v)\n", t.ID, t.Label, t.LabelByPerson, t.MergedFrom)
	}
	for _, h := range d.Hidden {
		fmt.Printf("hidden: theme %d, %s\n", h.ID, h.Line)
	}
	var page bytes.Buffer
	if err := report.Render(&page, d); err != nil {
		log.Fatal(err)
	}
	fmt.Println(strings.Contains(page.String(), "Noise from parties"))
	// Output:
	// theme 0: Parking and blocked driveways (named by a person: true, merged in: [])
	// theme 1: Noise from parties (named by a person: true, merged in: [3])
	// hidden: theme 2, labels.txt:4
	// true
}
