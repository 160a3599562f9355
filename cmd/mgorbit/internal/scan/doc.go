// Package scan sweeps scenario parameters over grids and runs every grid
// point as a study of its own.
//
// An axis names a value in the scenario's TOML document (a kernel parameter,
// a body's mass or orbital element, an integrator setting) and the values it
// takes: a linear or logarithmic grid, or an explicit list. Several axes make
// a full grid. Each point's scenario is the user's document with the values
// set and is read back through scenarios.Parse, so it is checked exactly like
// a file the user wrote.
//
// Points are independent and go to a pool of workers; the table is written
// sorted by point index, so its contents never depend on the worker count or
// the order of completion. A scan can be split into shards (point i belongs
// to shard i mod N + 1), each writing a part file; Merge joins them into the
// table a single run would have written. Completed points are kept in a
// checkpoint beside the output, so an interrupted scan resumes where it was.
package scan
