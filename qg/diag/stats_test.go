package diag

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat"
)

// Mean, standard deviation, skewness and excess kurtosis of a skewed
// synthetic series against gonum/stat (a general-purpose reference
// library: MeanStdDev, Skew, ExKurtosis), and the histogram against
// stat.Histogram.
func TestStatisticsAgainstGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	x := make([]float64, 5000)
	for i := range x {
		x[i] = 3 + math.Exp(0.5*rng.NormFloat64()) // log-normal: skewed, heavy-tailed
	}
	s, err := Statistics(x, 3600, 12)
	if err != nil {
		t.Fatal(err)
	}
	mean, std := stat.MeanStdDev(x, nil)
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"mean", s.Mean, mean},
		{"std", s.Std, std},
		{"skewness", s.Skewness, stat.Skew(x, nil)},
		{"excess kurtosis", s.Kurtosis, stat.ExKurtosis(x, nil)},
	} {
		if math.Abs(c.got-c.want) > 1e-10*math.Abs(c.want) {
			t.Errorf("%s = %.15g, gonum %.15g", c.name, c.got, c.want)
		}
	}
	if !(s.Skewness > 0.5) {
		t.Errorf("skewness %g: a log-normal series is right-skewed", s.Skewness)
	}
	// gonum's Histogram counts x in [div_i, div_{i+1}); its last divider
	// must exceed the maximum, so nudge it up.
	sorted := append([]float64(nil), x...)
	divs := append([]float64(nil), s.Histogram.Edges...)
	divs[len(divs)-1] = math.Nextafter(divs[len(divs)-1], math.Inf(1))
	stat.SortWeighted(sorted, nil)
	ref := stat.Histogram(nil, divs, sorted, nil)
	total := 0
	for i, c := range s.Histogram.Counts {
		total += c
		if float64(c) != ref[i] {
			t.Errorf("bin %d: %d, gonum %g", i, c, ref[i])
		}
	}
	if total != len(x) {
		t.Errorf("histogram holds %d values, want %d", total, len(x))
	}
}

// The decorrelation time of an AR(1) series x_k = φx_{k−1} + ε_k: its
// autocorrelation is φ^k, so the e-folding time is −Δt/ln φ and the integral
// time scale Δt(½ + φ/(1 − φ)) = Δt(1 + φ)/(2(1 − φ)) (the AR(1)
// autocorrelation: Box & Jenkins 1976; the sum: a geometric series). Sampling error of the estimated
// autocorrelation at 4·10⁵ samples is about 1 %; the tolerances are 3 %
// (e-folding) and 8 % (integral scale, noisier: it sums many lags).
func TestDecorrelationAR1(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	const dt = 6 * 3600.0
	for _, phi := range []float64{0.6, 0.9} {
		x := make([]float64, 400000)
		for i := 1; i < len(x); i++ {
			x[i] = phi*x[i-1] + rng.NormFloat64()
		}
		s, err := Statistics(x, dt, 20)
		if err != nil {
			t.Fatal(err)
		}
		want := -dt / math.Log(phi) / day
		t.Logf("φ = %g: e-folding %.4f d (exact %.4f), integral %.4f d (exact %.4f)", phi, s.Decorrelation, want, s.IntegralTime, dt*(1+phi)/(2*(1-phi))/day)
		if e := math.Abs(s.Decorrelation-want) / want; e > 0.03 {
			t.Errorf("φ = %g: e-folding time %.4g days, exact %.4g (error %.1f %%)", phi, s.Decorrelation, want, 100*e)
		}
		wantI := dt * (1 + phi) / (2 * (1 - phi)) / day
		if e := math.Abs(s.IntegralTime-wantI) / wantI; e > 0.08 {
			t.Errorf("φ = %g: integral time %.4g days, exact %.4g (error %.1f %%)", phi, s.IntegralTime, wantI, 100*e)
		}
	}
}

// Episodes above a threshold on a series built by hand.
func TestEpisodes(t *testing.T) {
	x := []float64{2, 2, 0, 0, 3, 3, 3, 0, 1, 0, 5}
	got := Episodes(x, 10, 1) // strictly above 1
	want := []Episode{
		{First: 0, Count: 2, Duration: 20, Censored: true},
		{First: 4, Count: 3, Duration: 30},
		{First: 10, Count: 1, Duration: 10, Censored: true},
	}
	if len(got) != len(want) {
		t.Fatalf("got %d episodes %+v, want %+v", len(got), got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("episode %d: %+v, want %+v", i, got[i], want[i])
		}
	}
}

// Bad input gets an error naming the problem.
func TestStatisticsErrors(t *testing.T) {
	for _, c := range []struct {
		x    []float64
		dt   float64
		bins int
	}{
		{[]float64{1, 2, 3}, 1, 1},
		{[]float64{1, 2, 3, 4}, 0, 1},
		{[]float64{1, 2, 3, 4}, 1, 0},
		{[]float64{1, 2, math.NaN(), 4}, 1, 1},
	} {
		if _, err := Statistics(c.x, c.dt, c.bins); err == nil {
			t.Errorf("Statistics(%v, %g, %d): no error", c.x, c.dt, c.bins)
		}
	}
}
