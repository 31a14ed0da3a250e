package intake

import (
	"errors"
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"time"
)

// DateOrder says how a numeric date such as 03/04/2020 is read.
type DateOrder int

const (
	// OrderAuto lets the column decide: day-first when some value has a first field > 12
	// and none has a second field > 12; month-first otherwise (US exports).
	OrderAuto DateOrder = iota
	// MonthFirst reads 03/04/2020 as March 4, 2020 (M/D/YYYY).
	MonthFirst
	// DayFirst reads 03/04/2020 as 3 April 2020 (D/M/YYYY).
	DayFirst
)

// String returns "auto", "month-first" or "day-first".
func (o DateOrder) String() string {
	switch o {
	case MonthFirst:
		return "month-first"
	case DayFirst:
		return "day-first"
	}
	return "auto"
}

// ParseDateOrder reads a DateOrder from its String form or a short alias: "" or
// "auto"; "month-first", "mdy" or "us"; "day-first", "dmy".
func ParseDateOrder(s string) (DateOrder, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "auto":
		return OrderAuto, nil
	case "month-first", "mdy", "us":
		return MonthFirst, nil
	case "day-first", "dmy":
		return DayFirst, nil
	}
	return OrderAuto, fmt.Errorf("unknown date order %q (use auto, month-first or day-first)", s)
}

var (
	errNotDate  = errors.New("not a date")
	errBadValue = errors.New("field out of range")
)

var (
	reISO      = regexp.MustCompile(`^(\d{4})[-/](\d{1,2})[-/](\d{1,2})`)
	reBasic    = regexp.MustCompile(`^(\d{4})(\d{2})(\d{2})(?:T(\d{2})(\d{2})(\d{2})?(?:[.,](\d{1,9}))?)?(Z|[+-]\d{2}(?:\d{2})?)?$`)
	reNum      = regexp.MustCompile(`^(\d{1,2})([/.-])(\d{1,2})([/.-])(\d{4}|\d{2})`)
	reMonFirst = regexp.MustCompile(`^([A-Za-z]{3,9})\.?[ -](\d{1,2})(?:st|nd|rd|th)?(?:,\s*|[ -])(\d{4}|\d{2})`)
	reDayFirst = regexp.MustCompile(`^(\d{1,2})(?:st|nd|rd|th)?[ -]([A-Za-z]{3,9})\.?(?:,\s*|[ -])(\d{4}|\d{2})`)
	reSerial   = regexp.MustCompile(`^\d{1,7}(?:\.\d+)?$`)

	reSep      = regexp.MustCompile(`^(?:T|\s+at\s+|,?\s+|,)`)
	reClock    = regexp.MustCompile(`^(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?`)
	reMilitary = regexp.MustCompile(`^(\d{2})(\d{2})(?:\s|$|Z|[+-])`)
	reHourOnly = regexp.MustCompile(`^(\d{1,2})\s*[AaPp]\.?[Mm]\.?`)
	reMeridiem = regexp.MustCompile(`^\s*([AaPp])\.?[Mm]\.?`)
	reZone     = regexp.MustCompile(`^\s*(Z|UTC|GMT|[+-]\d{2}(?::?\d{2})?)$`)
)

var monthNames = map[string]time.Month{
	"jan": 1, "feb": 2, "mar": 3, "apr": 4, "may": 5, "jun": 6,
	"jul": 7, "aug": 8, "sep": 9, "sept": 9, "oct": 10, "nov": 11, "dec": 12,
}

var weekdayPrefix = regexp.MustCompile(`^(?i:mon|tue|tues|wed|thu|thur|thurs|fri|sat|sun)[a-z]*\.?,?\s+`)

func lookupMonth(s string) (time.Month, bool) {
	s = strings.ToLower(s)
	if m, ok := monthNames[s]; ok {
		return m, true
	}
	if len(s) > 3 {
		m, ok := monthNames[s[:3]]
		if ok && strings.HasPrefix(time.Month(m).String(), strings.ToUpper(s[:1])+s[1:]) {
			return m, true
		}
	}
	return 0, false
}

// ParseDate reads one date or date-time written in any of the forms the package accepts
// (see the package documentation). A numeric date whose two first fields are both <= 12
// is read with order; OrderAuto then means month-first. now bounds two-digit years:
// YY is 20YY unless that is after now's year, then 19YY. Values without a zone are
// returned in UTC. ParseDate does not judge plausibility (see Options.Now).
func ParseDate(s string, order DateOrder, now time.Time) (time.Time, error) {
	return parseDate(s, order, false, now)
}

func atoi(s string) int { n, _ := strconv.Atoi(s); return n }

func fullYear(s string, now time.Time) int {
	y := atoi(s)
	if len(s) == 2 {
		if 2000+y <= now.Year() {
			return 2000 + y
		}
		return 1900 + y
	}
	return y
}

// parseDate is ParseDate with Excel serial numbers allowed when serial is true.
func parseDate(s string, order DateOrder, serial bool, now time.Time) (time.Time, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return time.Time{}, errNotDate
	}
	if serial && reSerial.MatchString(s) {
		return excelSerial(s)
	}
	if m := reBasic.FindStringSubmatch(s); m != nil {
		y, mo, d := atoi(m[1]), atoi(m[2]), atoi(m[3])
		var hh, mm, ss, ns int
		if m[4] != "" {
			hh, mm, ss = atoi(m[4]), atoi(m[5]), atoi(m[6])
			ns = nanos(m[7])
		}
		loc, err := zone(m[8])
		if err != nil {
			return time.Time{}, err
		}
		return build(y, mo, d, hh, mm, ss, ns, loc)
	}
	s = weekdayPrefix.ReplaceAllString(s, "")
	var y, mo, d int
	var rest string
	if m := reISO.FindStringSubmatch(s); m != nil {
		y, mo, d = atoi(m[1]), atoi(m[2]), atoi(m[3])
		rest = s[len(m[0]):]
	} else if m := reNum.FindStringSubmatch(s); m != nil && m[2] == m[4] {
		a, b := atoi(m[1]), atoi(m[3])
		y = fullYear(m[5], now)
		switch {
		case order == DayFirst:
			d, mo = a, b
		case order == MonthFirst:
			mo, d = a, b
		case a > 12: // OrderAuto: the only valid reading
			d, mo = a, b
		default:
			mo, d = a, b
		}
		rest = s[len(m[0]):]
	} else if m := reMonFirst.FindStringSubmatch(s); m != nil {
		mon, ok := lookupMonth(m[1])
		if !ok {
			return time.Time{}, errNotDate
		}
		mo, d, y = int(mon), atoi(m[2]), fullYear(m[3], now)
		rest = s[len(m[0]):]
	} else if m := reDayFirst.FindStringSubmatch(s); m != nil {
		mon, ok := lookupMonth(m[2])
		if !ok {
			return time.Time{}, errNotDate
		}
		d, mo, y = atoi(m[1]), int(mon), fullYear(m[3], now)
		rest = s[len(m[0]):]
	} else {
		return time.Time{}, errNotDate
	}
	hh, mm, ss, ns, loc, err := parseClock(rest)
	if err != nil {
		return time.Time{}, err
	}
	return build(y, mo, d, hh, mm, ss, ns, loc)
}

func nanos(frac string) int {
	if frac == "" {
		return 0
	}
	for len(frac) < 9 {
		frac += "0"
	}
	return atoi(frac[:9])
}

func zone(z string) (*time.Location, error) {
	switch z {
	case "", "Z", "UTC", "GMT":
		return time.UTC, nil
	}
	sign := 1
	if z[0] == '-' {
		sign = -1
	}
	z = strings.ReplaceAll(z[1:], ":", "")
	h := atoi(z[:2])
	m := 0
	if len(z) >= 4 {
		m = atoi(z[2:4])
	}
	if h > 14 || m > 59 {
		return nil, fmt.Errorf("%w: zone offset", errBadValue)
	}
	off := sign * (h*3600 + m*60)
	if off == 0 {
		return time.UTC, nil
	}
	return time.FixedZone("", off), nil
}

// parseClock reads the part after a date: nothing, or a separator, a 24-hour or 12-hour
// clock time (15:45, 15:45:10.5, 3:45 PM, 3 pm, 1545) and an optional zone.
func parseClock(rest string) (hh, mm, ss, ns int, loc *time.Location, err error) {
	loc = time.UTC
	if strings.TrimSpace(rest) == "" {
		return
	}
	if m := reZone.FindStringSubmatch(rest); m != nil && m[1][0] != '+' && m[1][0] != '-' {
		loc, err = zone(m[1])
		return
	}
	sep := reSep.FindString(rest)
	if sep == "" {
		err = errNotDate
		return
	}
	rest = rest[len(sep):]
	if m := reClock.FindStringSubmatch(rest); m != nil {
		hh, mm, ss, ns = atoi(m[1]), atoi(m[2]), atoi(m[3]), nanos(m[4])
		rest = rest[len(m[0]):]
	} else if m := reHourOnly.FindStringSubmatch(rest); m != nil {
		hh = atoi(m[1])
		rest = rest[len(m[1]):]
	} else if m := reMilitary.FindStringSubmatch(rest); m != nil {
		hh, mm = atoi(m[1]), atoi(m[2])
		rest = rest[4:]
	} else {
		err = errNotDate
		return
	}
	if m := reMeridiem.FindStringSubmatch(rest); m != nil {
		if hh < 1 || hh > 12 {
			err = fmt.Errorf("%w: hour %d with AM/PM", errBadValue, hh)
			return
		}
		pm := m[1] == "p" || m[1] == "P"
		switch {
		case pm && hh < 12:
			hh += 12
		case !pm && hh == 12:
			hh = 0
		}
		rest = rest[len(m[0]):]
	}
	if strings.TrimSpace(rest) != "" {
		m := reZone.FindStringSubmatch(rest)
		if m == nil {
			err = errNotDate
			return
		}
		loc, err = zone(m[1])
	}
	return
}

func build(y, mo, d, hh, mm, ss, ns int, loc *time.Location) (time.Time, error) {
	if mo < 1 || mo > 12 {
		return time.Time{}, fmt.Errorf("%w: month %d", errBadValue, mo)
	}
	if d < 1 || d > daysIn(time.Month(mo), y) {
		return time.Time{}, fmt.Errorf("%w: day %d of %s %d", errBadValue, d, time.Month(mo), y)
	}
	if hh > 24 || mm > 59 || ss > 60 || (hh == 24 && (mm != 0 || ss != 0 || ns != 0)) {
		return time.Time{}, fmt.Errorf("%w: time %02d:%02d:%02d", errBadValue, hh, mm, ss)
	}
	if ss == 60 { // a leap second (ISO 8601 allows it); time.Time has none, keep 59
		ss = 59
	}
	return time.Date(y, time.Month(mo), d, hh, mm, ss, ns, loc), nil
}

func daysIn(m time.Month, y int) int {
	return time.Date(y, m+1, 0, 0, 0, 0, 0, time.UTC).Day()
}

// excelSerial converts a serial date of Excel's 1900 date system. Microsoft's
// documentation of the 1900 date system ("Date systems in Excel") makes serial 1 the
// day January 1, 1900, and its note on the 1900 leap-year bug says Excel treats 1900 as
// a leap year, so serial 60 is February 29, 1900, a day that never was. Hence
//
//	n < 60:  1899-12-31 + n days
//	n = 60:  rejected
//	n > 60:  1899-12-30 + n days
//
// The fraction is the time of day, rounded to the nearest second.
func excelSerial(s string) (time.Time, error) {
	f, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return time.Time{}, errNotDate
	}
	n := int(f)
	sec := int((f-float64(n))*86400 + 0.5)
	switch {
	case n < 1:
		return time.Time{}, fmt.Errorf("%w: Excel serial %s is before 1900-01-01", errBadValue, s)
	case n == 60:
		return time.Time{}, fmt.Errorf("%w: Excel serial 60 is 1900-02-29, which does not exist (Excel's 1900 leap-year bug)", errBadValue)
	case n > 2958465:
		return time.Time{}, fmt.Errorf("%w: Excel serial %s is after 9999-12-31", errBadValue, s)
	}
	base := time.Date(1899, 12, 30, 0, 0, 0, 0, time.UTC)
	if n < 60 {
		base = base.AddDate(0, 0, 1)
	}
	return base.AddDate(0, 0, n).Add(time.Duration(sec) * time.Second), nil
}

// strftime directives accepted in Options.DateFormat, with their Go layout.
var strftime = map[byte]string{
	'Y': "2006", 'y': "06", 'm': "01", 'd': "02", 'e': "_2", 'b': "Jan", 'h': "Jan", 'B': "January",
	'H': "15", 'I': "03", 'M': "04", 'S': "05", 'p': "PM", 'z': "-0700", 'Z': "MST",
	'a': "Mon", 'A': "Monday", 'f': "000000", 'j': "002", '%': "%",
}

// layoutOf turns an explicit date format into a Go layout. A format holding '%' is
// strftime-like (%Y %y %m %d %e %b %B %H %I %M %S %p %z %Z %a %A %f %j %%); anything
// else is taken as a Go time layout and must contain a year ("2006" or "06").
func layoutOf(format string) (string, error) {
	if !strings.Contains(format, "%") {
		if !strings.Contains(format, "06") {
			return "", fmt.Errorf("%w: %q is neither a strftime format (%%Y-%%m-%%d) nor a Go layout with a year (2006-01-02)", ErrDateFormat, format)
		}
		return format, nil
	}
	var b strings.Builder
	for i := 0; i < len(format); i++ {
		c := format[i]
		if c != '%' {
			b.WriteByte(c)
			continue
		}
		if i+1 >= len(format) {
			return "", fmt.Errorf("%w: %q ends in a lone %%", ErrDateFormat, format)
		}
		i++
		g, ok := strftime[format[i]]
		if !ok {
			return "", fmt.Errorf("%w: %q has unknown directive %%%c", ErrDateFormat, format, format[i])
		}
		if format[i] == 'f' {
			b.WriteString(".")
		}
		b.WriteString(g)
	}
	return b.String(), nil
}

// dateReading is the column-level decision: how every value of the date column is read.
type dateReading struct {
	layout string // explicit Go layout, or ""
	iso    bool   // explicit "iso": only ISO 8601 forms
	serial bool   // Excel serial numbers
	order  DateOrder
	now    time.Time
}

func (r *dateReading) parse(s string) (time.Time, error) {
	s = strings.TrimSpace(s)
	switch {
	case r.layout != "":
		t, err := time.Parse(r.layout, s)
		if err != nil {
			return t, fmt.Errorf("does not match format %q", r.layout)
		}
		return t, nil
	case r.iso:
		if !reISO.MatchString(s) && !reBasic.MatchString(s) {
			return time.Time{}, errNotDate
		}
	}
	return parseDate(s, r.order, r.serial, r.now)
}

// otherOrder reports whether s, which does not read in r's day/month order, reads in the
// other one, and returns that order and the date it gives.
func (r *dateReading) otherOrder(s string) (DateOrder, time.Time, bool) {
	if r.layout != "" || r.iso {
		return OrderAuto, time.Time{}, false
	}
	var o DateOrder
	switch r.order {
	case MonthFirst:
		o = DayFirst
	case DayFirst:
		o = MonthFirst
	default:
		return OrderAuto, time.Time{}, false
	}
	t, err := parseDate(strings.TrimSpace(s), o, r.serial, r.now)
	return o, t, err == nil
}

// decideReading looks at every value of a date column and fixes its reading. It returns
// a human-readable note when it made a choice the user may want to check.
func decideReading(col string, values []string, opt *Options, fromXLSX bool, now time.Time) (*dateReading, string, error) {
	var d dateTally
	for _, v := range values {
		if v = strings.TrimSpace(v); v != "" {
			d.add(v, "")
		}
	}
	return decideTally(col, d, opt, fromXLSX, now)
}

// decideTally is decideReading from the counts of the column's values.
func decideTally(col string, d dateTally, opt *Options, fromXLSX bool, now time.Time) (*dateReading, string, error) {
	r := &dateReading{order: opt.DateOrder, now: now}
	switch f := strings.ToLower(strings.TrimSpace(opt.DateFormat)); f {
	case "":
	case "excel":
		r.serial = true
		return r, "", nil
	case "iso":
		r.iso = true
		return r, "", nil
	case "mdy":
		r.order = MonthFirst
		return r, "", nil
	case "dmy":
		r.order = DayFirst
		return r, "", nil
	default:
		l, err := layoutOf(opt.DateFormat)
		if err != nil {
			return nil, "", err
		}
		r.layout = l
		return r, "", nil
	}
	numeric, nonEmpty, firstBig, secondBig, slashed := d.numeric, d.nonEmpty, d.firstBig, d.secondBig, d.slashed
	var note string
	if nonEmpty > 0 && numeric*10 >= nonEmpty*9 && (fromXLSX || hintDate(col) > 0) {
		r.serial = true
		note = fmt.Sprintf("date column %q: %d of %d values are numbers, read as Excel 1900-system serial dates", col, numeric, nonEmpty)
	}
	if slashed == 0 || opt.DateOrder != OrderAuto {
		return r, note, nil
	}
	switch {
	case firstBig > 0 && secondBig == 0:
		r.order = DayFirst
		note = fmt.Sprintf("date column %q: read as day-first (D/M/Y): %d values have a first field > 12 and none a second field > 12", col, firstBig)
	case secondBig > 0 && firstBig == 0:
		r.order = MonthFirst
		note = fmt.Sprintf("date column %q: read as month-first (M/D/Y): %d values have a second field > 12", col, secondBig)
	case firstBig == 0 && secondBig == 0:
		r.order = MonthFirst
		note = fmt.Sprintf("date column %q: ambiguous (no field > 12 in %d numeric dates), took month-first (M/D/Y); use the day-first option to override", col, slashed)
	case firstBig > secondBig:
		r.order = DayFirst
		note = fmt.Sprintf("date column %q: conflicting numeric dates (%d day-first, %d month-first); took day-first, the %d month-first values are rejected", col, firstBig, secondBig, secondBig)
	default:
		r.order = MonthFirst
		note = fmt.Sprintf("date column %q: conflicting numeric dates (%d month-first, %d day-first); took month-first, the %d day-first values are rejected", col, secondBig, firstBig, firstBig)
	}
	return r, note, nil
}
