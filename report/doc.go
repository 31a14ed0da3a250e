// Package report renders the offline community-review HTML report and its tidy exports.
package report
