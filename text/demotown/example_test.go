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
	// QM23-000001 1/9/2023 5:12 AM Sorrel Park | SUSPICIOUS PERSON | trespass
	// The property manager at Hallowmere Apartments asked for a woman to be removed from the laundry room. I spoke with the lady, identified as Brittany Okonkwele, dob 3/5/87. The alarm at the vacant building had been going off all night. A female named Carrowby, Ana stated she was waiting for a friend. The subject was advised that she was trespassed from the property for one year. I checked the building and found an open window in the back. Subject trespassed and left. Cleared.
	//   name "Brittany Okonkwele" at [138,156)
	//   dob "3/5/87" at [162,168)
	//   name "Carrowby, Ana" at [248,261)
	// QM23-000002 2/2/2023 1:11 AM Sorrel Park | TRESPASS | trespass
	// Unwanted person at 5443 Gorsebury Ter, subject refusing to leave. I met with the individual, identified as Teresa Okonkwele, DOB 08/20/1992. RP's email is tokonkwele31@example.org. The alarm at the vacant building had been going off all night. The manager said the subject had been asked to leave twice today. Ms. Okonkwele gathered her belongings and departed without problems. Subject escorted off the property. Returned to service, 10-8.
	//   address "5443 Gorsebury Ter" at [19,37)
	//   name "Teresa Okonkwele" at [107,123)
	//   dob "08/20/1992" at [129,139)
	//   email "tokonkwele31@example.org" at [155,179)
	//   name "Okonkwele" at [314,323)
	// QM23-000003 3/16/2023 3:43 AM Cobble Flats | ABANDONED VEHICLE | parking_complaint
	// Report of a veh with no plates parked in the alley behind Gorsebury Ter. The comp reported this happens every weekend. I told everyone involved to stay away from each other. The veh alarm was going off and had drained the battery. Owner moved the vehicle. Call cleared.
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
