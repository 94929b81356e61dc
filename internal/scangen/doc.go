// Package scangen generates synthetic section scans with known truth, for
// the robustness campaign of the geometry chain (internal/campaign).
//
// Everything it writes is invented: exact published shapes sampled and
// spoiled by a random model of how parts are measured. It is never
// measured data, and every file it writes says so in its first comment.
//
// # Truth
//
// A case is a Spec and a seed (Draw makes a random Spec from a seed;
// Generate turns Spec and seed into the bytes of a point file and its
// Truth; the same pair always gives the same bytes). The truth holds:
//
//   - the true closed outline in the normalised frame of the tool's
//     convention (Shape): exact pieces (closed-form surfaces, a straight
//     base, a circular arc) with a dense polyline for sampling and
//     nearest-point queries refined on the exact pieces;
//   - the frame in file units: chord, twist (degrees, positive nose-up),
//     leading edge and trailing-edge point (in space for 3D files) and
//     whether the part is a mirror image of the normalised section. The
//     convention is the tool's: the trailing-edge point is the corner of a
//     sharp edge, the midpoint of a blunt base, or the tip of a rounded end
//     (the outline point farthest from the leading edge), and the leading
//     edge is the outline point farthest from the trailing-edge point;
//   - the kind of trailing edge (sharp, blunt, rounded) and its thickness;
//   - every point line: its line number, whether it is a good point, a
//     planted outlier or a duplicate (and of which line), and the outline
//     parameter it was drawn at;
//   - the noise, the resolution of the written numbers and the largest
//     sampling gaps (anywhere, and at the nose).
//
// # Shapes
//
// NACA 4-digit sections from the equations of NACA Report 824, with the
// open (blunt) trailing edge of the standard coefficient a₄ = 0.1015 and
// the closed one of a₄ = 0.1036 (common practice), thickness 6–21 %,
// camber 0–6 % at 20–60 % chord. Kármán–Trefftz sections, the exact
// conformal image of a circle (Milne-Thomson, Theoretical Hydrodynamics,
// 5th ed., 1968), centre x −0.04 to −0.16, camber parameter 0–0.12,
// trailing-edge angle 3–20°; their exact potential flow is known, which the
// campaign uses for lift. Printed parts: the aft end of either, sharp or
// blunt, replaced by a circular arc of radius 0.2–1 % of the chord
// tangent to both surfaces, as a 3D printer leaves a thin trailing edge.
//
// # Measurement model
//
// Sampling. N arc-length gaps gᵢ = exp(σ zᵢ), zᵢ standard normal, σ from 0
// to 0.8 (neighbouring gaps then differ by ten times and more), laid end
// to end from a random start and carried through a point density with a
// slow random wave (amplitude up to 0.8 in its logarithm, one to four
// periods round the outline) and optionally a zone: a denser nose (2–5
// times, a probe operator slowing down) or a sparser stretch (0.15–0.5
// times, a scanner's beam grazing the surface), at the nose in a third of
// those cases. Some scans lose one or two stretches of 1–3 % of the
// perimeter altogether. 150 to 3000 points; dense scans of 1e5 points.
// CAD exports instead hold the stations of a drawing: 20 intervals a
// surface by the cosine law (NACA chord stations; even circle angle for
// Kármán–Trefftz) or even arc length, exact.
//
// Noise. Normal to the surface, Gaussian: a fraction of the chord (0 to
// 0.05 mm at 152 mm), or absolute: 0.002–0.01 mm for a coordinate-
// measuring machine, 0.02–0.05 mm for a laser scanner, 0.005 or 0.02 mm in
// the lift cases. 3D points get the same scatter out of their plane. The
// numbers are written with a fixed number of decimals (a CMM's four in
// millimetres, a scanner's three), except for CAD exports, which carry
// every digit.
//
// Defects. Up to 3 % of the points moved off the surface by 0.5–5 % of
// the chord (at least ten times the noise), outward or inward: probe slips,
// or, in half the laser scans and a fifth of the general cases, runs of
// 2–4 neighbouring points off by about the same distance (reflections).
// Up to 3 % written twice, exactly or a hair (1e-7 to 3e-5 chord) apart. CAD
// polylines may repeat their first point at the end.
//
// Order. Along the loop from a random start, either way round; two probe
// passes (upper surface nose to tail, then lower surface nose to tail); or
// shuffled.
//
// Placement. Chord 10 mm to 2 m; twist −25° to 35°; the nose towards −x or
// +x, the section upright or upside down; the leading edge anywhere within
// a metre of the origin; units mm, m or in. 3D points at a constant z or in
// a plane tilted by 3–40°.
//
// Files. Delimited text (commas, blanks, tabs, or semicolons with decimal
// commas) with the units in a comment or the header, a header naming the
// columns or none, and headers with extra columns (idx,x,y,z or point,x,y)
// that a reader must take by name; ASCII DXF with POINT entities or one
// LWPOLYLINE, the unit in $INSUNITS.
//
// # Categories
//
// Draw mixes six kinds of case: general (the sweep above, noise as a chord
// fraction), cmm (a probe program: 150–800 points, slower at the nose,
// often two passes, absolute CMM noise, 3D in a tilted fixture), scan (a
// slice of a laser scan of a printed blade: 300–3000 irregular points,
// grazing gaps and holes, unordered, rounded trailing edges), cad (40-point
// noise-free polylines), lift (Kármán–Trefftz sections, 1500 points, even
// or irregular, 0.005 or 0.02 mm noise at 120–200 mm chord, for the
// end-to-end lift check) and dense (1e5 points).
package scangen
