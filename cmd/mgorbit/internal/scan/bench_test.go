package scan

import (
	"context"
	"path/filepath"
	"strings"
	"testing"
)

func benchScan(b *testing.B, text string, method Method, sweep string) {
	spec := newSpec(b, text, method, sweep)
	out := filepath.Join(b.TempDir(), "scan.parquet")
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		res, err := Run(context.Background(), spec, Options{Out: out, Force: true})
		if err != nil {
			b.Fatal(err)
		}
		if res.Computed != spec.Points() {
			b.Fatalf("%d of %d points", res.Computed, spec.Points())
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(spec.Points())/1e3, "us/point")
}

// A dense semi-analytic Yukawa curve: 10 000 points, all cores.
func BenchmarkSemiAnalyticYukawa10000(b *testing.B) {
	benchScan(b, yukawaText, SemiAnalytic, "kernel.yukawa.lambda=log:0.2 au:100 au:10000")
}

// Towers with many modes cost more per force evaluation: 1000 points of a
// 10-site tower, 200 points of a 1000-site one.
func towerText(sites string) string {
	yukawa := "name = \"yukawa\"\nalpha = 1e-4\nlambda = \"1 au\""
	if !strings.Contains(yukawaText, yukawa) {
		panic("the Yukawa test scenario changed")
	}
	return strings.Replace(yukawaText, yukawa, "name = \"tower\"\nsites = "+sites+"\ncircumference = \"1 au\"", 1)
}

func BenchmarkSemiAnalyticTower10Sites1000(b *testing.B) {
	benchScan(b, towerText("10"), SemiAnalytic, "kernel.tower.circumference=log:0.5 au:500 au:1000")
}

func BenchmarkSemiAnalyticTower1000Sites200(b *testing.B) {
	benchScan(b, towerText("1000"), SemiAnalytic, "kernel.tower.circumference=log:0.5 au:500 au:200")
}

// An integrated curve: 100 points of 100-orbit runs (each point is the full
// study: h, h/2 and the reference stack at both, yoshida6 at 150.3 steps
// per orbit).
func BenchmarkIntegrated100Points100Orbits(b *testing.B) {
	text := strings.Replace(yukawaText, "orbits = 30", "orbits = 100", 1)
	if text == yukawaText {
		b.Fatal("the Yukawa test scenario changed")
	}
	benchScan(b, text, Integrate, "kernel.yukawa.lambda=log:0.2 au:100 au:100")
}
