// Package intake reads records-system exports of incident narratives and accounts for
// every row: each data row read ends either in Set.Records or in Set.Rejects, with its
// file, line, id, reason and detail, so that
//
//	Set.Read = len(Set.Records) + len(Set.Rejects)
//
// always holds (Set.Summary prints "read R: kept K, rejected J (reason n, ...)").
//
// Stream (and its pull-style form, Reader) reads the same inputs without holding the
// records: a first pass over each file tallies what the choices below need, a second
// builds the records and hands each on; its records, rejects and notes are Read's (see
// Stream for the memory it keeps and its one difference, under Options.KeepLast).
//
// # Inputs
//
// Read takes file paths, "-" for standard input (spooled to a temporary file), and
// folders of .txt files. The format is decided by the bytes, not the extension:
//
//   - "PK\x03\x04" with an xl/ entry inside is an XLSX workbook (github.com/xuri/excelize/v2),
//     read from Options.Sheet or the first sheet, raw cell values, row 1 the header;
//   - gzip files (1F 8B) are decompressed to a temporary file and read as what they hold;
//   - other zip archives and OLE2 (.xls) files are errors;
//   - text starting with '[' is a JSON array of objects; with '{', JSON Lines when the
//     first line is a whole object, else one object whose first array-valued key holds
//     the records (unless the extension is .csv or .tsv: then it is delimited text).
//     Keys become columns in first-seen order; strings stay, null is "", numbers and
//     booleans keep their JSON text, nested values become compact JSON text; an
//     element or line that is not an object is rejected ("bad json");
//   - anything else is delimited text. The delimiter is sniffed among ',' tab ';' '|',
//     plus ", " (comma and space, as in the safenet exports; encoding/csv's
//     TrimLeadingSpace then drops leading blanks of fields); a header without any of
//     them makes a single-column file. A preamble before the
//     header (a report title, a generation date) is detected and skipped with a note
//     (Options.SkipLines overrides); line numbers stay those of the file. Lines ending
//     in a bare CR are read as lines. Quoting is RFC 4180 through
//     encoding/csv with LazyQuotes off unless Options.LazyQuotes. Fields of any size
//     (tested with 50 MB) are read. Lines holding only blanks are skipped and counted in
//     a note (encoding/csv skips empty lines alike); empty fields after the header's
//     last column are dropped. A row with another field count than the header's is
//     rejected ("ragged row"), a row with bad quoting is rejected ("bad quoting") with
//     the parser's line:column, and a quoted field that never closes is an error (it
//     swallowed the rest of the file).
//   - a folder: each *.txt file is one narrative; id is the file name without its
//     extension; a first line "Date: <value>" gives the date.
//
// Several files must have the same columns (in any order; matched by name); a file
// with other columns is an error naming it and the missing and extra columns.
//
// Whole-file problems are *PosError values printing "file:line:col: msg" and wrapping
// a sentinel (ErrEmpty, ErrHeaderOnly, ErrBinary, ErrUnclosedQuote, ErrColumns,
// ErrNoColumn, ErrNoNarrative, ErrDateFormat): binary content (a NUL byte without a
// UTF-16 byte-order mark), empty files, header-only files.
//
// # Encodings
//
// Per file: a byte-order mark decides UTF-8, UTF-16 LE or UTF-16 BE (UTF-16 needs the
// mark). Without one, a file that is valid UTF-8 is UTF-8. Otherwise the lines vote:
// when more lines hold invalid UTF-8 than hold valid multi-byte UTF-8 the file is read
// as Windows-1252 (golang.org/x/text/encoding/charmap); else it is UTF-8 and the
// invalid bytes become U+FFFD (or, with Options.RejectBadEncoding, their rows are
// rejected as "bad encoding"). FileInfo reports the encoding taken and the number of
// lines that do not fit it; a note explains mixed files. Standard input is copied to a
// temporary file first, so that it can be read twice like a file: once to decide the
// encoding, once to parse. Rows are then held in memory once (Set.Records shares their
// strings); an XLSX workbook is held whole by excelize.
//
// # Columns
//
// Options.ID, Date, Text and Groups name columns (exact name, else the one name equal
// ignoring case; a missing name is an error listing the columns and the closest one by
// Levenshtein distance). What is not named is chosen, and each choice is a line in
// Set.Notes:
//
//   - id: a header that is "id" or ends in an id word (id, nr, no, num, number, key,
//     "#"), with at least half the rows distinct (counted over all rows by a 64-bit
//     hash of each value); the more distinct wins a tie. None:
//     ids are "file:line". An empty id also becomes "file:line".
//   - narrative: among headers holding a narrative word (narrative, description,
//     summary, abstract, synopsis, details, remarks, comments, text, notes ...), the
//     longest mean text; with none, the longest mean text of all columns. Several
//     named narrative columns are joined with a blank line ("\n\n").
//   - date: among columns where at least 80% of the non-empty values of a sample of
//     at most 5,000 evenly spaced rows (every s-th row, s the smallest power of two that
//     leaves at most 5,000; every row of smaller files) read as dates (50% with a date-like header), the best
//     header (an event word such as "event", "occurred", "start" beats a plain date
//     word, which beats a record-keeping word such as "created", "stop", "birth"), then
//     the largest share of rows with a date. Bare numbers count only under a date-like
//     header.
//
// A narrative is empty when it holds only blanks, no letter or digit at all ("-",
// "..."), or an export's stand-in for nothing: NULL, N/A, NA, none, nil, NaN, #N/A
// (any case); with several narrative columns, the empty parts are left out of the join.
//
// Every other column is passed through in Record.Extra (names in Set.ExtraNames), its
// values as read; Record.Text and Record.Groups are trimmed of surrounding blanks.
//
// # Dates
//
// Accepted forms (see ParseDate):
//
//	ISO 8601 extended  2020-01-05, 2020-01-05T14:30, 2020-01-05 14:30:00.5, with Z,
//	                   +02:00, +0200 or +02 zones; also 2020/01/05
//	ISO 8601 basic     YYYYMMDD and YYYYMMDDThhmm[ss][.fff][Z|+hh[mm]]: 20200105,
//	                   20200105T143000Z, 20200105T1430+0200 (week dates 2020-W01-1
//	                   and ordinal dates 2020-005 are not read)
//	numeric            M/D/YYYY, M/D/YY, D/M/YYYY (also with '-' or '.' separators)
//	month names        Jan 5, 2020; January 5 2020; 5 January 2020; 05-Jan-2020; an
//	                   optional leading weekday ("Sunday, January 5, 2020")
//	Excel serials      1900 date system, when the column is mostly numbers and comes
//	                   from a workbook or has a date-like header, or DateFormat "excel"
//	times              after a date, by 'T', space, comma or " at ": 15:45, 15:45:10,
//	                   3:45 PM, 3 pm, 1545 (24-hour, four digits)
//
// Zones are Z, UTC, GMT or a numeric offset (+02:00, +0200, +02); named zones such as
// EST are not read (they are ambiguous). Two-digit years are 20YY unless that is after
// Options.Now's year, then 19YY. Values without a zone are in UTC. Options.Time names a
// separate time-of-day column, read after the date. The numeric order is a column decision: day-first when some
// value has a first field > 12 and none a second field > 12, month-first when the
// reverse, month-first (US exports) when no value decides, and by majority when values
// conflict (the minority is then rejected); the note says which and why.
// Options.DateOrder and Options.DateFormat override it ("iso", "mdy", "dmy", "excel", a
// strftime-like format such as "%d.%m.%Y %H:%M", or a Go layout such as
// "02.01.2006 15:04").
//
// A value that does not read is rejected ("unparseable date"), or, when it reads only in
// the other day/month order (25/12/2023 in a month-first column), as "date in the other
// day/month order", with the date it would give as detail; a date before
// 1900-01-01 or after Options.Now plus 14 hours (the widest zone offset) is rejected
// ("implausible date"); an empty date is kept with HasDate false unless
// Options.RequireDate ("missing date").
//
// # Rejects and duplicates
//
// Checks run in this order and the first that fails gives the reason: ragged row, bad
// quoting, bad json, bad encoding, repeated header (while parsing), blank row, empty narrative, missing
// date, unparseable date or date in the other day/month order, implausible date. Among the rows left, rows sharing an id keep the
// first (Options.KeepLast: the last, for exports that carry several versions of a
// report); the others are rejected as "duplicate id", or "duplicate id, different text"
// when their narrative differs from the kept row's, with the kept row's file:line as
// detail. WriteRejects writes the rejects as CSV (file,line,id,reason,detail).
//
// # Survey
//
// Survey describes a Set without modelling: encodings, columns, rows kept and rejected
// by reason, date span and counts per month (empty months included), narrative length
// distribution, share of exact-duplicate narratives, common opening words and bigrams,
// words found in a large share of narratives (stopword candidates), the values of the
// group columns, and passed-through columns that could serve as groups (2 to 50
// distinct values, at most a tenth empty).
package intake
