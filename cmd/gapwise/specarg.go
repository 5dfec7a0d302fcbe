package main

import (
	"fmt"

	"github.com/spf13/cobra"
)

// specFromArgs lets a command take its spec as --spec FILE or as its one
// argument (gapwise decompose audit.yaml), refusing both at once when
// they differ, and neither.
func specFromArgs(cmd *cobra.Command, args []string, spec *string) error {
	if len(args) == 1 {
		if *spec != "" && *spec != args[0] {
			return &usageError{fmt.Sprintf("the spec is given twice (--spec %s and %s); give it once", *spec, args[0])}
		}
		*spec = args[0]
	}
	if *spec == "" {
		return &usageError{fmt.Sprintf("no spec given: run %s --spec FILE (or %s FILE)", cmd.CommandPath(), cmd.CommandPath())}
	}
	return nil
}
