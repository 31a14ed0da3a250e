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
	// QM23-000001 1/9/2023 5:12 AM Lantern Hill | LOST PROPERTY | lost_found_property
	// Found a bicycle leaning against the fence at the Millrace Transit Center. The a wallet was wet and appeared to have been outside for several weeks. The wallet contained a license in the name of Amanda Jorvane. The bicycle did not come back stolen. Property returned to the owner.
	//   name "Amanda Jorvane" at [194,208)
	// QM23-000002 2/24/2023 6:18 PM Lantern Hill | ANIMAL COMPLAINT | routine_clear
	// Checked the area, UTL. Cleared.
	// QM23-000003 3/10/2023 11:01 AM Lantern Hill | PERSON IN CRISIS | routine_clear
	// All quiet on arrival.
}
