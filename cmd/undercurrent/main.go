// Command undercurrent surveys, themes, trends and reports on collections of incident
// narratives.
package main

import (
	"fmt"
	"os"
)

func main() {
	fmt.Fprintln(os.Stderr, "undercurrent: under construction")
	os.Exit(1)
}
