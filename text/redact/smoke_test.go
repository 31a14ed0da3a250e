package redact

import "testing"

func TestSmoke(t *testing.T) {
	r, err := New(Options{Names: []string{"Tobin Marsh"}, Allow: []string{"Quosby Hardware"}})
	if err != nil {
		t.Fatal(err)
	}
	for _, in := range []string{
		"Caller John Smith reported that Smith's car was hit. Call (555) 555-0123 ext. 12 or 555.555.0142, phone 5555550199.",
		"Victim Varnell Quosby, DOB 01/02/1990, age 45, SSN 123-45-6789, email v.quosby@example.com, lives at 123 N Elm St Apt 4B.",
		"Suspect vehicle plate CA 7ABC123, VIN 1M8GDM9AXKP042788, near the corner of Elm and 4th Ave, case #24-001234, report 21-3456.",
		"Officers spoke with Ms. Tobin Marsh at Quosby Hardware. Later Tobbin Marsh said Marsh was fine. A 45-year-old employee fell at Main/Oak.",
		"SUSPECT JOHN SMITH FLED ON FOOT. V/ SMITH WAS BORN 3/4/85.",
	} {
		out, spans := r.Redact(in)
		t.Log(out)
		for _, s := range spans {
			t.Logf("  %v %q %s", s.Type, s.Text, s.Placeholder)
		}
		out2, _ := r.Redact(out)
		if out2 != out {
			t.Errorf("not idempotent:\n%s\n%s", out, out2)
		}
	}
}
