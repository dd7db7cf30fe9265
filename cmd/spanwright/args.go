package main

import (
	"strings"

	"github.com/urfave/cli/v2"
)

// intersperse moves a command's flags ahead of its positional arguments, so that
// `spanwright plan PLAN.yaml --out DIR` parses as users expect (urfave/cli v2 stops reading
// flags at the first positional argument). A lone "--" ends the flags as usual.
func intersperse(app *cli.App, args []string) []string {
	if len(args) < 2 {
		return args
	}
	var cmd *cli.Command
	i := 1
	for ; i < len(args); i++ {
		if c := app.Command(args[i]); c != nil {
			cmd = c
			break
		}
		if !strings.HasPrefix(args[i], "-") {
			return args
		}
	}
	if cmd == nil {
		return args
	}
	takesValue := map[string]bool{}
	for _, f := range cmd.Flags {
		_, isBool := f.(*cli.BoolFlag)
		for _, n := range f.Names() {
			takesValue[n] = !isBool
		}
	}
	out := append([]string{}, args[:i+1]...)
	var flags, pos []string
	rest := args[i+1:]
	for j := 0; j < len(rest); j++ {
		a := rest[j]
		if a == "--" {
			pos = append(pos, rest[j:]...)
			break
		}
		if strings.HasPrefix(a, "-") && a != "-" {
			flags = append(flags, a)
			name := strings.TrimLeft(a, "-")
			if !strings.Contains(name, "=") && takesValue[name] && j+1 < len(rest) {
				j++
				flags = append(flags, rest[j])
			}
			continue
		}
		pos = append(pos, a)
	}
	return append(append(out, flags...), pos...)
}
