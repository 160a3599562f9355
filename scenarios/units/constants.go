package units

// Published constants, SI. Each names its standard.
const (
	// AU is the astronomical unit, exact (IAU 2012 Resolution B2).
	AU = 149597870700.0
	// C is the speed of light, exact (SI).
	C = 299792458.0
	// GMSun is the nominal solar gravitational parameter (IAU 2015 Resolution B3).
	GMSun = 1.3271244e20
	// G is Newton's constant (CODATA 2018).
	G = 6.67430e-11
	// Day is 86 400 s; JulianYear is 365.25 days; JulianCentury 36 525 days.
	Day           = 86400.0
	JulianYear    = 365.25 * Day
	JulianCentury = 36525 * Day
	// Parsec is (648 000 / pi) au (IAU 2015 Resolution B2).
	Parsec = 648000.0 / 3.14159265358979323846264338327950288 * AU
	// HbarCeVm is hbar c in eV m: 197.326 980 4 MeV fm (CODATA 2018).
	HbarCeVm = 197.3269804e6 * 1e-15
	// ElectronVolt in joules, exact (SI 2019).
	ElectronVolt = 1.602176634e-19
	// ArcsecPerRad is 648 000 / pi.
	ArcsecPerRad = 648000.0 / 3.14159265358979323846264338327950288
)

// RangeFromMass returns the range lambda = hbar c / (m c^2) in metres of a
// mediator whose rest energy is given in eV.
func RangeFromMass(eV float64) float64 { return HbarCeVm / eV }

// MassFromRange is the inverse of RangeFromMass: rest energy in eV.
func MassFromRange(lambda float64) float64 { return HbarCeVm / lambda }
