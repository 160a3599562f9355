package main

import (
	"fmt"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"mgorbit/cmd/mgorbit/internal/scan"
)

func newMergeCmd() *cobra.Command {
	var out string
	var force bool
	cmd := &cobra.Command{
		Use:   "merge PART.parquet... | DIR",
		Short: "Join the part files of a sharded scan into scan.parquet",
		Long: `Join the part files that the shards of one scan wrote (mgorbit scan --shard K/N,
or the tasks of a Slurm array) into the table a single run writes: the same
rows in the same order. Every part must belong to the same scan and split,
and together they must hold every point once. Given a directory, merge takes
its scan.part-*-of-*.parquet files and writes DIR/scan.parquet.`,
		Example: `  mgorbit merge mgorbit-scan
  mgorbit merge 'results/scan.part-*-of-16.parquet' --out results/scan.parquet`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			var files []string
			for _, a := range args {
				pattern := a
				if info, err := os.Stat(a); err == nil && info.IsDir() {
					pattern = scan.PartGlob(filepath.Join(a, "scan.parquet"))
					if out == "" {
						out = filepath.Join(a, "scan.parquet")
					}
				}
				m, err := filepath.Glob(pattern)
				if err != nil {
					return inputError{err}
				}
				if len(m) == 0 {
					return inputError{fmt.Errorf("%s: no part files", a)}
				}
				files = append(files, m...)
			}
			if out == "" {
				return inputError{fmt.Errorf("give --out for the merged table")}
			}
			t, err := scan.Merge(files)
			if err != nil {
				return inputError{err}
			}
			if err := scan.WriteTable(out, t, force); err != nil {
				return err
			}
			fmt.Fprintf(cmd.OutOrStdout(), "merged %d part files into %s: %d rows\n", len(files), out, len(t.Rows))
			return nil
		},
	}
	cmd.Flags().StringVar(&out, "out", "", "merged table (default DIR/scan.parquet when a directory is given)")
	cmd.Flags().BoolVar(&force, "force", false, "replace an existing merged table")
	return cmd
}
