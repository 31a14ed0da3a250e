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
	// Found a bicycle leaning against the fence at the Cobble Flats rec center. The caller stated she last had it at the grocery store. The owner, Ms. Drumberly, came to the station and picked it up. The caller was given a report number for insurance. Lost property report taken.
	//   name "Drumberly" at [145,154)
	// QM23-000002 2/22/2023 3:21 PM Eastwater | WELL BEING CHECK | welfare_check
	// Dispatched to check the welfare of a female sitting at the bus stop at Elm and Thistlecombe. The resident was identified as Stephanie Gallardino, 61 years old. I gave the subject a ride to Pellinger Storage. I ran her name and found no warrants. Neighbors told me they had not seen her in three days. There was a strong odor coming from inside the res. The subject appeared confused but was able to tell me her name and address. The individual stated she just wanted to be left alone. The complainant was informed that her neighbor was okay. Call cleared.
	//   intersection "Elm and Thistlecombe" at [71,91)
	//   name "Stephanie Gallardino" at [124,144)
	//   age "61" at [146,148)
	// QM23-000003 3/25/2023 6:29 PM Sorrel Park | SUSPICIOUS PERSON | alarm
	// Residential panic alarm at 9427 Veltmoor Blvd, motion in the hallway.
	//   address "9427 Veltmoor Blvd" at [27,45)
}
