package report

import (
	"fmt"
	"io"
	"math"
	"text/tabwriter"

	"mgorbit/integrator/study"
	"mgorbit/scenarios/units"
)

// Text writes the human-readable summary.
func Text(w io.Writer, st *study.Study) {
	su := st.Setup
	sc := st.Scenario
	fmt.Fprintf(w, "%s  [%s]\n", sc.Name, sc.Source)
	fmt.Fprintf(w, "stack %s; %s (order %d), step %s (%.4g steps per orbit of %s), %d steps, %s\n",
		sc.Stack, su.Method, st.Order, duration(su.H), st.Period/su.H, su.Names[st.OrbitOf], su.Steps, duration(su.H*float64(su.Steps)))
	for _, s := range st.Summaries {
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintf(w, "\n%s about %s: %d pericentre passages, measured e = %.6g, a = %.10g au\n",
			s.Body, s.Primary, s.Passages, s.Eccentricity, s.SizeA/units.AU)
		row := func(label string, cols ...string) {
			fmt.Fprint(tw, "  "+label)
			for _, c := range cols {
				fmt.Fprint(tw, "\t"+c)
			}
			fmt.Fprintln(tw)
		}
		row("precession", num(s.PrecessionPerOrbit, "rad/orbit"), "± "+num(s.PrecessionIntErr, "integration"),
			"± "+num(s.PrecessionStdErr, "fit"))
		row("", num(s.PrecessionPerCentury, "arcsec/century"), "± "+num(s.PrecessionPerCenturyErr, ""))
		row("semi-analytic", num(s.SemiPrecessionPerOrbit, "rad/orbit"), "["+s.SemiPath+"]",
			"integrated minus semi-analytic "+num(s.PrecessionMinusSemi, ""))
		if s.ReferenceStack != "" {
			row("anomaly vs "+s.ReferenceStack, num(s.AnomalyPerOrbit, "rad/orbit"), "± "+num(s.AnomalyIntErr, "integration"),
				"semi-analytic "+num(s.SemiAnomalyPerOrbit, ""))
			row("", num(s.AnomalyPerCentury, "arcsec/century"), "± "+num(s.AnomalyPerCentErr, ""))
		}
		row("radial period", days(s.RadialPeriod), "± "+num(s.RadialPeriodErr/units.Day, "d"), "semi-analytic "+days(s.SemiRadialPeriod))
		row("azimuthal period", days(s.AzimuthalPeriod), "± "+num(s.AzimuthalPeriodErr/units.Day, "d"))
		row("period shift vs Kepler", "radial "+num(s.RadialShiftKepler, ""), "azimuthal "+num(s.AzimuthalShiftKepler, ""))
		row("period shift vs Newtonian run", "radial "+num(s.RadialShiftNewton, ""))
		row("conservation (max rel. error)", "energy "+num(s.EnergyErr, ""), "angular momentum "+num(s.AngMomErr, ""))
		tw.Flush()
		if s.Notes != "" {
			fmt.Fprintf(w, "  note: %s\n", s.Notes)
		}
	}
	for _, wmsg := range st.Warnings {
		fmt.Fprintf(w, "WARNING: %s\n", wmsg)
	}
}

func num(x float64, unit string) string {
	if math.IsNaN(x) {
		return "n/a"
	}
	s := fmt.Sprintf("%.6g", x)
	if unit != "" {
		s += " " + unit
	}
	return s
}

func days(s float64) string {
	if math.IsNaN(s) {
		return "n/a"
	}
	return fmt.Sprintf("%.10g d", s/units.Day)
}

func duration(s float64) string {
	switch {
	case s >= units.JulianYear:
		return fmt.Sprintf("%.6g yr", s/units.JulianYear)
	case s >= units.Day:
		return fmt.Sprintf("%.6g d", s/units.Day)
	case s >= 3600:
		return fmt.Sprintf("%.6g h", s/3600)
	}
	return fmt.Sprintf("%.6g s", s)
}
