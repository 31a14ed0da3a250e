package intake

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
	"time"
)

var testNow = time.Date(2026, 12, 1, 12, 0, 0, 0, time.UTC)

func TestParseDate(t *testing.T) {
	plus2 := time.FixedZone("", 2*3600)
	minus8 := time.FixedZone("", -8*3600)
	plus20 := time.FixedZone("", 20*60)
	tests := []struct {
		in    string
		order DateOrder
		want  time.Time
		src   string
	}{
		// ISO 8601 calendar dates, extended and basic format; the examples 1985-04-12 and
		// 19850412, 1985-04-12T10:15:30 and 19850412T101530 are those of ISO 8601:2004
		// clause 4.1.2.2 and 4.3.2 (from memory).
		{"1985-04-12", 0, time.Date(1985, 4, 12, 0, 0, 0, 0, time.UTC), "ISO 8601 4.1.2.2 extended"},
		{"19850412", 0, time.Date(1985, 4, 12, 0, 0, 0, 0, time.UTC), "ISO 8601 4.1.2.2 basic"},
		{"1985-04-12T10:15:30", 0, time.Date(1985, 4, 12, 10, 15, 30, 0, time.UTC), "ISO 8601 4.3.2 extended"},
		{"19850412T101530", 0, time.Date(1985, 4, 12, 10, 15, 30, 0, time.UTC), "ISO 8601 4.3.2 basic"},
		// RFC 3339 section 5.8 examples (an ISO 8601 profile).
		{"1985-04-12T23:20:50.52Z", 0, time.Date(1985, 4, 12, 23, 20, 50, 520000000, time.UTC), "RFC 3339 5.8"},
		{"1996-12-19T16:39:57-08:00", 0, time.Date(1996, 12, 19, 16, 39, 57, 0, minus8), "RFC 3339 5.8"},
		{"1990-12-31T23:59:60Z", 0, time.Date(1990, 12, 31, 23, 59, 59, 0, time.UTC), "RFC 3339 5.8 leap second, kept as :59 (time.Time has none)"},
		{"1937-01-01T12:00:27.87+00:20", 0, time.Date(1937, 1, 1, 12, 0, 27, 870000000, plus20), "RFC 3339 5.8"},
		// The brief's examples.
		{"2020-01-05", 0, time.Date(2020, 1, 5, 0, 0, 0, 0, time.UTC), "brief"},
		{"2020-01-05T14:30:00Z", 0, time.Date(2020, 1, 5, 14, 30, 0, 0, time.UTC), "brief"},
		{"2020-01-05T14:30:00+02:00", 0, time.Date(2020, 1, 5, 14, 30, 0, 0, plus2), "brief"},
		{"2020-01-05 14:30", 0, time.Date(2020, 1, 5, 14, 30, 0, 0, time.UTC), "space instead of T, common practice"},
		{"20200105T143000+0200", 0, time.Date(2020, 1, 5, 14, 30, 0, 0, plus2), "ISO 8601 basic with zone"},
		// US exports (osha: M/D/YYYY, SOURCES.md).
		{"8/10/2017", 0, time.Date(2017, 8, 10, 0, 0, 0, 0, time.UTC), "osha.csv row 1"},
		{"12/12/2005 14:00", 0, time.Date(2005, 12, 12, 14, 0, 0, 0, time.UTC), "SAFENET_2005.csv row 1"},
		{"1/5/20", 0, time.Date(2020, 1, 5, 0, 0, 0, 0, time.UTC), "M/D/YY, 20YY not after now"},
		{"1/5/99", 0, time.Date(1999, 1, 5, 0, 0, 0, 0, time.UTC), "M/D/YY, 2099 after now so 1999"},
		{"13/5/2020", 0, time.Date(2020, 5, 13, 0, 0, 0, 0, time.UTC), "only reading is day-first"},
		{"3/4/2020", DayFirst, time.Date(2020, 4, 3, 0, 0, 0, 0, time.UTC), "day-first option"},
		{"3/4/2020", MonthFirst, time.Date(2020, 3, 4, 0, 0, 0, 0, time.UTC), "month-first option"},
		{"05.01.2020", DayFirst, time.Date(2020, 1, 5, 0, 0, 0, 0, time.UTC), "dotted day-first"},
		// Month names.
		{"Jan 5, 2020", 0, time.Date(2020, 1, 5, 0, 0, 0, 0, time.UTC), "brief"},
		{"5 January 2020", 0, time.Date(2020, 1, 5, 0, 0, 0, 0, time.UTC), "brief"},
		{"January 5 2020", 0, time.Date(2020, 1, 5, 0, 0, 0, 0, time.UTC), "brief"},
		{"05-JAN-20", 0, time.Date(2020, 1, 5, 0, 0, 0, 0, time.UTC), "DD-MON-YY, common practice"},
		{"Sept. 30, 2019", 0, time.Date(2019, 9, 30, 0, 0, 0, 0, time.UTC), "abbreviation with a dot"},
		{"Sunday, January 5, 2020 3:45 PM", 0, time.Date(2020, 1, 5, 15, 45, 0, 0, time.UTC), "weekday and 12-hour time"},
		// Times.
		{"1/5/2020 3:45 PM", 0, time.Date(2020, 1, 5, 15, 45, 0, 0, time.UTC), "12-hour clock"},
		{"1/5/2020 12:10 am", 0, time.Date(2020, 1, 5, 0, 10, 0, 0, time.UTC), "12 AM is midnight (common practice)"},
		{"1/5/2020 12:10 PM", 0, time.Date(2020, 1, 5, 12, 10, 0, 0, time.UTC), "12 PM is noon (common practice)"},
		{"1/5/2020 3 p.m.", 0, time.Date(2020, 1, 5, 15, 0, 0, 0, time.UTC), "hour only"},
		{"1/5/2020 15:45:10", 0, time.Date(2020, 1, 5, 15, 45, 10, 0, time.UTC), "24-hour clock"},
		{"1/5/2020 1545", 0, time.Date(2020, 1, 5, 15, 45, 0, 0, time.UTC), "four-digit 24-hour time, common in dispatch logs"},
		{"2020-01-05 at 15:45", 0, time.Date(2020, 1, 5, 15, 45, 0, 0, time.UTC), "\"at\""},
	}
	for _, tt := range tests {
		got, err := ParseDate(tt.in, tt.order, testNow)
		if err != nil {
			t.Errorf("%q (%s): %v", tt.in, tt.src, err)
			continue
		}
		if !got.Equal(tt.want) || got.Format(time.RFC3339Nano) != tt.want.Format(time.RFC3339Nano) {
			t.Errorf("%q (%s) = %s, want %s", tt.in, tt.src, got.Format(time.RFC3339Nano), tt.want.Format(time.RFC3339Nano))
		}
	}
}

func TestParseDateBad(t *testing.T) {
	for _, in := range []string{
		"", "yesterday", "2020-13-01", "2020-02-30", "2019-02-29", "13/13/2020", "1/5/2020 25:00",
		"1/5/2020 13:00 PM", "Foo 5, 2020", "2020-01-05T14:30:00+15:00", "N/A", "unknown", "0/0/0000",
		"2020-01-05 garbage", "12345",
	} {
		if got, err := ParseDate(in, OrderAuto, testNow); err == nil {
			t.Errorf("%q = %s, want an error", in, got)
		}
	}
	// 2020 and 2000 are leap years, 1900 is not (Gregorian rule, common practice).
	for _, in := range []string{"2020-02-29", "2000-02-29"} {
		if _, err := ParseDate(in, OrderAuto, testNow); err != nil {
			t.Errorf("%q: %v", in, err)
		}
	}
	if _, err := ParseDate("1900-02-29", OrderAuto, testNow); err == nil {
		t.Error("1900-02-29 accepted")
	}
}

func TestExcelSerial(t *testing.T) {
	// Microsoft's documentation of the 1900 date system ("Date systems in Excel"): serial 1
	// is January 1, 1900, and January 1, 2008 is serial 39448 (from memory; openpyxl agrees,
	// see TestDatesAgainstReferences). Its note on
	// the 1900 leap-year bug: serial 60 is the nonexistent February 29, 1900, so serial 61
	// is March 1, 1900.
	tests := []struct {
		in   string
		want time.Time
	}{
		{"1", time.Date(1900, 1, 1, 0, 0, 0, 0, time.UTC)},
		{"59", time.Date(1900, 2, 28, 0, 0, 0, 0, time.UTC)},
		{"61", time.Date(1900, 3, 1, 0, 0, 0, 0, time.UTC)},
		{"39448", time.Date(2008, 1, 1, 0, 0, 0, 0, time.UTC)},
		{"43835.6041666667", time.Date(2020, 1, 5, 14, 30, 0, 0, time.UTC)},
	}
	for _, tt := range tests {
		got, err := excelSerial(tt.in)
		if err != nil || !got.Equal(tt.want) {
			t.Errorf("excelSerial(%s) = %s, %v; want %s", tt.in, got, err, tt.want)
		}
	}
	for _, in := range []string{"0", "60", "2958466"} {
		if got, err := excelSerial(in); err == nil {
			t.Errorf("excelSerial(%s) = %s, want an error", in, got)
		}
	}
}

func TestLayoutOf(t *testing.T) {
	tests := []struct{ in, want string }{
		{"%Y-%m-%d", "2006-01-02"},
		{"%d.%m.%Y %H:%M", "02.01.2006 15:04"},
		{"%m/%d/%y %I:%M %p", "01/02/06 03:04 PM"},
		{"02.01.2006", "02.01.2006"},
	}
	for _, tt := range tests {
		got, err := layoutOf(tt.in)
		if err != nil || got != tt.want {
			t.Errorf("layoutOf(%q) = %q, %v; want %q", tt.in, got, err, tt.want)
		}
	}
	for _, in := range []string{"%Q", "dd/mm/yyyy", "%"} {
		if _, err := layoutOf(in); err == nil {
			t.Errorf("layoutOf(%q) accepted", in)
		}
	}
}

func TestDecideReading(t *testing.T) {
	tests := []struct {
		vals []string
		want DateOrder
		why  string
	}{
		{[]string{"1/2/2020", "3/25/2020"}, MonthFirst, "a second field > 12 proves month-first"},
		{[]string{"1/2/2020", "25/3/2020"}, DayFirst, "a first field > 12 and none second proves day-first"},
		{[]string{"1/2/2020", "3/4/2020"}, MonthFirst, "ambiguous: month-first default"},
		{[]string{"25/3/2020", "26/3/2020", "3/25/2020"}, DayFirst, "conflict: majority"},
	}
	for _, tt := range tests {
		r, note, err := decideReading("d", tt.vals, &Options{}, false, testNow)
		if err != nil || r.order != tt.want || note == "" {
			t.Errorf("%v (%s): order %v note %q err %v; want %v", tt.vals, tt.why, r.order, note, err, tt.want)
		}
	}
	r, _, _ := decideReading("d", []string{"25/3/2020"}, &Options{DateOrder: MonthFirst}, false, testNow)
	if _, err := r.parse("25/3/2020"); err == nil {
		t.Error("the month-first option did not override the column")
	}
}

func FuzzParseDate(f *testing.F) {
	for _, s := range []string{"2020-01-05", "1/5/2020 3:45 PM", "Jan 5, 2020", "20200105T143000Z",
		"5 January 2020", "2020-01-05T14:30:00+02:00", "1545", "13/13/13", "Sunday, ", "2020-01-05 at 24:00"} {
		f.Add(s, uint8(0))
	}
	f.Fuzz(func(t *testing.T, s string, o uint8) {
		order := DateOrder(o % 3)
		got, err := ParseDate(s, order, testNow)
		if err != nil {
			return
		}
		// A date that reads reads again the same from its ISO form.
		again, err := ParseDate(got.Format("2006-01-02T15:04:05.999999999Z07:00"), order, testNow)
		if err != nil || !again.Equal(got) {
			t.Fatalf("%q -> %s -> %s, %v", s, got, again, err)
		}
		_, _ = parseDate(s, order, true, testNow)
	})
}

// TestDatesAgainstReferences compares ParseDate with python3-dateutil's parser and the
// Excel serial conversion with python3-openpyxl's from_excel, through the fixture
// testdata/dates_ref.json written by testdata/gen_dates.py.
func TestDatesAgainstReferences(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("testdata", "dates_ref.json"))
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Dateutil [][4]any
		Openpyxl [][2]string
	}
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	const layout = "2006-01-02T15:04:05.000000"
	for _, e := range ref.Dateutil {
		in, dayFirst, want := e[0].(string), e[1].(bool), e[2].(string)
		order := MonthFirst
		if dayFirst {
			order = DayFirst
		}
		got, err := ParseDate(in, order, testNow)
		if err != nil {
			t.Errorf("dateutil reads %q as %s; we fail: %v", in, want, err)
			continue
		}
		if got.Format(layout) != want {
			t.Errorf("%q: %s, dateutil %s", in, got.Format(layout), want)
		}
		_, off := got.Zone()
		if e[3] != nil && float64(off) != e[3].(float64) {
			t.Errorf("%q: offset %d, dateutil %v", in, off, e[3])
		}
	}
	for _, e := range ref.Openpyxl {
		got, err := excelSerial(e[0])
		if err != nil || got.Format(layout) != e[1] {
			t.Errorf("serial %s: %s %v, openpyxl %s", e[0], got.Format(layout), err, e[1])
		}
	}
	if len(ref.Dateutil) < 30 || len(ref.Openpyxl) < 10 {
		t.Fatal("fixture too short")
	}
}
