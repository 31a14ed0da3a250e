package demotown_test

import (
	"fmt"
	"log"
	"os"

	"undercurrent/text/demotown"
)

func ExampleGenerate() {
	c := demotown.Generate(demotown.Config{Seed: 2, N: 36})
	for i := 0; i < 3; i++ {
		inc, tr := c.Incidents[i], c.Truth[i]
		fmt.Println(inc.ID, inc.Reported.Format(demotown.ReportedLayout), inc.District, "|", inc.CallType, "|", tr.Theme)
		fmt.Println(inc.Narrative)
		for _, p := range tr.PII {
			fmt.Printf("  %s %q at [%d,%d)\n", p.Type, p.Text, p.Start, p.End)
		}
	}
	// Output:
	// QM23-000001 1/9/2023 5:12 AM Millrace | DISTURBANCE - NOISE | trespass
	// RP reported subjects camping behind the warehouse on Corriden Ave. The manager explained the subject had been asked to leave twice today. The lady was described as a WM wearing a green backpack. I contacted the individual, identified as Maria Kilderry, DOB: 01/05/1978. Ms. Kilderry gathered her belongings and left the area without problems. I checked the building and found an open window in the back. Subj left the property. NFA.
	//   name "Maria Kilderry" at [237,251)
	//   dob "01/05/1978" at [258,268)
	//   name "Kilderry" at [274,282)
	// QM23-000002 2/20/2023 12:46 AM Lantern Hill | DOG AT LARGE | lost_found_property
	// 2/20/2023 0046 hrs. Dispatched to 631 Veltmoor Blvd for found property. A reporting party turned in tools found in the parking lot of Dunnerfell Diner. See case #23-064593 for the earlier report. The reporting party was given a report number for insurance. Item logged under case #23-058102.
	//   address "631 Veltmoor Blvd" at [34,51)
	//   case_number "23-064593" at [162,171)
	//   case_number "23-058102" at [281,290)
	// QM23-000003 3/10/2023 2:17 PM Eastwater | LARCENY | routine_clear
	// Area checked, gone on arrival.
}

// StreamDir writes incidents.csv and truth.jsonl for any N in flat memory.
func ExampleStreamDir() {
	dir, err := os.MkdirTemp("", "demotown")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	if err := demotown.StreamDir(dir, demotown.Config{Seed: 1, N: 100000}); err != nil {
		log.Fatal(err)
	}
}
