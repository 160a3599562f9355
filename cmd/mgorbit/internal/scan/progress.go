package scan

import (
	"fmt"
	"io"
	"sync"
	"time"
)

// ProgressText describes a scan's progress: points done of total, the
// rate, and the time left at that rate.
func ProgressText(done, total int, elapsed time.Duration) string {
	s := fmt.Sprintf("%d/%d points", done, total)
	if done == 0 || elapsed <= 0 {
		return s
	}
	rate := float64(done) / elapsed.Seconds()
	s += ", " + formatRate(rate)
	if done < total {
		left := time.Duration(float64(total-done) / rate * float64(time.Second))
		s += ", about " + roundDuration(left).String() + " left"
	} else {
		s += ", done in " + roundDuration(elapsed).String()
	}
	return s
}

func formatRate(r float64) string {
	switch {
	case r >= 10:
		return fmt.Sprintf("%.0f points/s", r)
	case r >= 1:
		return fmt.Sprintf("%.1f points/s", r)
	}
	return fmt.Sprintf("%.2g s/point", 1/r)
}

func roundDuration(d time.Duration) time.Duration {
	switch {
	case d >= time.Hour:
		return d.Round(time.Minute)
	case d >= time.Minute:
		return d.Round(time.Second)
	case d >= time.Second:
		return d.Round(100 * time.Millisecond)
	}
	return d.Round(time.Millisecond)
}

// ProgressLines returns a progress callback for logs (a batch job's output,
// a pipe): a line at most every interval, and one at the end.
func ProgressLines(w io.Writer, prefix string, every time.Duration) func(done, total int) {
	var mu sync.Mutex
	start := time.Now()
	last := time.Time{}
	return func(done, total int) {
		mu.Lock()
		defer mu.Unlock()
		now := time.Now()
		if done < total && now.Sub(last) < every {
			return
		}
		if done == 0 && total > 0 {
			last = now
			fmt.Fprintf(w, "%s%d points to compute\n", prefix, total)
			return
		}
		last = now
		fmt.Fprintf(w, "%s%s\n", prefix, ProgressText(done, total, now.Sub(start)))
	}
}
