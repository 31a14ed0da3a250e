package intake_test

import (
	"context"
	"fmt"
	"os"
	"strings"
	"time"

	"undercurrent/text/intake"
)

// An invented export of the town of Millbrook, read from standard input.
func ExampleRead() {
	export := `Incident No,Reported,District,Narrative
24-0001,1/13/2024 22:10,North,"RP reported loud music at 14 Alder Way, quieted on arrival."
24-0002,1/14/2024,South,
24-0003,2/30/2024,South,Alarm at the Quarry Lane library; checked the area.
24-0001,1/15/2024,North,"RP reported loud music at 14 Alder Way, quieted on arrival."
24-0004,3/2/2024 3:45 PM,North,Welfare check on Birch Street; subject fine.
`
	opt := intake.Options{Groups: []string{"District"}, Now: time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC)}
	s, err := intake.Read(context.Background(), []string{"-"}, strings.NewReader(export), opt)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, n := range s.Notes {
		fmt.Println("note:", n)
	}
	for _, r := range s.Records {
		fmt.Println(r.ID, r.Date.Format("2006-01-02 15:04"), r.Groups[0], r.Text)
	}
	fmt.Println(s.Summary())
	intake.WriteRejects(os.Stdout, s.Rejects)
	// Output:
	// note: id column: "Incident No" (header looks like an id; 80.0% of rows have distinct values)
	// note: narrative column: "Narrative" (header looks like a narrative; mean 53 characters)
	// note: date column: "Reported" (80.0% of non-empty sampled values read as dates, header looks like a date)
	// note: date column "Reported": read as month-first (M/D/Y): 4 values have a second field > 12
	// note: date column "Reported": rows rejected for an unparseable date 1, for an implausible date 0
	// note: duplicate ids: 1 row shares an id with another row; kept the first of each
	// 24-0001 2024-01-13 22:10 North RP reported loud music at 14 Alder Way, quieted on arrival.
	// 24-0004 2024-03-02 15:45 North Welfare check on Birch Street; subject fine.
	// read 5: kept 2, rejected 3 (duplicate id 1, empty narrative 1, unparseable date 1)
	// file,line,id,reason,detail
	// stdin,3,24-0002,empty narrative,"no text in ""Narrative"""
	// stdin,4,24-0003,unparseable date,"""2/30/2024"": field out of range: day 30 of February 2024"
	// stdin,5,24-0001,duplicate id,kept the row at stdin:2
}

func ExampleSurvey() {
	export := "id,date,narrative\n" +
		"1,2024-01-03,Checked the area; all clear.\n" +
		"2,2024-03-09,Checked the area; all clear.\n" +
		"3,2024-03-20,RP reported a loose dog near the Cedar Court playground.\n"
	s, err := intake.Read(context.Background(), []string{"-"}, strings.NewReader(export), intake.Options{Now: time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC)})
	if err != nil {
		fmt.Println(err)
		return
	}
	r := intake.Survey(s, intake.SurveyOptions{Top: 2})
	for _, m := range r.Months {
		fmt.Println(m.Month, m.N, m.Empty)
	}
	fmt.Println("words:", r.Words.Min, r.Words.Median, r.Words.Max)
	fmt.Println("duplicates:", r.DuplicateTexts)
	fmt.Println("openings:", r.Openings)
	fmt.Println("common:", r.CommonWords[0].Word, r.CommonWords[0].Docs)
	// Output:
	// 2024-01 1 false
	// 2024-02 0 true
	// 2024-03 2 false
	// words: 5 5 10
	// duplicates: 1
	// openings: [{checked 2} {rp 1}]
	// common: the 3
}
