package report

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"mgorbit/cmd/mgorbit/internal/table"
	"mgorbit/integrator/study"
	"mgorbit/scenarios/units"
)

// Version is the tool's version, recorded in every output.
const Version = "0.1.0"

// SummaryRow is one row of summary.parquet: one body.
type SummaryRow struct {
	Scenario string `parquet:"scenario" json:"scenario"`
	Body     string `parquet:"body" json:"body"`
	Primary  string `parquet:"primary" json:"primary"`
	Kernels  string `parquet:"kernel_stack" json:"kernel_stack"`
	Method   string `parquet:"integrator" json:"integrator"`

	StepS         float64  `parquet:"step_s" json:"step_s"`
	StepsPerOrbit float64  `parquet:"steps_per_orbit" json:"steps_per_orbit"`
	DurationS     float64  `parquet:"duration_s" json:"duration_s"`
	MuM3PerS2     float64  `parquet:"mu_m3_per_s2" json:"mu_m3_per_s2"`
	Passages      int64    `parquet:"pericentre_passages" json:"pericentre_passages"`
	CircularOrbit bool     `parquet:"circular_orbit" json:"circular_orbit"`
	Eccentricity  float64  `parquet:"eccentricity_measured" json:"eccentricity_measured"`
	RPeriM        *float64 `parquet:"r_pericentre_m,optional" json:"r_pericentre_m"`
	RApoM         *float64 `parquet:"r_apocentre_m,optional" json:"r_apocentre_m"`
	SizeAM        *float64 `parquet:"orbit_size_a_m,optional" json:"orbit_size_a_m"`

	PrecRadPerOrbit       *float64 `parquet:"precession_rad_per_orbit,optional" json:"precession_rad_per_orbit"`
	PrecFitStdErr         *float64 `parquet:"precession_fit_stderr_rad_per_orbit,optional" json:"precession_fit_stderr_rad_per_orbit"`
	PrecIntErr            *float64 `parquet:"precession_integration_error_rad_per_orbit,optional" json:"precession_integration_error_rad_per_orbit"`
	PrecArcsecPerCentury  *float64 `parquet:"precession_arcsec_per_century,optional" json:"precession_arcsec_per_century"`
	PrecArcsecPerCentErr  *float64 `parquet:"precession_integration_error_arcsec_per_century,optional" json:"precession_integration_error_arcsec_per_century"`
	PrecDegPerYear        *float64 `parquet:"precession_deg_per_year,optional" json:"precession_deg_per_year"`
	SemiPrecRadPerOrbit   *float64 `parquet:"semi_analytic_precession_rad_per_orbit,optional" json:"semi_analytic_precession_rad_per_orbit"`
	SemiPrecArcsecPerCent *float64 `parquet:"semi_analytic_precession_arcsec_per_century,optional" json:"semi_analytic_precession_arcsec_per_century"`
	PrecMinusSemi         *float64 `parquet:"precession_minus_semi_analytic_rad_per_orbit,optional" json:"precession_minus_semi_analytic_rad_per_orbit"`

	ReferenceStack       string   `parquet:"anomaly_reference_stack" json:"anomaly_reference_stack"`
	AnomRadPerOrbit      *float64 `parquet:"anomaly_rad_per_orbit,optional" json:"anomaly_rad_per_orbit"`
	AnomIntErr           *float64 `parquet:"anomaly_integration_error_rad_per_orbit,optional" json:"anomaly_integration_error_rad_per_orbit"`
	AnomArcsecPerCentury *float64 `parquet:"anomaly_arcsec_per_century,optional" json:"anomaly_arcsec_per_century"`
	AnomArcsecPerCentErr *float64 `parquet:"anomaly_integration_error_arcsec_per_century,optional" json:"anomaly_integration_error_arcsec_per_century"`
	SemiAnomRadPerOrbit  *float64 `parquet:"semi_analytic_anomaly_rad_per_orbit,optional" json:"semi_analytic_anomaly_rad_per_orbit"`
	AnomMinusSemi        *float64 `parquet:"anomaly_minus_semi_analytic_rad_per_orbit,optional" json:"anomaly_minus_semi_analytic_rad_per_orbit"`
	SemiPath             string   `parquet:"semi_analytic_path" json:"semi_analytic_path"`

	RadialPeriodS       *float64 `parquet:"radial_period_s,optional" json:"radial_period_s"`
	RadialPeriodErrS    *float64 `parquet:"radial_period_integration_error_s,optional" json:"radial_period_integration_error_s"`
	SemiRadialPeriodS   *float64 `parquet:"semi_analytic_radial_period_s,optional" json:"semi_analytic_radial_period_s"`
	AzimuthalPeriodS    *float64 `parquet:"azimuthal_period_s,optional" json:"azimuthal_period_s"`
	AzimuthalPeriodErrS *float64 `parquet:"azimuthal_period_integration_error_s,optional" json:"azimuthal_period_integration_error_s"`
	KeplerPeriodS       *float64 `parquet:"kepler_period_at_size_s,optional" json:"kepler_period_at_size_s"`
	ShiftRadialKepler   *float64 `parquet:"period_shift_radial_vs_kepler,optional" json:"period_shift_radial_vs_kepler"`
	ShiftRadialKepErr   *float64 `parquet:"period_shift_radial_vs_kepler_integration_error,optional" json:"period_shift_radial_vs_kepler_integration_error"`
	ShiftAzimKepler     *float64 `parquet:"period_shift_azimuthal_vs_kepler,optional" json:"period_shift_azimuthal_vs_kepler"`
	ShiftRadialNewton   *float64 `parquet:"period_shift_radial_vs_newton_run,optional" json:"period_shift_radial_vs_newton_run"`

	EnergyRelErr *float64 `parquet:"energy_rel_error_max,optional" json:"energy_rel_error_max"`
	AngMomRelErr *float64 `parquet:"angular_momentum_rel_error_max,optional" json:"angular_momentum_rel_error_max"`
	// ToleranceExceeded: the energy or angular-momentum error passed the
	// tolerance (the run went on under --keep-going); the values are suspect.
	ToleranceExceeded bool   `parquet:"accuracy_tolerance_exceeded" json:"accuracy_tolerance_exceeded"`
	Notes             string `parquet:"notes" json:"notes"`
}

// TermRow is one row of terms.parquet: one stacked term's first-order
// (Gauss) part of one body's precession.
type TermRow struct {
	Scenario             string   `parquet:"scenario" json:"scenario"`
	Body                 string   `parquet:"body" json:"body"`
	Term                 string   `parquet:"term" json:"term"`
	Role                 string   `parquet:"role" json:"role"`
	AdvanceRadPerOrbit   *float64 `parquet:"advance_rad_per_orbit,optional" json:"advance_rad_per_orbit"`
	AdvanceArcsecPerCent *float64 `parquet:"advance_arcsec_per_century,optional" json:"advance_arcsec_per_century"`
	Share                *float64 `parquet:"share,optional" json:"share"`
}

// TrajectoryRow is one row of trajectory.parquet: one body at one time.
type TrajectoryRow struct {
	TimeS     float64  `parquet:"time_s"`
	Body      string   `parquet:"body,dict"`
	XM        float64  `parquet:"x_m"`
	YM        float64  `parquet:"y_m"`
	ZM        float64  `parquet:"z_m"`
	VXMPerS   float64  `parquet:"vx_m_per_s"`
	VYMPerS   float64  `parquet:"vy_m_per_s"`
	VZMPerS   float64  `parquet:"vz_m_per_s"`
	RM        float64  `parquet:"r_from_primary_m"`
	EnergyErr *float64 `parquet:"energy_rel_error,optional"`
	// ToleranceExceeded marks the samples where a breach was seen.
	ToleranceExceeded bool `parquet:"accuracy_tolerance_exceeded"`
}

var nz = table.Nullable

// Summaries builds the summary rows.
func Summaries(st *study.Study) []SummaryRow {
	su := st.Setup
	var rows []SummaryRow
	for _, s := range st.Summaries {
		semiCent := math.NaN()
		if !math.IsNaN(s.SemiPrecessionPerOrbit) {
			p := s.SemiRadialPeriod
			if math.IsNaN(p) {
				p = s.RadialPeriod
			}
			semiCent = study.PerCentury(s.SemiPrecessionPerOrbit, p)
		}
		rows = append(rows, SummaryRow{
			Scenario: st.Scenario.Name, Body: s.Body, Primary: s.Primary,
			Kernels: st.Scenario.Stack.String(), Method: su.Method,
			StepS: su.H, StepsPerOrbit: st.Period / su.H, DurationS: su.H * float64(su.Steps),
			MuM3PerS2: s.Mu, Passages: int64(s.Passages), CircularOrbit: s.Circular,
			Eccentricity: s.Eccentricity, RPeriM: nz(s.RPeri), RApoM: nz(s.RApo), SizeAM: nz(s.SizeA),
			PrecRadPerOrbit: nz(s.PrecessionPerOrbit), PrecFitStdErr: nz(s.PrecessionStdErr),
			PrecIntErr: nz(s.PrecessionIntErr), PrecArcsecPerCentury: nz(s.PrecessionPerCentury),
			PrecArcsecPerCentErr: nz(s.PrecessionPerCenturyErr),
			PrecDegPerYear:       nz(study.DegPerYear(s.PrecessionPerOrbit, s.RadialPeriod)),
			SemiPrecRadPerOrbit:  nz(s.SemiPrecessionPerOrbit), SemiPrecArcsecPerCent: nz(semiCent),
			PrecMinusSemi:   nz(s.PrecessionMinusSemi),
			ReferenceStack:  s.ReferenceStack,
			AnomRadPerOrbit: nz(s.AnomalyPerOrbit), AnomIntErr: nz(s.AnomalyIntErr),
			AnomArcsecPerCentury: nz(s.AnomalyPerCentury), AnomArcsecPerCentErr: nz(s.AnomalyPerCentErr),
			SemiAnomRadPerOrbit: nz(s.SemiAnomalyPerOrbit), AnomMinusSemi: nz(s.AnomalyMinusSemi),
			SemiPath:      s.SemiPath,
			RadialPeriodS: nz(s.RadialPeriod), RadialPeriodErrS: nz(s.RadialPeriodErr),
			SemiRadialPeriodS: nz(s.SemiRadialPeriod),
			AzimuthalPeriodS:  nz(s.AzimuthalPeriod), AzimuthalPeriodErrS: nz(s.AzimuthalPeriodErr),
			KeplerPeriodS: nz(s.KeplerPeriod), ShiftRadialKepler: nz(s.RadialShiftKepler),
			ShiftRadialKepErr: nz(s.RadialShiftKeplerErr), ShiftAzimKepler: nz(s.AzimuthalShiftKepler),
			ShiftRadialNewton: nz(s.RadialShiftNewton),
			EnergyRelErr:      nz(s.EnergyErr), AngMomRelErr: nz(s.AngMomErr),
			ToleranceExceeded: s.ToleranceExceeded,
			Notes:             s.Notes,
		})
	}
	return rows
}

// Terms builds the rows of terms.parquet: each body's precession split by
// stacked term (first order), in stack order.
func Terms(st *study.Study) []TermRow {
	var rows []TermRow
	for _, s := range st.Summaries {
		for _, tm := range s.Terms {
			rows = append(rows, TermRow{Scenario: st.Scenario.Name, Body: s.Body, Term: tm.Term, Role: tm.Role,
				AdvanceRadPerOrbit: nz(tm.AdvancePerOrbit), AdvanceArcsecPerCent: nz(tm.AdvancePerCentury), Share: nz(tm.Share)})
		}
	}
	return rows
}

// Trajectory builds the trajectory rows.
func Trajectory(st *study.Study) []TrajectoryRow {
	rows := make([]TrajectoryRow, len(st.Trajectory))
	for k, r := range st.Trajectory {
		rows[k] = TrajectoryRow{TimeS: r.T, Body: st.Setup.Names[r.Body],
			XM: r.X[0], YM: r.X[1], ZM: r.X[2], VXMPerS: r.V[0], VYMPerS: r.V[1], VZMPerS: r.V[2],
			RM: r.R, EnergyErr: nz(r.EnergyErr), ToleranceExceeded: r.Exceeded}
	}
	return rows
}

// Metadata is the key-value metadata stored with both files.
func Metadata(st *study.Study) map[string]string {
	sc := st.Scenario
	m := map[string]string{
		"mgorbit.version":          Version,
		"mgorbit.scenario.name":    sc.Name,
		"mgorbit.scenario.source":  sc.Source,
		"mgorbit.scenario.sha256":  sc.Hash,
		"mgorbit.scenario.toml":    sc.Text,
		"mgorbit.kernel_stack":     sc.Stack.String(),
		"mgorbit.integrator":       st.Setup.Method,
		"mgorbit.integrator.order": fmt.Sprint(st.Order),
		"mgorbit.step_s":           fmt.Sprint(st.Setup.H),
		"mgorbit.steps":            fmt.Sprint(st.Setup.Steps),
		"mgorbit.output_every":     fmt.Sprint(st.Setup.OutputEvery),
		"mgorbit.orbit_of":         st.Setup.Names[st.OrbitOf],
		"mgorbit.constants":        fmt.Sprintf("au=%v m; GM_sun=%v m^3/s^2 (IAU 2015 B3); c=%v m/s; G=%v (CODATA 2018)", units.AU, units.GMSun, units.C, units.G),
	}
	if e := st.Main.SystemEnergyErr; !math.IsNaN(e) {
		m["mgorbit.system_energy_rel_error_max"] = fmt.Sprint(e)
	}
	for k, ks := range sc.Kernels {
		var parts []string
		for name, v := range ks.Values.Num {
			parts = append(parts, fmt.Sprintf("%s=%v", name, v))
		}
		for name, v := range ks.Values.Str {
			parts = append(parts, fmt.Sprintf("%s=%s", name, v))
		}
		sort.Strings(parts)
		m[fmt.Sprintf("mgorbit.kernel.%d.%s", k, ks.Name)] = strings.Join(parts, " ")
	}
	return m
}
