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
	// QM23-000001 1/9/2023 5:12 AM Millrace | DISTURBANCE - NOISE | trespass
	// RP reported subjects camping behind the warehouse on Corriden Ave. The manager explained the subject had been asked to leave twice today. The lady was described as a WM wearing a green backpack. I contacted the individual, identified as Maria Kilderry, DOB: 01/05/1978. Ms. Kilderry gathered her belongings and left the area without problems. I checked the building and found an open window in the back. Subj left the property. NFA.
	//   name "Maria Kilderry" at [237,251)
	//   dob "01/05/1978" at [258,268)
	//   name "Kilderry" at [274,282)
	// QM23-000002 2/20/2023 12:46 AM Eastwater | SUSPICIOUS CIRCUMSTANCES | lost_found_property
	// 2/20/2023 0046 hrs. Dispatched to 631 Veltmoor Blvd for found property. A reporting party turned in tools found in the parking lot of Dunnerfell Diner. A veh with plate BJZ5139 was parked nearby. The finder did not want to be contacted. Lost property report taken.
	//   address "631 Veltmoor Blvd" at [34,51)
	//   plate "BJZ5139" at [169,176)
	// QM23-000003 3/30/2023 8:20 PM Lantern Hill | SUSPICIOUS CIRCUMSTANCES | routine_clear
	// Subject GOA.
}
