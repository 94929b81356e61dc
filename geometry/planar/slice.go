package planar

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// Slice cuts m with the plane p and returns the cut as a Cloud of 3D points
// on the plane (Dim 3, Ordered; the reader sets Format), one run per loop
// (Segments holds their starts when there is more than one). Each point's Origin
// names the facet it was cut from (Entity, 1-based) and, for an ASCII file,
// the facet's line.
//
// Every mesh edge that crosses the plane is cut once, and both facets
// sharing the edge use that one point, so the loops close exactly. A vertex
// lying exactly on the plane is treated as lying on its positive side
// (symbolic perturbation), which keeps every facet cut by either zero or
// two edges; the repeated points this gives where a loop passes through
// such a vertex are merged. The point where edge (i, j), i < j, crosses is
//
//	v_i + t (v_j − v_i),  t = d_i / (d_i − d_j),
//
// with d the signed distances from the plane, and exactly v_i or v_j when
// that end lies on the plane.
//
// Chains that do not close (a mesh with holes) are kept as open runs and
// noted. Slice returns an error wrapping ErrNoLoop when the plane misses
// the mesh, and an error when p has a zero normal.
func (m *Mesh) Slice(p Spec) (*geometry.Cloud, error) {
	n := p.Normal.Unit()
	if n == (geometry.Vec3{}) || !n.IsFinite() || !p.Point.IsFinite() {
		return nil, fmt.Errorf("geometry: cut plane %s: normal must be finite and non-zero", p)
	}
	dist := make([]float64, len(m.Vertices))
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, v := range m.Vertices {
		dist[i] = v.Sub(p.Point).Dot(n)
		lo, hi = math.Min(lo, dist[i]), math.Max(hi, dist[i])
	}
	s := cutGraph{m: m, dist: dist, node: map[uint64]int{}}
	for fi, f := range m.Facets {
		if f[0] == f[1] || f[1] == f[2] || f[2] == f[0] {
			continue // degenerate: no area to cut
		}
		var ends [2]int
		k := 0
		for e := range 3 {
			a, b := f[e], f[(e+1)%3]
			if (dist[a] >= 0) != (dist[b] >= 0) {
				if k < 2 {
					ends[k] = s.cut(a, b)
				}
				k++
			}
		}
		if k == 2 && ends[0] != ends[1] {
			s.add(ends[0], ends[1], fi)
		}
	}
	c := &geometry.Cloud{Dim: 3, Ordered: true, Name: m.Name}
	c.Notes = append(c.Notes, m.Notes...)
	loops := s.walk()
	kept := 0
	for _, l := range loops {
		if len(l.pts) < 3 {
			continue
		}
		kept++
		if !l.closed {
			c.Notes = append(c.Notes, geometry.Note{Origin: l.origins[0], Reason: fmt.Sprintf("open chain of %d points: the mesh has a hole or a free edge here", len(l.pts))})
		}
	}
	for _, l := range loops {
		if len(l.pts) < 3 {
			continue
		}
		if kept > 1 {
			c.Segments = append(c.Segments, len(c.Points))
		}
		c.Points = append(c.Points, l.pts...)
		c.Origins = append(c.Origins, l.origins...)
	}
	if kept == 0 {
		if len(m.Vertices) == 0 {
			return nil, fmt.Errorf("geometry: %s: %w: the mesh has no facets", m.File, geometry.ErrNoLoop)
		}
		return nil, fmt.Errorf("geometry: %s: %w: the plane %s does not cut the mesh (signed distances of its vertices run from %.6g to %.6g)", m.File, geometry.ErrNoLoop, p, lo, hi)
	}
	return c, nil
}

// cutGraph holds the cut points (one per crossing edge) and the segments
// joining them (one per cut facet).
type cutGraph struct {
	m    *Mesh
	dist []float64
	node map[uint64]int // edge (i<j) → cut point
	pts  []geometry.Vec3
	adj  [][]int // cut point → segments
	segs []cutSeg
}

type cutSeg struct{ a, b, facet int }

// cut returns the cut point of edge (a, b), computing it the first time.
func (s *cutGraph) cut(a, b int) int {
	if a > b {
		a, b = b, a
	}
	key := uint64(a)<<32 | uint64(b)
	if k, ok := s.node[key]; ok {
		return k
	}
	va, vb := s.m.Vertices[a], s.m.Vertices[b]
	da, db := s.dist[a], s.dist[b]
	var p geometry.Vec3
	switch {
	case da == 0:
		p = va
	case db == 0:
		p = vb
	default:
		p = va.Add(vb.Sub(va).Scale(da / (da - db)))
	}
	k := len(s.pts)
	s.pts = append(s.pts, p)
	s.adj = append(s.adj, nil)
	s.node[key] = k
	return k
}

func (s *cutGraph) add(a, b, facet int) {
	k := len(s.segs)
	s.segs = append(s.segs, cutSeg{a, b, facet})
	s.adj[a] = append(s.adj[a], k)
	s.adj[b] = append(s.adj[b], k)
}

type cutLoop struct {
	pts     []geometry.Vec3
	origins []geometry.Origin
	closed  bool
}

// origin is the Origin of a point reached through segment k.
func (s *cutGraph) origin(k int) geometry.Origin {
	f := s.segs[k].facet
	o := geometry.Origin{File: s.m.File, Entity: f + 1}
	if f < len(s.m.Lines) {
		o.Line = s.m.Lines[f]
	}
	return o
}

// walk chains the segments into runs: first open chains from points that
// do not have exactly two segments, then closed loops, each in the order
// the cut points were made (facet order), so the result is deterministic.
// Consecutive equal points (a loop through a vertex on the plane) are
// merged.
func (s *cutGraph) walk() []cutLoop {
	used := make([]bool, len(s.segs))
	var loops []cutLoop
	follow := func(start, k int) cutLoop {
		l := cutLoop{pts: []geometry.Vec3{s.pts[start]}, origins: []geometry.Origin{s.origin(k)}}
		n := start
		for {
			used[k] = true
			seg := s.segs[k]
			if seg.a == n {
				n = seg.b
			} else {
				n = seg.a
			}
			if n == start {
				l.closed = true
				break
			}
			l.pts = append(l.pts, s.pts[n])
			l.origins = append(l.origins, s.origin(k))
			next := -1
			if len(s.adj[n]) == 2 {
				for _, j := range s.adj[n] {
					if !used[j] {
						next = j
					}
				}
			}
			if next < 0 {
				break
			}
			k = next
		}
		return dropRepeats(l)
	}
	for n, segs := range s.adj {
		if len(segs) == 2 {
			continue
		}
		for _, k := range segs {
			if !used[k] {
				loops = append(loops, follow(n, k))
			}
		}
	}
	for k, seg := range s.segs {
		if !used[k] {
			loops = append(loops, follow(seg.a, k))
		}
	}
	return loops
}

// dropRepeats drops points equal to the one before them (and, in a closed
// loop, a last point equal to the first).
func dropRepeats(l cutLoop) cutLoop {
	out := cutLoop{closed: l.closed}
	for i, p := range l.pts {
		if i > 0 && p == out.pts[len(out.pts)-1] {
			continue
		}
		out.pts = append(out.pts, p)
		out.origins = append(out.origins, l.origins[i])
	}
	for l.closed && len(out.pts) > 1 && out.pts[len(out.pts)-1] == out.pts[0] {
		out.pts, out.origins = out.pts[:len(out.pts)-1], out.origins[:len(out.origins)-1]
	}
	return out
}
