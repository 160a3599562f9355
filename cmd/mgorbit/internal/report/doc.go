// Package report turns a study into what mgorbit writes: the Parquet rows of
// summary.parquet and trajectory.parquet with their metadata, the summary
// table printed on a terminal, and the JSON form of the summary.
//
// Column names are snake_case with the unit in the name. Undefined values
// (a precession that is not measurable, a period shift against an unbound
// Newtonian orbit) are NULL in Parquet and null in JSON, never NaN; the
// notes column says why.
package report
