package main

import (
	"fmt"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"mgorbit/cmd/mgorbit/internal/plot"
	"mgorbit/cmd/mgorbit/internal/scan"
)

func newPlotCmd() *cobra.Command {
	var fig plot.Figure
	var out string
	var bounds []float64
	var boundLabels []string
	var reference string
	cmd := &cobra.Command{
		Use:   "plot SCAN.parquet... [--x COLUMN] [--y COLUMN]",
		Short: "Draw a scan table (PNG or SVG) without recomputing it",
		Long: `Draw one column of a scan table against another: one curve per value of
--group (and per body when there are several), error bars from the matching
*_integration_error_* column, the semi-analytic counterpart as a dashed line
(--reference), logarithmic axes where the swept grid was
logarithmic (--log-x/--log-y on|off|auto), and horizontal --bound lines such
as a measured limit. Several files (the part files of a sharded scan) are
read as one table. The format follows --out: .png, .svg (or .pdf).
Defaults: x the first swept axis (in the unit it was written in), y the
anomaly per century (else the precession per century).`,
		Example: `  mgorbit plot mgorbit-scan/scan.parquet --out lambda.svg
  mgorbit plot scan.parquet --x sweep_kernel_yukawa_lambda_au --y anomaly_arcsec_per_century --bound 0.003
  mgorbit plot scan.parquet --x sweep_body_tiber_e --group sweep_body_aster_mass_Msun`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			t, err := readScanFiles(args)
			if err != nil {
				return inputError{err}
			}
			for k, b := range bounds {
				bd := plot.Bound{Value: b}
				if k < len(boundLabels) {
					bd.Label = boundLabels[k]
				}
				fig.Bounds = append(fig.Bounds, bd)
			}
			if out == "" {
				out = strings.TrimSuffix(args[0], filepath.Ext(args[0])) + ".png"
			}
			switch strings.ToLower(filepath.Ext(out)) {
			case ".png", ".svg", ".pdf", ".eps", ".jpg", ".jpeg", ".tif", ".tiff":
			default:
				return inputError{fmt.Errorf("--out %s: the format follows the extension: .png or .svg (or .pdf)", out)}
			}
			for _, c := range []string{fig.LogX, fig.LogY} {
				if c != plot.Auto && c != plot.On && c != plot.Off {
					return inputError{fmt.Errorf("log axis choice %q: auto, on or off", c)}
				}
			}
			if fig.Y == "" {
				fig.Y = plot.DefaultY(t)
			}
			switch reference {
			case "auto":
				fig.Reference = plot.DefaultReference(t, fig.Y)
			case "none":
			default:
				fig.Reference = reference
			}
			d, err := plot.Draw(t, fig, out)
			if err != nil {
				return inputError{err}
			}
			fmt.Fprintf(cmd.OutOrStdout(), "drew %s: %s%s\n", out, drawnCount(d), logNote(d))
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&fig.X, "x", "", "column for the x axis (default: the first swept axis)")
	f.StringVar(&fig.Y, "y", "", "column for the y axis (default: anomaly, else precession, per century)")
	f.StringVar(&fig.Group, "group", "", "one curve per value of this column (e.g. the second swept axis)")
	f.StringVar(&fig.Body, "body", "", "only this body's rows")
	f.StringVar(&fig.LogX, "log-x", plot.Auto, "logarithmic x axis: auto (where the grid is logarithmic), on or off")
	f.StringVar(&fig.LogY, "log-y", plot.Auto, "logarithmic y axis: auto (x logarithmic and y spanning over a factor 10), on or off")
	f.Float64SliceVar(&bounds, "bound", nil, "horizontal line at this y value (repeatable), e.g. a measured limit")
	f.StringArrayVar(&boundLabels, "bound-label", nil, "legend text of each --bound, in order")
	f.StringVar(&reference, "reference", "auto", "column drawn dashed beside each curve; auto: the semi-analytic counterpart of --y when the table has it; none")
	f.StringVar(&fig.Title, "title", "", "figure title")
	f.BoolVar(&fig.NoErrors, "no-errors", false, "leave out the error bars")
	f.StringVar(&out, "out", "", "figure file, .png or .svg (default: the first table's name with .png)")
	return cmd
}

// readScanFiles reads one scan table, or merges the part files of one.
func readScanFiles(paths []string) (*scan.Table, error) {
	var files []string
	for _, p := range paths {
		m, err := filepath.Glob(p)
		if err != nil {
			return nil, err
		}
		if len(m) == 0 {
			return nil, fmt.Errorf("%s: no such file", p)
		}
		files = append(files, m...)
	}
	if len(files) == 1 {
		return scan.ReadTable(files[0])
	}
	return scan.Merge(files)
}
