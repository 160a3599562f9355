// Package units parses physical quantities written with a unit, such as
// "0.39 au", "1.2 Msun", "88 d", "3 Gpc" or "1e-23 eV", into SI values, and
// holds the published constants the project uses.
//
// Masses are stored as gravitational parameters GM in m^3 s^-2: a mass in
// solar masses enters through the nominal solar GM (IAU 2015 Resolution B3),
// a mass in kilograms through the CODATA 2018 G. The two routes differ by
// about 2.2e-5, which is why a mass never passes through kilograms when it
// was given in solar masses.
package units
