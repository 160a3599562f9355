package main

import (
	"encoding/json"
	"fmt"
	"os"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"mgorbit/cmd/mgorbit/internal/report"
	"mgorbit/cmd/mgorbit/internal/table"
	"mgorbit/integrator/lensing"
	"mgorbit/scenarios/units"
)

func newDeflectionCmd() *cobra.Command {
	var impacts []string
	var source, emitter, receiver, out string
	var asJSON, force bool
	cmd := &cobra.Command{
		Use:   "deflection [SCENARIO] --impact B [--impact B ...]",
		Short: "Light deflection, Shapiro delay and effective PPN gamma of a scenario's kernel stack",
		Long: `Send light past one body of a scenario (default: the first massive one) at
each impact parameter and report what the scenario's kernel stack does to it:
the deflection angle, its ratio to general relativity's 4 mu/(c^2 b), the
Shapiro delay from emitter to receiver, and the effective PPN gamma from the
metric potentials at r = b (Psi/Phi) and from the deflection.

Light sees Phi + Psi, orbits see Phi: each kernel declares what it exchanges
(mgorbit kernels). A scalar force (yukawa by default, vainshtein, the scalar
modes of tower and crossover) does not bend light; a tensor Yukawa term adds
to both potentials; massive spin-2 fields (massive-graviton, spin2 modes)
have Psi = Phi/2. Both base laws give general relativity's light bending.

Two ratios to GR are given, because kernels differ in what their mu is:
with the body's mu as the scenario gives it, and with the mu an orbit at
r = b measures (b^2 dPhi/dr). gamma from the deflection uses the second, so
that it compares with light-bending bounds such as gamma - 1 =
(2.1 +- 2.3)e-5 (Bertotti, Iess & Tortora 2003).

The delay runs along the straight ray from the emitter to the receiver, each
--emitter / --receiver from the point of closest approach (default 1000 b
each: the delay grows as ln of the path, so it needs a finite one).`,
		Example: `  mgorbit deflection my-system.toml --impact "1.6 Rsun"
  mgorbit deflection lumen-lens --impact "1 au" --impact "10 au" --json
  mgorbit deflection lumen-lens --impact "0.01 pc" --emitter "1 kpc" --receiver "8 kpc"`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			arg := ""
			if len(args) == 1 {
				arg = args[0]
			}
			sc, err := loadScenario(arg)
			if err != nil {
				return err
			}
			if len(impacts) == 0 {
				return inputError{fmt.Errorf("give at least one impact parameter, for example --impact \"1.6 Rsun\"")}
			}
			length := func(flag, s string) (float64, error) {
				if s == "" {
					return 0, nil
				}
				x, err := units.ParseAs(s, units.Length)
				if err == nil && !(x > 0) {
					err = fmt.Errorf("must be a positive length")
				}
				if err != nil {
					return 0, inputError{fmt.Errorf("--%s %q: %v", flag, s, err)}
				}
				return x, nil
			}
			ze, err := length("emitter", emitter)
			if err != nil {
				return err
			}
			zr, err := length("receiver", receiver)
			if err != nil {
				return err
			}
			var rows []report.DeflectionRow
			for _, s := range impacts {
				b, err := length("impact", strings.TrimSpace(s))
				if err != nil {
					return err
				}
				row, err := report.Deflection(sc, source, lensing.Ray{B: b, Emitter: ze, Receiver: zr})
				if err != nil {
					return inputError{err}
				}
				rows = append(rows, row)
			}
			if out != "" {
				if _, err := os.Stat(out); err == nil && !force {
					return inputError{fmt.Errorf("%s exists; pass --force to replace it", out)}
				}
				meta := map[string]string{
					"mgorbit.version": report.Version, "mgorbit.scenario.name": sc.Name,
					"mgorbit.scenario.source": sc.Source, "mgorbit.scenario.sha256": sc.Hash,
					"mgorbit.scenario.toml": sc.Text, "mgorbit.kernel_stack": sc.Stack.String(),
				}
				if err := table.Write(out, rows, meta, force); err != nil {
					return err
				}
			}
			w := cmd.OutOrStdout()
			if asJSON {
				enc := json.NewEncoder(w)
				enc.SetIndent("", "  ")
				return enc.Encode(rows)
			}
			writeDeflection(w, sc.Stack.Carriers(), rows)
			if out != "" {
				fmt.Fprintf(w, "\nwrote %s\n", out)
			}
			return nil
		},
	}
	f := cmd.Flags()
	f.StringSliceVar(&impacts, "impact", nil, `impact parameter with a unit ("1.6 Rsun", "2 au"); repeat or separate by commas`)
	f.StringVar(&source, "source", "", "body whose field the light crosses (default: the first massive body)")
	f.StringVar(&emitter, "emitter", "", "emitter's distance along the ray from the closest point (default 1000 b)")
	f.StringVar(&receiver, "receiver", "", "receiver's distance along the ray from the closest point (default 1000 b)")
	f.StringVar(&out, "out", "", "also write the rows to this Parquet file")
	f.BoolVar(&force, "force", false, "replace an existing --out file")
	f.BoolVar(&asJSON, "json", false, "print the rows as JSON instead of the table")
	return cmd
}

func writeDeflection(w interface{ Write([]byte) (int, error) }, carriers []string, rows []report.DeflectionRow) {
	if len(rows) == 0 {
		return
	}
	r0 := rows[0]
	fmt.Fprintf(w, "%s: light past %s (mu = %.10g m^3/s^2), stack %s\n", r0.Scenario, r0.Source, r0.Mu, r0.Kernels)
	fmt.Fprintf(w, "  mu as the kernels take it: %s\n", r0.MuMeaning)
	for _, c := range carriers {
		fmt.Fprintf(w, "  exchanges: %s\n", c)
	}
	fmt.Fprintln(w)
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "b (m)\tdeflection (arcsec)\t/GR (mu given)\t/GR (mu at b)\tShapiro delay (s)\tdelay beyond GR (s)\tgamma-1 (potentials)\tgamma-1 (deflection)\t")
	for _, r := range rows {
		fmt.Fprintf(tw, "%.6g\t%.9g\t%.9g\t%.9g\t%.9g\t%.4g\t%.4g\t%.4g\t\n", r.B, r.AngleArcsec, r.RatioToGR, r.RatioToGRDynamical,
			r.Shapiro, r.ShapiroBeyond, r.GammaPotentialsMinusOne, r.GammaDeflectionMinusOne)
	}
	_ = tw.Flush()
	for _, r := range rows {
		if r.Notes != "" {
			fmt.Fprintf(w, "NOTE at b = %.6g m: %s\n", r.B, r.Notes)
		}
	}
	fmt.Fprintln(w, "\nmu at b = b^2 dPhi/dr(b), what an orbit at r = b measures. The delay runs from the emitter to the receiver")
	fmt.Fprintln(w, "(--emitter, --receiver; default 1000 b each from the closest point); --json has every value.")
}
