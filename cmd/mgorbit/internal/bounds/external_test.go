package bounds

import (
	"encoding/json"
	"math"
	"os/exec"
	"path/filepath"
	"testing"

	"mgorbit/cmd/mgorbit/internal/scan"
	"mgorbit/testdata/external"
)

// quantileScript prints SciPy's normal and chi-square quantiles for the
// levels and degrees of freedom tested.
const quantileScript = `
import json
from scipy.stats import norm, chi2
cls = [0.5, 0.68, 0.6826894921370859, 0.9, 0.95, 0.99, 0.999]
json.dump({"cl": cls,
           "two_sided": [norm.ppf((1 + c) / 2) for c in cls],
           "one_sided": [norm.ppf(c) for c in cls],
           "chi2": [[chi2.ppf(c, n) for c in cls] for n in range(1, 6)]}, open(1, "w"))
`

// Our quantiles (gonum's distuv) against SciPy's at every level and for
// one to five degrees of freedom.
func TestExternalQuantilesAgainstSciPy(t *testing.T) {
	py := external.Python(t)
	out, err := exec.Command(py, "-c", quantileScript).Output()
	if err != nil {
		t.Fatalf("SciPy: %v", err)
	}
	var ref struct {
		CL       []float64   `json:"cl"`
		TwoSided []float64   `json:"two_sided"`
		OneSided []float64   `json:"one_sided"`
		Chi2     [][]float64 `json:"chi2"`
	}
	if err := json.Unmarshal(out, &ref); err != nil || len(ref.CL) == 0 || len(ref.Chi2) != 5 {
		t.Fatalf("SciPy output %s: %v", out, err)
	}
	for i, cl := range ref.CL {
		if got := TwoSidedK(cl); math.Abs(got/ref.TwoSided[i]-1) > 1e-12 {
			t.Errorf("two-sided k at %g: %.16g, SciPy %.16g", cl, got, ref.TwoSided[i])
		}
		if got := OneSidedZ(cl); math.Abs(got-ref.OneSided[i]) > 1e-12 {
			t.Errorf("one-sided z at %g: %.16g, SciPy %.16g", cl, got, ref.OneSided[i])
		}
		for n := 1; n <= 5; n++ {
			if got := ChiSquareThreshold(n, cl); math.Abs(got/ref.Chi2[n-1][i]-1) > 1e-10 {
				t.Errorf("chi-square quantile, %d dof at %g: %.16g, SciPy %.16g", n, cl, got, ref.Chi2[n-1][i])
			}
		}
	}
}

// DuckDB (an independent Parquet reader) reads a judged table: the added
// columns with their types, NULLs where a point is undetermined, the same
// values, and the bounds' metadata.
func TestExternalDuckDBReadsJudgedTable(t *testing.T) {
	tab, _ := runScan(t, ellipseText, scan.SemiAnalytic, "kernel.yukawa.alpha=list:1e-7,1e-5,1e-3")
	tab, err := rebuild(tab, nil, []column{{name: "probe_value", kind: optFloat, f: []float64{math.NaN(), 1, 5}}})
	if err != nil {
		t.Fatal(err)
	}
	ap := apply(t, tab, parseSet(t, "[[bound]]\nname = \"probe\"\nobservable = \"probe_value\"\nvalue = 1\nsigma = 1\n[[bound]]\nname = \"cap\"\nobservable = \"semi_analytic_anomaly_rad_per_orbit\"\nupper = 1e-4\n"))
	path := filepath.Join(t.TempDir(), "judged.parquet")
	if err := scan.WriteTable(path, ap.Table, false); err != nil {
		t.Fatal(err)
	}
	v := external.ReadDuckDB(t, path)
	at := v.ColumnIndex()
	types := map[string]string{AllowedColumn: "BOOLEAN", ExcludedByColumn: "VARCHAR", PullColumn("probe"): "DOUBLE",
		BeyondColumn("cap"): "DOUBLE", ExcludedColumn("cap"): "BOOLEAN", ChiSquareDoF: "BIGINT"}
	for name, typ := range types {
		if k, ok := at[name]; !ok || v.Columns[k].Type != typ {
			t.Errorf("DuckDB sees column %s as %v, want %s", name, v.Columns, typ)
		}
	}
	cell := func(r int, name string) string { return string(v.Rows[r][at[name]]) }
	for r, want := range []struct{ allowed, by, pull string }{{"null", `""`, "null"}, {"true", `""`, "0"}, {"false", `"probe,cap"`, "4"}} {
		if cell(r, AllowedColumn) != want.allowed || cell(r, ExcludedByColumn) != want.by || cell(r, PullColumn("probe")) != want.pull {
			t.Errorf("row %d: allowed %s, excluded_by %s, pull %s; want %+v", r, cell(r, AllowedColumn), cell(r, ExcludedByColumn), cell(r, PullColumn("probe")), want)
		}
	}
	if len(v.Files) != 1 || v.Files[0].KV[MetaRule] != "each" || v.Files[0].KV[MetaPrefix+"1.name"] != "cap" {
		t.Errorf("metadata as DuckDB reads it: %v", v.Files)
	}
}
