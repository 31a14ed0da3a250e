// Package trend turns per-narrative theme shares into monthly theme series, change flags,
// long-run trend tests and group comparisons, each with its uncertainty, and publishes
// them as tidy tables with small counts withheld.
//
// Inputs are plain: one Doc per narrative with its date, its theme-share vector θ (from
// the themes model), an optional group value and optional token counts.
//
// What the numbers are: a theme summarises what narrative writers wrote. A count, a share,
// a flag or a test result here describes the text of the narratives, not what happened;
// none of it is a finding of fact. Flags mark months worth a closer reading.
//
// Small counts can identify people: the exported tables withhold counts below a threshold
// (see Publish) and any cell that would let a withheld count be recovered by subtraction.
// Check public-records law, data-sharing terms and ethics review before publishing.
package trend
