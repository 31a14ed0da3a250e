package demotown_test

import (
	"fmt"

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
	// QM23-000001 1/9/2023 5:12 AM Lantern Hill | PROPERTY | lost_found_property
	// A complainant came to the front desk to report her lost phone. I sent an email to jorrendale3@example.org to let the owner know. The owner, Ms. Westerhold, came to the station and picked it up. The owner could not be reached. Lost property report taken.
	//   email "jorrendale3@example.org" at [82,105)
	//   name "Westerhold" at [144,154)
	// QM23-000002 2/22/2023 3:21 PM Sorrel Park | CHECK WELFARE | welfare_check
	// Dispatched to check the welfare of a female sitting at the bus stop at Elm and Thistlecombe. Ms. Benavidro answered the door and said she had been sick and sleeping. The woman appeared confused but was able to tell me her name and address. The complainant can be reached at 555-555-0112. The subject was sitting in her veh in the driveway with the engine running. The individual explained she just wanted to be left alone. The individual had food and medication and did not appear to be in any danger. I knocked on the door several times and announced police, no answer. Resident was fine, family notified.
	//   intersection "Elm and Thistlecombe" at [71,91)
	//   name "Benavidro" at [97,106)
	//   phone "555-555-0112" at [274,286)
	// QM23-000003 3/4/2023 10:17 AM Sorrel Park | NOISE COMPLAINT | routine_clear
	// UTL.
}
