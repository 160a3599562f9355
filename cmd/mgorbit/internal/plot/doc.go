// Package plot draws scan tables with gonum/plot: an observable against a
// swept parameter, one curve per value of a second column (and per body),
// error bars from the matching integration-error column, logarithmic axes
// where the grid is logarithmic, and optional horizontal bound lines such as
// a measured limit. The format follows the file name: .png or .svg (.pdf
// and .eps also work).
package plot
