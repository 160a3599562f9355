package report

import (
	"fmt"
	"strings"

	"mgorbit/integrator/lensing"
	"mgorbit/scenarios"
	"mgorbit/scenarios/units"
)

// DeflectionRow is what a scenario's kernel stack does to one light ray
// past one of its bodies: deflection, Shapiro delay and effective gamma
// (see package lensing). One row per impact parameter; scans may embed it.
type DeflectionRow struct {
	Scenario string  `parquet:"scenario" json:"scenario"`
	Kernels  string  `parquet:"kernel_stack" json:"kernel_stack"`
	Source   string  `parquet:"deflection_source" json:"deflection_source"`
	Mu       float64 `parquet:"deflection_source_mu_m3_per_s2" json:"deflection_source_mu_m3_per_s2"`
	// MuMeaning says which mu the stack's kernels take (their Info.Mu).
	MuMeaning string  `parquet:"deflection_mu_meaning" json:"deflection_mu_meaning"`
	B         float64 `parquet:"impact_parameter_m" json:"impact_parameter_m"`
	Emitter   float64 `parquet:"emitter_distance_m" json:"emitter_distance_m"`
	Receiver  float64 `parquet:"receiver_distance_m" json:"receiver_distance_m"`

	Angle              float64 `parquet:"deflection_rad" json:"deflection_rad"`
	AngleArcsec        float64 `parquet:"deflection_arcsec" json:"deflection_arcsec"`
	AngleBeyond        float64 `parquet:"deflection_corrections_rad" json:"deflection_corrections_rad"`
	AngleGR            float64 `parquet:"deflection_gr_rad" json:"deflection_gr_rad"`
	RatioToGR          float64 `parquet:"deflection_ratio_to_gr" json:"deflection_ratio_to_gr"`
	MuDynamical        float64 `parquet:"mu_dynamical_at_b_m3_per_s2" json:"mu_dynamical_at_b_m3_per_s2"`
	RatioToGRDynamical float64 `parquet:"deflection_ratio_to_gr_dynamical_mu" json:"deflection_ratio_to_gr_dynamical_mu"`

	Shapiro       float64 `parquet:"shapiro_delay_s" json:"shapiro_delay_s"`
	ShapiroBeyond float64 `parquet:"shapiro_delay_corrections_s" json:"shapiro_delay_corrections_s"`
	ShapiroGR     float64 `parquet:"shapiro_delay_gr_s" json:"shapiro_delay_gr_s"`

	GammaPotentials         float64 `parquet:"gamma_potentials" json:"gamma_potentials"`
	GammaPotentialsMinusOne float64 `parquet:"gamma_potentials_minus_1" json:"gamma_potentials_minus_1"`
	GammaDeflection         float64 `parquet:"gamma_deflection" json:"gamma_deflection"`
	GammaDeflectionMinusOne float64 `parquet:"gamma_deflection_minus_1" json:"gamma_deflection_minus_1"`
	// Notes flag rays the weak-field, point-mass model does not describe.
	Notes string `parquet:"notes" json:"notes"`
}

// weakFieldLimit is the largest 2 mu/(c^2 b) for which first-order light
// bending is quoted without a note: the next order changes the angle by a
// fraction of about mu/(c^2 b) (common practice).
const weakFieldLimit = 1e-3

// DeflectionSource returns the body light passes: the one named, or the
// first massive body of the scenario.
func DeflectionSource(sc *scenarios.Scenario, name string) (scenarios.Body, error) {
	var names []string
	for _, b := range sc.Bodies {
		if name == "" && b.GM > 0 {
			return b, nil
		}
		if b.Name == name {
			if !(b.GM > 0) {
				return b, fmt.Errorf("body %s is a test body: it bends no light", name)
			}
			return b, nil
		}
		names = append(names, b.Name)
	}
	if name == "" {
		return scenarios.Body{}, fmt.Errorf("%s has no massive body to bend light", sc.Source)
	}
	return scenarios.Body{}, fmt.Errorf("no body %q (bodies: %s)", name, strings.Join(names, ", "))
}

// MuMeaning joins the stack's kernels' statements of which mu they take.
func MuMeaning(sc *scenarios.Scenario) string {
	st := sc.Stack
	parts := []string{st.Base.Info().Name + ": " + st.Base.Info().Mu}
	for _, c := range st.Corrections {
		parts = append(parts, c.Info().Name+": "+c.Info().Mu)
	}
	return strings.Join(parts, "; ")
}

// Deflection computes one row: the scenario's stack acting from the body
// named source ("" for the first massive one) on the ray. Emitter and
// Receiver of 0 mean lensing.DefaultPathFactor impact parameters.
func Deflection(sc *scenarios.Scenario, source string, ray lensing.Ray) (DeflectionRow, error) {
	body, err := DeflectionSource(sc, source)
	if err != nil {
		return DeflectionRow{}, err
	}
	if ray.Emitter == 0 {
		ray.Emitter = lensing.DefaultPathFactor * ray.B
	}
	if ray.Receiver == 0 {
		ray.Receiver = lensing.DefaultPathFactor * ray.B
	}
	res, err := lensing.Compute(sc.Stack, body.GM, ray)
	if err != nil {
		return DeflectionRow{}, err
	}
	var notes []string
	if rg := 2 * body.GM / (units.C * units.C * ray.B); rg > weakFieldLimit {
		notes = append(notes, fmt.Sprintf("2 mu/(c^2 b) = %.3g: the weak field does not hold, the numbers are first order in mu/(c^2 b)", rg))
	}
	if body.Radius > 0 && ray.B < body.Radius {
		notes = append(notes, fmt.Sprintf("b is inside %s (radius %.4g m): the ray crosses the body, whose field there is not a point mass's", body.Name, body.Radius))
	}
	return DeflectionRow{
		Notes:    strings.Join(notes, "; "),
		Scenario: sc.Name, Kernels: sc.Stack.String(), Source: body.Name, Mu: body.GM, MuMeaning: MuMeaning(sc),
		B: ray.B, Emitter: ray.Emitter, Receiver: ray.Receiver,
		Angle: res.Angle, AngleArcsec: res.Angle * units.ArcsecPerRad, AngleBeyond: res.AngleBeyond,
		AngleGR: res.AngleGR, RatioToGR: res.RatioToGR,
		MuDynamical: res.MuDynamical, RatioToGRDynamical: res.RatioToGRDynamical,
		Shapiro: res.Shapiro, ShapiroBeyond: res.ShapiroBeyond, ShapiroGR: res.ShapiroGR,
		GammaPotentials: res.GammaPotentials, GammaPotentialsMinusOne: res.GammaPotentialsMinusOne,
		GammaDeflection: res.GammaDeflection, GammaDeflectionMinusOne: res.GammaDeflectionMinusOne,
	}, nil
}
