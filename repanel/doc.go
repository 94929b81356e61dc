// Package repanel implements spacing laws, the redistribution of panel
// nodes along a geometry.Path, and panel quality metrics.
//
// Distribute places N+1 nodes along a path in the node order of package
// geometry (trailing edge, upper surface, leading edge, lower surface,
// trailing edge), keeping both end points and putting one node exactly at
// the leading edge. Measure reports the shortest and longest panel, the
// largest length ratio of neighbouring panels and the largest turn between
// them, with warnings above stated limits.
//
// The package imports only geometry and gonum; it reads and writes nothing.
//
// # Surfaces and fractions
//
// The two surfaces are spaced separately, each by arc length. The panel
// count is split between them in proportion to their arc lengths (rounded,
// at least MinSurfacePanels each). On each surface a law gives fractions u
// from the leading edge (u = 0) to the trailing edge (u = 1), and with ℓ_u =
// sLE and ℓ_l = L − sLE the surface lengths, L the path length,
//
//	upper:  s = sLE − ℓ_u·u
//	lower:  s = sLE + ℓ_l·u
//
// # Spacing laws
//
// A Spacing gives n+1 fractions t[0] = 0 < t[1] < … < t[n] = 1. With
// β = π i / n, i = 0, …, n:
//
//	uniform:      t[i] = i / n
//	cosine:       t[i] = (1 − cos β) / 2          clustered at both ends
//	half-cosine:  t[i] = 1 − cos(β / 2)           clustered at 0 only
//
// These are common practice; on a flat plate the cosine law gives the chord
// stations x = (1 − cos β)/2 familiar from thin-aerofoil theory.
//
// The curvature-weighted law blends the cumulative density of the cosine
// law with a curvature density along the surface, and inverts it:
//
//	Φ(t) = (1 − w)·τ(t) + w·K(t)/K(1)
//	K(t) = ∫₀ᵗ (ε + |κ(s(t′))|)^½ dt′,   ε = 1/ℓ
//	t[i] = Φ⁻¹(i / n)
//
// with τ the inverse of the cosine law, κ the path curvature, ℓ the surface
// length and w the curvature weight (default 0.5). The exponent ½ makes the
// chord-to-arc departure κh²/8 of a panel of length h the same on every
// panel where curvature dominates (equidistribution, de Boor 1978). See
// Curvature.
//
// # Clustering at the ends
//
// Options.LECluster and Options.TECluster, strengths c₀ and c₁ in [−3, 3],
// warp the fractions of any law by the rational quadratic of Gregory and
// Delbourgo (1982),
//
//	u′ = G(u) = (u² + a·u(1−u)) / (1 + (a + b − 2)·u(1−u))
//	a = exp(−c₀),  b = exp(−c₁)
//
// G is strictly increasing with G(0) = 0, G(1) = 1, G′(0) = a and G′(1) = b:
// a strength c scales the panels at its end by about exp(−c). Zero leaves
// the law as it is; raising a strength moves every node toward its end. See
// Stretched.
//
// # The panel count
//
// A panel replaces the arc between its nodes by a straight line. The
// largest distance between the two over all panels (the chordal deviation
// of machining, about κh²/8 for a panel of length h where the curvature is
// κ) is the measure of how faithfully the panels trace the section; it is
// checkable with a ruler on a drawing and falls as 1/N² with the panel
// count N. Deviation measures it, sampling each arc at DeviationSamples−1
// interior points. Unless a count is given, Stations takes the fewest
// panels in [AutoMinPanels, AutoMaxPanels] whose deviation is at most
// Options.Tolerance, DefaultTolerance = 1e-4 of the chord by default (Count
// finds it by bisection); on a NACA 2412 that is 151 panels with cosine
// spacing, 123 with curvature spacing and 576 with uniform spacing.
//
// # Quality limits
//
// Measure warns when neighbouring panels differ in length by more than
// RatioLimit (3.5; plain cosine spacing has just under 3 at its ends), when the surface
// turns more than TurnLimitDeg (15°) between neighbouring panels, and when
// a panel is shorter than ShortLimit (1e-7) times the perimeter. These are
// judgement values of common practice.
//
// References:
//
//	de Boor, C., A Practical Guide to Splines, Springer (1978) (from memory).
//	Gregory, J. A. and Delbourgo, R., Piecewise rational quadratic
//	interpolation to monotonic data, IMA Journal of Numerical Analysis 2
//	(1982), pp. 123–130 (from memory; the properties of G used here are
//	checked in the tests).
//	Fritsch, F. N. and Butland, J., A method for constructing local
//	monotone piecewise cubic interpolants, SIAM J. Sci. Stat. Comput. 5
//	(1984), pp. 300–304 (the monotone inversion, from gonum/interp).
package repanel
