package report

import (
	"fmt"
	"io"
	"math"
	"strings"
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
	if e := st.Main.SystemEnergyErr; !math.IsNaN(e) {
		fmt.Fprintf(w, "total energy of the massive bodies: max relative error %s\n", err3(e, ""))
	}
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
		row("precession", num(s.PrecessionPerOrbit, "rad/orbit"), "± "+err3(s.PrecessionIntErr, "integration"),
			"± "+err3(s.PrecessionStdErr, "fit"))
		row("", num(s.PrecessionPerCentury, "arcsec/century"), "± "+err3(s.PrecessionPerCenturyErr, ""),
			num(study.DegPerYear(s.PrecessionPerOrbit, s.RadialPeriod), "deg/yr"))
		row("semi-analytic", num(s.SemiPrecessionPerOrbit, "rad/orbit"), "["+s.SemiPath+"]",
			"integrated minus semi-analytic "+err3(s.PrecessionMinusSemi, ""))
		if s.ReferenceStack != "" {
			row("anomaly vs "+s.ReferenceStack, num(s.AnomalyPerOrbit, "rad/orbit"), "± "+err3(s.AnomalyIntErr, "integration"),
				"semi-analytic "+num(s.SemiAnomalyPerOrbit, ""))
			row("", num(s.AnomalyPerCentury, "arcsec/century"), "± "+err3(s.AnomalyPerCentErr, ""))
		}
		if len(s.Terms) > 1 {
			var parts []string
			for _, tm := range s.Terms {
				parts = append(parts, fmt.Sprintf("%s %s (%.1f%%)", tm.Term, num(tm.AdvancePerOrbit, ""), 100*tm.Share))
			}
			row("terms (first order, rad/orbit)", strings.Join(parts, ", "))
		}
		row("radial period", days(s.RadialPeriod), "± "+err3(s.RadialPeriodErr/units.Day, "d"), "semi-analytic "+days(s.SemiRadialPeriod))
		row("azimuthal period", days(s.AzimuthalPeriod), "± "+err3(s.AzimuthalPeriodErr/units.Day, "d"))
		row("period shift vs Kepler", "radial "+err3(s.RadialShiftKepler, ""), "azimuthal "+err3(s.AzimuthalShiftKepler, ""))
		row("period shift vs Newtonian run", "radial "+err3(s.RadialShiftNewton, ""))
		row("conservation (max rel. error)", "energy "+err3(s.EnergyErr, ""), "angular momentum "+err3(s.AngMomErr, ""))
		tw.Flush()
		if s.Notes != "" {
			fmt.Fprintf(w, "  note: %s\n", s.Notes)
		}
	}
	for _, wmsg := range st.Warnings {
		fmt.Fprintf(w, "WARNING: %s\n", wmsg)
	}
}

// num shows a value to nine significant digits, so that a value and its
// reference can be compared by eye; err shows an uncertainty to three.
func num(x float64, unit string) string { return format(x, unit, 9) }

func err3(x float64, unit string) string { return format(x, unit, 3) }

func format(x float64, unit string, digits int) string {
	if math.IsNaN(x) {
		return "n/a"
	}
	s := fmt.Sprintf("%.*g", digits, x)
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
