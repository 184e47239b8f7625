package diag

import (
	"fmt"
	"math"
)

// IndexStats are the statistics of a uniformly sampled series (the block
// index over the averaging window).
type IndexStats struct {
	N    int     `json:"n"`
	Mean float64 `json:"mean"`
	// Std is the unbiased standard deviation.
	Std float64 `json:"std"`
	// Skewness is the adjusted Fisher–Pearson coefficient G1 and Kurtosis
	// the excess kurtosis G2 (Joanes & Gill 1998), as in gonum/stat.
	Skewness float64 `json:"skewness"`
	Kurtosis float64 `json:"excess_kurtosis"`
	// Decorrelation is the e-folding time of the sample autocorrelation,
	// days: the lag at which it first falls below 1/e, interpolated
	// log-linearly between lags; 0 if it never does within the series.
	Decorrelation float64 `json:"decorrelation_days"`
	// IntegralTime is Δt(½ + Σ_k ρ_k) summed up to the first negative ρ_k,
	// days.
	IntegralTime float64   `json:"integral_time_days"`
	Histogram    Histogram `json:"histogram"`
	// Threshold is the episode threshold, mean + one standard deviation.
	Threshold float64 `json:"threshold"`
	// Episodes is the number of episodes above Threshold, and MeanDuration
	// and MaxDuration their mean and longest durations, days (episodes cut
	// by the ends of the series included).
	Episodes     int     `json:"episodes"`
	MeanDuration float64 `json:"mean_duration_days"`
	MaxDuration  float64 `json:"max_duration_days"`
}

// Histogram counts values in equal bins; Edges has one more entry than
// Counts, and the last bin includes its upper edge.
type Histogram struct {
	Edges  []float64 `json:"edges"`
	Counts []int     `json:"counts"`
}

// Episode is a maximal run of consecutive samples above a threshold.
type Episode struct {
	First int `json:"first"` // index of its first sample
	Count int `json:"count"` // number of samples
	// Duration is Count·dt, s.
	Duration float64 `json:"duration"`
	// Censored is true when the episode touches either end of the series,
	// so that its true duration is unknown.
	Censored bool `json:"censored"`
}

// Statistics returns the statistics of x sampled every dt seconds, with a
// histogram of bins bins. It returns an error for fewer than four samples
// (the kurtosis needs four), a non-positive dt or bins, or non-finite data.
func Statistics(x []float64, dt float64, bins int) (IndexStats, error) {
	var s IndexStats
	n := len(x)
	switch {
	case n < 4:
		return s, fmt.Errorf("diag: Statistics: %d samples, need at least 4", n)
	case !(dt > 0) || math.IsInf(dt, 0):
		return s, fmt.Errorf("diag: Statistics: sampling interval dt = %g s must be finite and > 0", dt)
	case bins < 1:
		return s, fmt.Errorf("diag: Statistics: %d bins, need at least 1", bins)
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return s, fmt.Errorf("diag: Statistics: sample %d is not finite", i)
		}
	}
	s.N = n
	// two passes: the mean, then the central moments
	var sum float64
	for _, v := range x {
		sum += v
	}
	mean := sum / float64(n)
	var m2, m3, m4, comp float64
	for _, v := range x {
		d := v - mean
		comp += d
		d2 := d * d
		m2 += d2
		m3 += d2 * d
		m4 += d2 * d2
	}
	// corrected two-pass (Chan, Golub & LeVeque 1983): remove the rounding
	// error of the mean from the sum of squares.
	m2 -= comp * comp / float64(n)
	mean += comp / float64(n)
	s.Mean = mean
	fn := float64(n)
	variance := m2 / (fn - 1)
	s.Std = math.Sqrt(variance)
	if variance > 0 {
		// G1 = n/((n−1)(n−2)) Σ z³, G2 = n(n+1)/((n−1)(n−2)(n−3)) Σ z⁴ −
		// 3(n−1)²/((n−2)(n−3)), z = (x − x̄)/s (Joanes & Gill 1998).
		s3, s4 := variance*s.Std, variance*variance
		s.Skewness = fn / ((fn - 1) * (fn - 2)) * m3 / s3
		s.Kurtosis = fn*(fn+1)/((fn-1)*(fn-2)*(fn-3))*m4/s4 - 3*(fn-1)*(fn-1)/((fn-2)*(fn-3))
		s.Decorrelation, s.IntegralTime = decorrelation(x, mean, m2, dt)
		s.Decorrelation /= day
		s.IntegralTime /= day
	}
	s.Histogram = histogram(x, bins)
	s.Threshold = s.Mean + s.Std
	eps := Episodes(x, dt, s.Threshold)
	s.Episodes = len(eps)
	for _, e := range eps {
		s.MeanDuration += e.Duration
		s.MaxDuration = math.Max(s.MaxDuration, e.Duration/day)
	}
	if len(eps) > 0 {
		s.MeanDuration /= float64(len(eps)) * day
	}
	return s, nil
}

// decorrelation returns the e-folding time and the integral time scale (s)
// of x, whose mean is mean and whose sum of squared departures is m2. Lags
// run up to half the series.
func decorrelation(x []float64, mean, m2, dt float64) (efold, integral float64) {
	n := len(x)
	rho := func(k int) float64 {
		var c float64
		for i := 0; i+k < n; i++ {
			c += (x[i] - mean) * (x[i+k] - mean)
		}
		return c / m2 // the standard biased estimator (Box & Jenkins 1976)
	}
	target := math.Exp(-1)
	prev := 1.0
	integral = 0.5
	efDone, intDone := false, false
	for k := 1; k <= n/2 && !(efDone && intDone); k++ {
		r := rho(k)
		if !intDone {
			if r < 0 {
				intDone = true
			} else {
				integral += r
			}
		}
		if !efDone && r < target {
			efDone = true
			if r > 0 {
				// log-linear interpolation between lags k−1 and k
				lp, lr := math.Log(prev), math.Log(r)
				efold = (float64(k-1) + (lp+1)/(lp-lr)) * dt
			} else {
				efold = (float64(k-1) + (prev-target)/(prev-r)) * dt
			}
		}
		prev = r
	}
	return efold, integral * dt
}

// histogram counts x in bins equal bins spanning [min, max].
func histogram(x []float64, bins int) Histogram {
	lo, hi := x[0], x[0]
	for _, v := range x {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if hi == lo {
		lo, hi = lo-0.5, hi+0.5
	}
	h := Histogram{Edges: make([]float64, bins+1), Counts: make([]int, bins)}
	w := (hi - lo) / float64(bins)
	for i := range h.Edges {
		h.Edges[i] = lo + float64(i)*w
	}
	h.Edges[bins] = hi
	for _, v := range x {
		b := int((v - lo) / w)
		if b >= bins {
			b = bins - 1
		}
		for b > 0 && v < h.Edges[b] {
			b--
		}
		for b < bins-1 && v >= h.Edges[b+1] {
			b++
		}
		h.Counts[b]++
	}
	return h
}

// Episodes returns the maximal runs of consecutive samples of x (sampled
// every dt seconds) strictly above threshold.
func Episodes(x []float64, dt, threshold float64) []Episode {
	var eps []Episode
	for i := 0; i < len(x); {
		if !(x[i] > threshold) {
			i++
			continue
		}
		j := i
		for j < len(x) && x[j] > threshold {
			j++
		}
		eps = append(eps, Episode{First: i, Count: j - i, Duration: float64(j-i) * dt, Censored: i == 0 || j == len(x)})
		i = j
	}
	return eps
}
