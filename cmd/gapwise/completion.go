package main

import (
	"io"

	"github.com/spf13/cobra"
)

// newCompletionCmd builds `gapwise completion SHELL`, which prints a
// completion script for bash, zsh, fish or PowerShell (cobra's generators).
func newCompletionCmd(stdout io.Writer) *cobra.Command {
	return &cobra.Command{
		Use:   "completion bash|zsh|fish|powershell",
		Short: "Print a shell completion script",
		Long: `completion prints a script that makes the shell complete gapwise's
commands and flags. Load it for the current session, e.g. in bash:

  source <(gapwise completion bash)

or save it where the shell looks for completions (for zsh, a file named
_gapwise in a folder on $fpath; for fish, ~/.config/fish/completions/gapwise.fish).`,
		Args:      cobra.ExactArgs(1),
		ValidArgs: []string{"bash", "zsh", "fish", "powershell"},
		RunE: func(cmd *cobra.Command, args []string) error {
			root := cmd.Root()
			switch args[0] {
			case "bash":
				return root.GenBashCompletionV2(stdout, true)
			case "zsh":
				return root.GenZshCompletion(stdout)
			case "fish":
				return root.GenFishCompletion(stdout, true)
			case "powershell":
				return root.GenPowerShellCompletionWithDesc(stdout)
			}
			return wrapRun(&usageError{"completion: unknown shell " + args[0] + " (want bash, zsh, fish or powershell)"})
		},
	}
}
