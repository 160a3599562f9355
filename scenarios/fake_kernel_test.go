package scenarios

import (
	"math"

	"mgorbit/kernels"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios/units"
)

// fakeKernel exists only to exercise parameter parsing: a Length, a Choice,
// an Integer+AllowInf and a bounded dimensionless parameter. Its force is
// zero.
type fakeKernel struct{ v kernels.Values }

var fakeInfo = kernels.Info{
	Name:    "test-fake",
	Role:    kernels.Correction,
	Summary: "parameter-parsing test kernel, no force",
	Mu:      "G M",
	Params: []kernels.Param{
		{Name: "range", Kind: kernels.Number, Dim: units.Length, Unit: "au", Required: true,
			Min: 0, MinOpen: true, Max: math.Inf(1)},
		{Name: "branch", Kind: kernels.Choice, Choices: []string{"+1", "-1"}, DefaultChoice: "+1"},
		{Name: "levels", Kind: kernels.Number, Dim: units.Dimensionless, Integer: true, AllowInf: true,
			Min: 1, Max: math.Inf(1), Default: math.Inf(1)},
		{Name: "strength", Kind: kernels.Number, Dim: units.Dimensionless, Min: -1, Max: 1, Default: 0},
	},
}

func init() {
	kernels.Register(fakeInfo, func(v kernels.Values) (kernels.Kernel, error) { return fakeKernel{v}, nil })
}

func (fakeKernel) Info() kernels.Info                    { return fakeInfo }
func (f fakeKernel) Values() kernels.Values              { return f.v }
func (fakeKernel) Accel(mu float64, x, v vec.V) vec.V    { return vec.V{} }
func (fakeKernel) Energy(mu float64, x, v vec.V) float64 { return 0 }
