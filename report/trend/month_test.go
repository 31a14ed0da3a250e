package trend

import (
	"testing"
	"time"
)

func TestMonth(t *testing.T) {
	for _, tc := range []struct {
		in   string
		days int
	}{
		{"2023-01", 31}, {"2024-02", 29}, {"2023-02", 28}, {"1900-02", 28}, {"2000-02", 29}, {"0000-01", 31}, {"2023-12", 31},
	} {
		m, err := ParseMonth(tc.in)
		if err != nil {
			t.Fatalf("ParseMonth(%q): %v", tc.in, err)
		}
		if m.String() != tc.in {
			t.Errorf("ParseMonth(%q).String() = %q", tc.in, m)
		}
		if m.Days() != tc.days {
			t.Errorf("%s has %d days, want %d (Gregorian calendar)", tc.in, m.Days(), tc.days)
		}
		if MonthOf(m.Start()) != m {
			t.Errorf("MonthOf(%s.Start()) = %s", m, MonthOf(m.Start()))
		}
	}
	if d, _ := ParseMonth("2023-12"); d+1 != MonthFor(2024, time.January) {
		t.Errorf("2023-12 + 1 = %s, want 2024-01", d+1)
	}
	for _, bad := range []string{"", "2023-13", "2023-00", "23-01", "2023/01", "2023-1", "+023-01", "2023-+1", "2023-01-01"} {
		if _, err := ParseMonth(bad); err == nil {
			t.Errorf("ParseMonth(%q): no error", bad)
		}
	}
}
