// Package trend turns per-narrative theme shares into monthly theme series, change flags,
// long-run trend tests and group comparisons, each with its uncertainty, and publishes
// them as tidy tables with small counts withheld.
//
// # Input
//
// One Doc per narrative: its date, its theme-share vector θ (from the themes model, one
// share per theme, summing to 1), an optional group value (district, call type, shift
// ...) and optional token counts. A narrative's dominant theme is its largest share
// (lowest index on ties).
//
// # Steps
//
//   - Monthly: per month and theme, the count of narratives whose dominant theme it is,
//     the expected count (sum of θ), the share of the month's narratives with a Wilson
//     score interval (Wilson). Months without narratives are gaps, not zeros; the first
//     and last months are marked partial when the data cover only part of them.
//   - Changes / EARS / FarringtonLimits: months whose share is unusually high against a
//     trailing baseline, by the EARS C1, C2 and C3 statistics (Hutwagner et al. 2003) on
//     monthly shares, and months whose count is above a seasonal quasi-Poisson limit
//     with the month's total as exposure (Farrington et al. 1996); each flag with a
//     plain-words explanation.
//   - Poisson, MannKendallShare: long-run trend of a theme, as a rate ratio per year
//     from a Poisson regression with the month's total as exposure (Wald,
//     likelihood-ratio and quasi-Poisson tests) and as the Mann–Kendall test with the
//     Theil–Sen slope of the share.
//   - Groups / ChiSquareTest: shares per group with Wilson intervals, each group's
//     difference from the rest with Newcombe's hybrid score interval (NewcombeDiff);
//     Pearson's chi-square test of group × dominant theme with adjusted standardised
//     residuals (Agresti) marking cells that stand out, Bonferroni-adjusted by default.
//   - LogOdds / GroupWords: words distinctive of one group against another or against
//     the rest, by weighted log-odds with an informative Dirichlet prior (Monroe,
//     Colaresi & Quinn 2008).
//   - SeriesTable, FlagTable, TrendTable, GroupTable.Table, GroupTestTable, WordTable:
//     tidy long tables, written by WriteFiles (CSV with JSON beside it) or
//     Table.WriteCSV/WriteJSON. Their column names are documented on each function.
//
// Formulas, sources and thresholds are in the doc comment of each function or type.
// Where a value or attribution is from memory the comment says so.
//
// # What the numbers are
//
// A theme summarises what narrative writers wrote. A count, a share, a flag or a test
// result here describes the text of the narratives, not what happened; none of it is a
// finding of fact. Flags mark months worth a closer reading.
//
// # Small counts
//
// Small counts can identify people: the tables withhold counts below a threshold (10 by
// default) and any number that would let a withheld count be recovered by subtraction
// (see Publish). Tables with everything shown can be written only to a file whose name
// contains "private". Check public-records law, data-sharing terms and ethics review
// before publishing, and ask counsel where the narratives concern identifiable people.
//
// # Determinism
//
// Output depends only on the input and settings: groups and words are sorted, floats
// are formatted with 6 decimals, and no map order reaches the output. Sums over
// narratives follow the order of the docs slice.
package trend
