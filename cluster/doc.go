// Package cluster implements agglomerative hierarchical clustering of themes and incidents.
package cluster
