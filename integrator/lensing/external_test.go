package lensing

import (
	"encoding/json"
	"math"
	"os/exec"
	"strconv"
	"strings"
	"testing"

	"mgorbit/kernels"
	"mgorbit/scenarios/units"
	"mgorbit/testdata/external"
)

// k1Script prints, for each u on stdin, SciPy's K_1(u) and mpmath's
// u K_1(u) - 1 at 40 digits (the latter is the massive graviton's excess
// over general relativity, which cancels in float64 near u = 0).
const k1Script = `
import sys, json
import mpmath as mp
from scipy.special import k1
mp.mp.dps = 40
us = [float(l) for l in sys.stdin if l.strip()]
json.dump({"k1": [float(k1(u)) for u in us],
           "excess": [float(mp.mpf(u) * mp.besselk(1, mp.mpf(u)) - 1) for u in us]}, sys.stdout)
`

func TestExternalDeflectionBessel(t *testing.T) {
	py := external.Python(t)
	var us []float64
	for i := 0; i <= 40; i++ {
		us = append(us, 1e-6*math.Pow(6e7, float64(i)/40)) // 1e-6 .. 60
	}
	var in strings.Builder
	for _, u := range us {
		in.WriteString(strconv.FormatFloat(u, 'g', -1, 64) + "\n")
	}
	cmd := exec.Command(py, "-c", k1Script)
	cmd.Stdin = strings.NewReader(in.String())
	var stderr strings.Builder
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("SciPy script: %v\n%s", err, stderr.String())
	}
	var ref struct{ K1, Excess []float64 }
	if err := json.Unmarshal(out, &ref); err != nil || len(ref.K1) != len(us) || len(ref.Excess) != len(us) {
		t.Fatalf("SciPy output: %v", err)
	}
	const mu, lambda = units.GMSun, 1e11
	y, _ := kernels.New("yukawa", kernels.Values{Num: map[string]float64{"alpha": 1, "lambda": lambda}, Str: map[string]string{"exchange": "tensor"}})
	g, _ := kernels.New("massive-graviton", kernels.Values{Num: map[string]float64{"lambda": lambda}})
	tensor := kernels.MustStack(kernels.Newton{}, y)
	massive := kernels.MustStack(kernels.Newton{}, g)
	worstK1, worstExcess := 0.0, 0.0
	for i, u := range us {
		b := u * lambda
		_, beyond, err := Deflection(tensor, mu, b)
		if err != nil {
			t.Fatal(err)
		}
		k1 := beyond / (DeflectionGR(mu, b) * u)
		e := math.Abs(k1/ref.K1[i] - 1)
		worstK1 = math.Max(worstK1, e)
		if e > 1e-12 {
			t.Errorf("u = %g: K_1 from the tensor Yukawa deflection %.16g, SciPy %.16g (rel %.2g)", u, k1, ref.K1[i], e)
		}
		// coupling-fixed massive graviton: theta = GR (u K_1(u)); its part
		// beyond GR is u K_1(u) - 1, kept to its own relative precision
		_, beyond, _ = Deflection(massive, mu, b)
		excess := beyond / DeflectionGR(mu, b)
		e = math.Abs(excess/ref.Excess[i] - 1)
		worstExcess = math.Max(worstExcess, e)
		if e > 1e-12 {
			t.Errorf("u = %g: massive graviton's deflection beyond GR %.16g of GR, mpmath u K_1(u) - 1 = %.16g (rel %.2g)", u, excess, ref.Excess[i], e)
		}
	}
	t.Logf("largest relative error against SciPy's K_1: %.2g; of the massive graviton's excess against mpmath: %.2g", worstK1, worstExcess)
}
