package trend

import (
	"fmt"
	"strconv"
	"time"
)

// Month is a calendar month, stored as 12*year + (month-1) so that consecutive months
// differ by one. The zero value is 0000-01; use MonthOf or ParseMonth to make one.
type Month int

// MonthOf returns the calendar month of t in t's own location: the date as recorded.
// Convert t to the wanted time zone first if the data mixes zones.
func MonthOf(t time.Time) Month {
	return MonthFor(t.Year(), t.Month())
}

// MonthFor returns the month m of year y. It panics if m is not in 1..12.
func MonthFor(y int, m time.Month) Month {
	if m < time.January || m > time.December {
		panic("trend: month out of range")
	}
	return Month(12*y + int(m) - 1)
}

// ParseMonth parses "YYYY-MM" (four-digit year, two-digit month).
func ParseMonth(s string) (Month, error) {
	if len(s) != 7 || s[4] != '-' {
		return 0, fmt.Errorf("trend: month %q is not in the form YYYY-MM", s)
	}
	y, err1 := strconv.Atoi(s[:4])
	m, err2 := strconv.Atoi(s[5:])
	if err1 != nil || err2 != nil || y < 0 || m < 1 || m > 12 || s[0] == '+' || s[0] == '-' || s[5] == '+' || s[5] == '-' {
		return 0, fmt.Errorf("trend: month %q is not in the form YYYY-MM", s)
	}
	return MonthFor(y, time.Month(m)), nil
}

// Year returns the month's year.
func (m Month) Year() int { return floorDiv(int(m), 12) }

// Month returns the month of the year.
func (m Month) Month() time.Month { return time.Month(int(m)-12*m.Year()) + 1 }

// String formats m as "YYYY-MM".
func (m Month) String() string { return fmt.Sprintf("%04d-%02d", m.Year(), int(m.Month())) }

// Start returns midnight UTC on the first day of m.
func (m Month) Start() time.Time { return time.Date(m.Year(), m.Month(), 1, 0, 0, 0, 0, time.UTC) }

// End returns midnight UTC on the last day of m.
func (m Month) End() time.Time { return m.Start().AddDate(0, 1, -1) }

// Days returns the number of days in m.
func (m Month) Days() int { return m.Start().AddDate(0, 1, -1).Day() }

func floorDiv(a, b int) int {
	q := a / b
	if (a%b != 0) && ((a < 0) != (b < 0)) {
		q--
	}
	return q
}
