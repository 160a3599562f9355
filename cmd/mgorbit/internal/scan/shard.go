package scan

import (
	"fmt"
	"io"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"github.com/parquet-go/parquet-go"
)

// PartPath is shard sh's part file beside out: scan.parquet ->
// scan.part-2-of-4.parquet.
func PartPath(out string, sh Shard) string {
	return fmt.Sprintf("%s.part-%d-of-%d.parquet", strings.TrimSuffix(out, ".parquet"), sh.K, sh.N)
}

// PartGlob matches every part file of out's scan.
func PartGlob(out string) string {
	return strings.TrimSuffix(out, ".parquet") + ".part-*-of-*.parquet"
}

// ShardFromEnv reads the shard of a Slurm array task: SLURM_ARRAY_TASK_ID
// counted from SLURM_ARRAY_TASK_MIN (1 when unset, as in the --array=1-N
// scripts EmitSlurm writes) out of SLURM_ARRAY_TASK_COUNT tasks. ok is
// false outside an array job.
func ShardFromEnv(getenv func(string) string) (sh Shard, ok bool, err error) {
	id := getenv("SLURM_ARRAY_TASK_ID")
	if id == "" {
		return Shard{}, false, nil
	}
	count := getenv("SLURM_ARRAY_TASK_COUNT")
	k, err1 := strconv.Atoi(id)
	n, err2 := strconv.Atoi(count)
	if err1 != nil || err2 != nil {
		return Shard{}, true, fmt.Errorf("Slurm array task: SLURM_ARRAY_TASK_ID=%q, SLURM_ARRAY_TASK_COUNT=%q are not whole numbers", id, count)
	}
	first := 1
	if m := getenv("SLURM_ARRAY_TASK_MIN"); m != "" {
		if first, err = strconv.Atoi(m); err != nil {
			return Shard{}, true, fmt.Errorf("Slurm array task: SLURM_ARRAY_TASK_MIN=%q is not a whole number", m)
		}
	}
	sh = Shard{K: k - first + 1, N: n}
	if err := sh.check(); err != nil {
		return Shard{}, true, fmt.Errorf("Slurm array task %d of %d (first id %d): %v; submit the array as --array=1-N with no step", k, n, first, err)
	}
	return sh, true, nil
}

// SlurmJob describes the array script EmitSlurm writes.
type SlurmJob struct {
	// Executable is the absolute path of the mgorbit binary.
	Executable string
	// Args are the scan's arguments (after "scan"), with absolute paths,
	// without any shard: each task takes its own from the environment.
	Args []string
	// Tasks is N, the number of array tasks (shards).
	Tasks int
	// CPUs per task; the task runs that many workers.
	CPUs int
	// Optional: time limit (e.g. "2:00:00"), partition, job name, log
	// directory (default the output directory), extra #SBATCH options.
	Time, Partition, Name, LogDir string
	Extra                         []string
	// Out is the scan table the parts make up, for the merge hint.
	Out string
	// Script is where the script goes, for the submit hint ("" unknown).
	Script string
}

// shellQuote quotes s for a POSIX shell.
func shellQuote(s string) string {
	if s != "" && strings.IndexFunc(s, func(r rune) bool {
		return !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || strings.ContainsRune("-_./=:,+@%", r))
	}) < 0 {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}

// EmitSlurm writes an sbatch script that runs the scan as a job array.
func EmitSlurm(w io.Writer, j SlurmJob) error {
	if j.Tasks < 1 {
		return fmt.Errorf("a job array needs at least one task")
	}
	if !filepath.IsAbs(j.Executable) {
		return fmt.Errorf("executable %q: need an absolute path", j.Executable)
	}
	if j.CPUs < 1 {
		j.CPUs = 1
	}
	if j.Name == "" {
		j.Name = "mgorbit-scan"
	}
	if j.LogDir == "" {
		j.LogDir = filepath.Dir(j.Out)
	}
	var b strings.Builder
	fmt.Fprintf(&b, "#!/bin/bash\n")
	fmt.Fprintf(&b, "# mgorbit scan as a Slurm job array of %d tasks. Task K (SLURM_ARRAY_TASK_ID,\n", j.Tasks)
	fmt.Fprintf(&b, "# from 1) computes the grid points with index i where i mod %d = K - 1 and\n", j.Tasks)
	fmt.Fprintf(&b, "# writes %s.part-K-of-%d.parquet.\n", strings.TrimSuffix(j.Out, ".parquet"), j.Tasks)
	fmt.Fprintf(&b, "# A requeued or resubmitted task resumes from its checkpoint.\n#\n")
	script := j.Script
	if script == "" {
		script = "THIS_FILE"
	}
	fmt.Fprintf(&b, "#   sbatch %s\n", shellQuote(script))
	fmt.Fprintf(&b, "#   %s merge %s   # when all tasks are done\n", shellQuote(j.Executable), shellQuote(filepath.Dir(j.Out)))
	fmt.Fprintf(&b, "#SBATCH --job-name=%s\n", j.Name)
	fmt.Fprintf(&b, "#SBATCH --array=1-%d\n", j.Tasks)
	fmt.Fprintf(&b, "#SBATCH --ntasks=1\n")
	fmt.Fprintf(&b, "#SBATCH --cpus-per-task=%d\n", j.CPUs)
	fmt.Fprintf(&b, "#SBATCH --output=%s\n", filepath.Join(j.LogDir, j.Name+"-%A_%a.out"))
	if j.Time != "" {
		fmt.Fprintf(&b, "#SBATCH --time=%s\n", j.Time)
	}
	if j.Partition != "" {
		fmt.Fprintf(&b, "#SBATCH --partition=%s\n", j.Partition)
	}
	for _, e := range j.Extra {
		fmt.Fprintf(&b, "#SBATCH %s\n", e)
	}
	fmt.Fprintf(&b, "set -euo pipefail\n")
	// One line per argument, a flag together with its value.
	args := []string{shellQuote(j.Executable) + " scan"}
	for k := 0; k < len(j.Args); k++ {
		a := shellQuote(j.Args[k])
		if strings.HasPrefix(j.Args[k], "--") && k+1 < len(j.Args) && !strings.HasPrefix(j.Args[k+1], "--") {
			k++
			a += " " + shellQuote(j.Args[k])
		}
		args = append(args, a)
	}
	// Not --quiet: the task's log gets a progress line every 10 s.
	args = append(args, `--workers "${SLURM_CPUS_PER_TASK:-1}"`, "--resume")
	fmt.Fprintf(&b, "exec %s\n", strings.Join(args, " \\\n  "))
	_, err := io.WriteString(w, b.String())
	return err
}

// Merge joins the part files of one scan into the table a single run
// writes: the same rows in the same order. Every part must come from the
// same scan split the same way, and together they must hold every point
// exactly once.
func Merge(paths []string) (*Table, error) {
	if len(paths) == 0 {
		return nil, fmt.Errorf("no part files to merge")
	}
	var parts []*Table
	for _, p := range paths {
		t, err := ReadTable(p)
		if err != nil {
			return nil, err
		}
		if t.Meta[MetaHash] == "" {
			return nil, fmt.Errorf("%s is not a scan table (no %s in its metadata)", p, MetaHash)
		}
		parts = append(parts, t)
	}
	first := parts[0]
	shards := map[int]string{}
	var n int
	workers := map[int]string{}
	for i, t := range parts {
		if t.Meta[MetaHash] != first.Meta[MetaHash] {
			return nil, fmt.Errorf("%s and %s come from different scans", paths[0], paths[i])
		}
		if !parquet.SameNodes(t.Schema, first.Schema) {
			return nil, fmt.Errorf("%s and %s have different columns", paths[0], paths[i])
		}
		sh, err := ParseShard(t.Meta[MetaShard])
		if err != nil {
			return nil, fmt.Errorf("%s: %v", paths[i], err)
		}
		if i == 0 {
			n = sh.N
		}
		if sh.N != n {
			return nil, fmt.Errorf("%s is shard %s but %s is of %d shards: merge the parts of one split", paths[i], sh, paths[0], n)
		}
		if prev, dup := shards[sh.K]; dup {
			return nil, fmt.Errorf("shard %s appears twice: %s and %s", sh, prev, paths[i])
		}
		shards[sh.K] = paths[i]
		workers[sh.K] = t.Meta[MetaWorkers]
	}
	var missing []string
	for k := 1; k <= n; k++ {
		if _, ok := shards[k]; !ok {
			missing = append(missing, fmt.Sprintf("%d/%d", k, n))
		}
	}
	if len(missing) > 0 {
		return nil, fmt.Errorf("missing shards %s (have %d of %d part files)", strings.Join(missing, ", "), len(parts), n)
	}
	total, _ := strconv.Atoi(first.Meta["mgorbit.scan.points"])
	byPoint := map[int][]parquet.Row{}
	for _, t := range parts {
		for r := range t.Rows {
			p := t.Point(r)
			byPoint[p] = append(byPoint[p], t.Rows[r])
		}
	}
	if len(byPoint) != total {
		return nil, fmt.Errorf("the parts hold %d distinct points, the scan has %d", len(byPoint), total)
	}
	meta := map[string]string{}
	for k, v := range first.Meta {
		meta[k] = v
	}
	ks := make([]int, 0, n)
	for k := range workers {
		ks = append(ks, k)
	}
	sort.Ints(ks)
	var ws []string
	for _, k := range ks {
		ws = append(ws, workers[k])
	}
	meta[MetaShard] = fmt.Sprintf("merged %d/%d", n, n)
	meta[MetaWorkers] = strings.Join(ws, ",")
	return &Table{Schema: first.Schema, Rows: sortedRows(byPoint), Meta: meta}, nil
}

// WriteTable stores a table (a merge's result) atomically.
func WriteTable(path string, t *Table, force bool) error {
	return writeTable(path, t.Schema, t.Rows, t.Meta, force)
}
