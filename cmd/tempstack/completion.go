package main

import (
	"fmt"

	"github.com/urfave/cli/v2"
)

// Shell completion: the app is built with EnableBashCompletion, so
// `tempstack [words] --generate-bash-completion` prints the commands or
// flags that may follow the words. The scripts below ask it at each TAB and
// fall back to file names (scenario files) when it offers nothing.

const bashCompletion = `# bash completion for tempstack.
# Load it with:  source <(tempstack completion bash)
# or save it as ~/.local/share/bash-completion/completions/tempstack
_tempstack_complete() {
  local cur="${COMP_WORDS[COMP_CWORD]}"
  local words=("${COMP_WORDS[@]:0:COMP_CWORD}")
  local opts
  if [[ "$cur" == -* ]]; then
    # A lone "--" would end the flags and be taken as a file: ask with "-".
    local ask="$cur"
    [[ "$ask" == "--" ]] && ask="-"
    opts=$("${words[@]}" "$ask" --generate-bash-completion 2>/dev/null)
  else
    opts=$("${words[@]}" --generate-bash-completion 2>/dev/null)
  fi
  COMPREPLY=($(compgen -W "$opts" -- "$cur"))
}
complete -o bashdefault -o default -F _tempstack_complete tempstack
`

const zshCompletion = `#compdef tempstack
# zsh completion for tempstack.
# Load it with:  source <(tempstack completion zsh)   (after compinit)
# or save it as _tempstack in a folder of $fpath
_tempstack() {
  local -a opts
  local cur=${words[CURRENT]}
  if [[ "$cur" == -* ]]; then
    # A lone "--" would end the flags and be taken as a file: ask with "-".
    local ask=$cur
    [[ "$ask" == "--" ]] && ask="-"
    opts=("${(@f)$(${words[1,CURRENT-1]} $ask --generate-bash-completion 2>/dev/null)}")
  else
    opts=("${(@f)$(${words[1,CURRENT-1]} --generate-bash-completion 2>/dev/null)}")
  fi
  if [[ -n "${opts[1]}" ]]; then
    _describe 'tempstack' opts
  else
    _files
  fi
}
if (( $+functions[compdef] )); then
  compdef _tempstack tempstack
fi
`

func completionCommand() *cli.Command {
	return &cli.Command{
		Name:      "completion",
		Usage:     "print a shell completion script (bash or zsh)",
		ArgsUsage: "bash|zsh",
		Description: "Prints a script that completes commands and flags at the TAB key.\n" +
			"Load it with `source <(tempstack completion bash)` (zsh: after compinit).",
		OnUsageError: usageError,
		Action: func(c *cli.Context) error {
			if c.NArg() != 1 {
				return userErr("completion needs one shell: bash or zsh")
			}
			switch shell := c.Args().First(); shell {
			case "bash":
				_, err := fmt.Fprint(c.App.Writer, bashCompletion)
				return err
			case "zsh":
				_, err := fmt.Fprint(c.App.Writer, zshCompletion)
				return err
			default:
				return userErr("no completion script for %q; use bash or zsh", shell)
			}
		},
	}
}
