package main

import (
	"fmt"
	"math"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"mgorbit/kernels"
	"mgorbit/scenarios"
)

func newScenariosCmd() *cobra.Command {
	return &cobra.Command{
		Use:   "scenarios [NAME]",
		Short: "List the built-in scenarios, or print one as TOML",
		Example: `  mgorbit scenarios                 # list
  mgorbit scenarios aster-gr > my.toml  # start your own from a built-in`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			w := cmd.OutOrStdout()
			if len(args) == 1 {
				text, err := scenarios.BuiltinText(args[0])
				if err != nil {
					return inputError{err}
				}
				fmt.Fprint(w, text)
				return nil
			}
			tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
			for _, name := range scenarios.BuiltinNames() {
				sc, err := scenarios.Builtin(name)
				if err != nil {
					return err
				}
				mark := ""
				if name == scenarios.DefaultName {
					mark = " (default)"
				}
				fmt.Fprintf(tw, "%s%s\t%s\t%s\n", name, mark, sc.Stack, firstLine(sc.Description))
			}
			return tw.Flush()
		},
	}
}

func firstLine(s string) string {
	s = strings.TrimSpace(s)
	if i := strings.IndexByte(s, '\n'); i >= 0 {
		return s[:i]
	}
	return s
}

func newKernelsCmd() *cobra.Command {
	return &cobra.Command{
		Use:     "kernels",
		Short:   "List the force kernels with their parameters, units, ranges and which mu each takes",
		Example: `  mgorbit kernels`,
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			w := cmd.OutOrStdout()
			for _, info := range kernels.All() {
				vd := ""
				if info.VelocityDependent {
					vd = ", velocity-dependent"
				}
				fmt.Fprintf(w, "%s (%s%s)\n  %s\n  mu: %s\n", info.Name, info.Role, vd, info.Summary, info.Mu)
				if len(info.Params) > 0 {
					tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
					for _, p := range info.Params {
						def := "required"
						switch {
						case p.Kind == kernels.Choice && !p.Required:
							def = "default " + p.DefaultChoice
						case !p.Required && math.IsNaN(p.Default):
							def = "optional"
						case !p.Required:
							def = fmt.Sprintf("default %g", p.Default)
						}
						unit := p.Unit
						switch {
						case p.Kind == kernels.Choice:
							unit = "choice"
						case unit == "":
							unit = p.Dim.String()
						}
						fmt.Fprintf(tw, "    %s\t%s\t%s\t%s\t%s\n", p.Name, unit, p.Range(), def, p.Doc)
					}
					tw.Flush()
				}
				fmt.Fprintln(w)
			}
			return nil
		},
	}
}
