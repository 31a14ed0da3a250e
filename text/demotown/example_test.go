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
	// Found a bicycle leaning against the fence at the Millrace Transit Center. The item was wet and appeared to have been outside for ten days. The owner, Ms. Drumberly, came to the station and picked it up. The caller was given a report number for insurance. Lost property report taken.
	//   name "Drumberly" at [154,163)
	// QM23-000002 2/22/2023 3:21 PM Eastwater | WELL BEING CHECK | welfare_check
	// At 0525 hrs on 2/22/2023, officers responded at 2nd St & Thistlecombe Way for a welfare check. Welfare check requested by the reporting party, Rachel Dellacort, who could be reached at 555-555-0195. The individual was cold but alert and said she was walking to a friend's house. There was a strong odor coming from inside the residence. The sergeant was informed of the call. I contacted the resident's daughter by phone at (555) 555-0175. The back door was unlocked and I entered w/ the property manager. The phone number on file, 555-0161, went straight to voicemail. Neighbors said they had not seen her in over a week. No concerns at this time. No further action.
	//   intersection "2nd St & Thistlecombe Way" at [48,73)
	//   name "Rachel Dellacort" at [143,159)
	//   phone "555-555-0195" at [185,197)
	//   phone "(555) 555-0175" at [424,438)
	//   phone "555-0161" at [532,540)
	// QM23-000003 3/10/2023 2:17 PM Eastwater | LARCENY | routine_clear
	// Area checked, gone on arrival.
}
