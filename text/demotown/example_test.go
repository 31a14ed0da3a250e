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
	// QM23-000001 1/9/2023 5:12 AM Lantern Hill | TRESPASS | trespass
	// RP reported subjects camping behind the warehouse on Corriden Ave. A trespass notice was signed by the business owner. The subject was GOA. A lady named Anthony U. Merriwold told me she was waiting for a friend. I advised the individual of shelter options and gave her a bus pass. There was trash and a tent behind the building. Subject arrested for trespass.
	//   name "Anthony U. Merriwold" at [153,173)
	// QM23-000002 2/13/2023 1:38 PM Cobble Flats | VEHICLE STOP | mental_health_crisis
	// On 2/13/2023 at approx 1338 hours I was dispatched to Larkmoor Market reference a suicidal subject. Counselor at the Eastwater boat launch requested help w/ a person who was threatening self harm. A vehicle was parked in front of the home w/ the engine running. The subject did not meet the criteria for an emergency hold. The individual said he had not slept in a month. Family asked for a welfare check after he stopped answering the phone. The individual was very anxious and did not want to be touched. Emergency hold placed, report to follow.
	// QM23-000003 3/18/2023 6:08 AM Millrace | WARRANT ARREST | theft_from_vehicle
	// RP stated her silver work van was rummaged through and a backpack was missing. I arrived around 0655 and spoke w/ the comp. The victim explained she locked the vehicle but the door was found open. I checked the vicinity for the susp with negative results. The VIN 82JGN4FE36J85N807 was recorded for the report. The victim will check with the bank about the stolen cards. The suspect was described as a WF wearing a green backpack. Victim Teresa Dellacort stated she did not see anyone in the area. No suspect information. Report taken.
	//   vin "82JGN4FE36J85N807" at [264,281)
	//   name "Teresa Dellacort" at [438,454)
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
