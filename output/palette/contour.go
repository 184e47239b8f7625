package palette

import "math"

// Point is a position in grid coordinates: point (i, j) of a Grid is at
// X = i, Y = j.
type Point struct {
	X, Y float64
}

// Segment is a straight piece of a contour line from A to B.
type Segment struct {
	A, B Point
}

// Contour appends to dst the segments of the contour g = level, found by
// marching squares: each cell of four neighbouring grid points whose values
// straddle the level gets one or two segments, their ends placed on the
// cell's edges by linear interpolation. A cell whose two diagonals straddle
// the level the opposite way (a saddle) is resolved by the mean of its four
// corners, taken as the value at its centre: if it is at or above the level,
// the corners at or above it are joined through the centre.
//
// With periodic set the grid wraps around in x and y, and the cells between
// the last and the first column or row are contoured too (their segments
// reach X = Nx or Y = Ny). Cells with a NaN corner get no segment. Values
// equal to the level count as above it.
func Contour(dst []Segment, g Grid, level float64, periodic bool) ([]Segment, error) {
	if err := g.Check(); err != nil {
		return dst, err
	}
	if math.IsNaN(level) || math.IsInf(level, 0) {
		return dst, errorf("contour level %g is not finite", level)
	}
	cx, cy := g.Nx-1, g.Ny-1
	if periodic {
		cx, cy = g.Nx, g.Ny
	}
	v := g.Values
	for j := range cy {
		j1 := j + 1
		if j1 == g.Ny {
			j1 = 0
		}
		for i := range cx {
			i1 := i + 1
			if i1 == g.Nx {
				i1 = 0
			}
			v00, v10 := v[j*g.Nx+i], v[j*g.Nx+i1]
			v01, v11 := v[j1*g.Nx+i], v[j1*g.Nx+i1]
			c := 0
			if v00 >= level {
				c |= 1
			}
			if v10 >= level {
				c |= 2
			}
			if v11 >= level {
				c |= 4
			}
			if v01 >= level {
				c |= 8
			}
			if c == 0 || c == 15 || math.IsNaN(v00+v10+v01+v11) {
				continue
			}
			x, y := float64(i), float64(j)
			// Crossing points on the four edges: bottom (00–10), right
			// (10–11), top (01–11), left (00–01).
			edge := func(e int) Point {
				switch e {
				case 0:
					return Point{x + frac(v00, v10, level), y}
				case 1:
					return Point{x + 1, y + frac(v10, v11, level)}
				case 2:
					return Point{x + frac(v01, v11, level), y + 1}
				}
				return Point{x, y + frac(v00, v01, level)}
			}
			add := func(a, b int) {
				dst = append(dst, Segment{edge(a), edge(b)})
			}
			switch c {
			case 1, 14:
				add(3, 0)
			case 2, 13:
				add(0, 1)
			case 3, 12:
				add(3, 1)
			case 4, 11:
				add(1, 2)
			case 6, 9:
				add(0, 2)
			case 7, 8:
				add(3, 2)
			case 5, 10:
				above := 0.25*(v00+v10+v01+v11) >= level
				// Corners 00 and 11 above (case 5) with the centre above, or
				// corners 10 and 01 above (case 10) with the centre below:
				// cut off corners 10 and 01.
				if (c == 5) == above {
					add(0, 1)
					add(2, 3)
				} else {
					add(3, 0)
					add(1, 2)
				}
			}
		}
	}
	return dst, nil
}

// frac returns where, from a to b, the linear interpolant crosses level.
func frac(a, b, level float64) float64 {
	if a == b {
		return 0.5
	}
	return (level - a) / (b - a)
}

// Chain joins segments into polylines wherever an end of one is exactly an
// end of another (as the segments of neighbouring cells from Contour are),
// so that a contour can be drawn as connected lines, dashed or smoothed. A
// closed contour comes back to its first point. The order of the polylines
// follows the order of their first segments in segs.
func Chain(segs []Segment) [][]Point {
	ends := make(map[Point][]int, 2*len(segs))
	for k, s := range segs {
		ends[s.A] = append(ends[s.A], k)
		ends[s.B] = append(ends[s.B], k)
	}
	used := make([]bool, len(segs))
	// next returns an unused segment touching p, and its other end.
	next := func(p Point) (Point, bool) {
		for _, k := range ends[p] {
			if used[k] {
				continue
			}
			used[k] = true
			if segs[k].A == p {
				return segs[k].B, true
			}
			return segs[k].A, true
		}
		return Point{}, false
	}
	var lines [][]Point
	for k, s := range segs {
		if used[k] {
			continue
		}
		used[k] = true
		fwd := []Point{s.A, s.B}
		for p, ok := next(s.B); ok; p, ok = next(p) {
			fwd = append(fwd, p)
		}
		var back []Point
		for p, ok := next(s.A); ok; p, ok = next(p) {
			back = append(back, p)
		}
		line := make([]Point, 0, len(back)+len(fwd))
		for i := len(back) - 1; i >= 0; i-- {
			line = append(line, back[i])
		}
		lines = append(lines, append(line, fwd...))
	}
	return lines
}
