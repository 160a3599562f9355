// Command plot draws the precession error against the step from the CSV
// that `gobench errstep` prints (stdin) into a PNG (the first argument).
// It is its own module so that gonum.org/v1/plot stays out of mgorbit's
// go.mod and out of `go test ./...`.
package main

import (
	"encoding/csv"
	"fmt"
	"image/color"
	"math"
	"os"
	"sort"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

func main() {
	if len(os.Args) != 2 {
		fmt.Fprintln(os.Stderr, "usage: plot OUT.png < errstep.csv")
		os.Exit(2)
	}
	rows, err := csv.NewReader(os.Stdin).ReadAll()
	if err != nil {
		panic(err)
	}
	series := map[string]plotter.XYs{}
	for _, r := range rows[1:] {
		steps, _ := strconv.ParseFloat(r[1], 64)
		rel, _ := strconv.ParseFloat(r[3], 64)
		if rel <= 0 || math.IsNaN(rel) {
			continue
		}
		series[r[0]] = append(series[r[0]], plotter.XY{X: steps, Y: rel})
	}
	p := plot.New()
	p.Title.Text = "Mercury-like precession (gr-orbit, 330 orbits): error against step"
	p.X.Label.Text = "steps per orbit"
	p.Y.Label.Text = "|precession / exact - 1|"
	p.X.Scale, p.Y.Scale = plot.LogScale{}, plot.LogScale{}
	p.X.Tick.Marker, p.Y.Tick.Marker = plot.LogTicks{Prec: 1}, plot.LogTicks{Prec: 1}
	p.Legend.Top = true
	p.Y.Max = 1e9 // room for the legend above the curves
	names := make([]string, 0, len(series))
	for n := range series {
		names = append(names, n)
	}
	sort.Strings(names)
	palette := []color.RGBA{{0, 90, 181, 255}, {220, 50, 32, 255}, {0, 150, 70, 255}, {150, 80, 190, 255}, {230, 140, 0, 255}, {90, 90, 90, 255}}
	for k, n := range names {
		l, pts, err := plotter.NewLinePoints(series[n])
		if err != nil {
			panic(err)
		}
		c := palette[k%len(palette)]
		l.Color, pts.Color = c, c
		pts.Shape = draw.CircleGlyph{}
		p.Add(l, pts)
		p.Legend.Add(n, l, pts)
	}
	target, _ := plotter.NewLine(plotter.XYs{{X: 8, Y: 1e-6}, {X: 400, Y: 1e-6}})
	target.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
	p.Add(target)
	p.Legend.Add("1e-6 target", target)
	if err := p.Save(8*vg.Inch, 5.5*vg.Inch, os.Args[1]); err != nil {
		panic(err)
	}
}
