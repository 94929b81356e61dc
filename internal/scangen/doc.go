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
//     planted outlier, a duplicate (and of which line) or a repeat (a
//     stretch measured twice), and the outline parameter it was drawn at;
//   - the noise (RMS and largest along the outline), the compensation
//     error, the largest move of a second pass, the resolution of the
//     written numbers (decimals or stair steps) and the largest sampling
//     gaps (anywhere, and at the nose).
//
// # Shapes
//
// NACA 4-digit sections from the equations of NACA Report 824, with the
// open (blunt) trailing edge of the standard coefficient a₄ = 0.1015 and
// the closed one of a₄ = 0.1036 (common practice), thickness 3–40 % (6–21 %
// mostly, thin 3–6 % and thick 25–40 % as at a wind-turbine blade's root
// a sixth of the time each), camber 0–9 % at 20–60 % chord. NACA 5-digit
// sections (Report 824; Abbott and von Doenhoff, Theory of Wing Sections,
// 1959): the 4-digit thickness on the 230 mean line (m = 0.2025,
// k₁ = 15.957) or another of the report's lines, plain or reflexed (the
// reflexed constants from memory; the outline is the closed form of the
// constants used, so the truth is exact either way), at most 24 % thick
// as the family is tabulated (thick draws fold back to 18–24 %: thicker,
// the outline of a 230 line bows the other way and cannot be told from
// one measured upside down). NACA 4-digit-modified
// sections (Abbott and von Doenhoff, §6.5): the leading-edge radius index
// I from 2 to 9 (a nose radius from 0.1 to 2.3 times the 4-digit one), the
// maximum thickness at 30–60 %, the trailing-edge slope of their table or,
// a third of the time, a closed cusped edge (slope 0.01–0.06); the
// coefficients solved in closed form from the conditions that define the
// series. Flat-bottomed sections, constructed here: the closed 4-digit
// thickness yt laid vertically about the mean line yt·w(x/F), w the quintic
// smoothstep, so that the lower surface is exactly straight from F (10–35 %
// of the chord) to the trailing edge. Kármán–Trefftz sections, the exact
// conformal image of a circle (Milne-Thomson, Theoretical Hydrodynamics,
// 5th ed., 1968), centre x −0.04 to −0.16, camber parameter 0–0.12,
// trailing-edge angle 3–20° (0.5–3°, near a cusp, in a seventh of them);
// their exact potential flow is known, which the campaign uses for lift.
// Printed parts: the aft end of any of them, sharp or blunt, replaced by
// a circular arc of radius 0.2–1 % of the chord tangent to both surfaces,
// as a 3D printer leaves a thin trailing edge (made wider where it does
// not fit a cusped or thin edge).
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
// those cases. One surface may be sampled 5–20 times denser than the other
// (a finer probe step on one side). Some scans lose one or two stretches of
// 1–3 % of the perimeter altogether. 60 to 3000 points; dense scans of 1e5
// points. A loop starts anywhere, at the leading edge, or exactly at the
// trailing-edge point. CAD exports instead hold the stations of a drawing:
// 20 intervals a surface by the cosine law (chord stations of the closed
// forms; even circle angle for Kármán–Trefftz) or even arc length, exact.
//
// Noise. Normal to the surface, Gaussian: a fraction of the chord (0 to
// 0.05 mm at 152 mm), or absolute: 0.002–0.02 mm for a coordinate-
// measuring machine, 0.02–0.1 mm for a laser scanner, 0.005 or 0.02 mm in
// the lift cases. Where a scanner's beam grazes the surface the scatter
// grows, σ(t) = σ·(1 + G·(1 − |n·b|)) with G 1–4 (n the normal, b the
// beam). 3D points get the same scatter out of their plane. A probe-radius
// compensation error moves every point by the same 0–0.05 mm (at most
// 0.2 % of the chord) along its normal, outward or inward: a systematic
// error the points cannot show, counted against the chain. The numbers are
// written with a fixed number of decimals (a CMM's four in millimetres, a
// scanner's three), except for CAD exports, which carry every digit; a
// voxelised scan writes them on a grid of 0.05–0.2 mm (at most 0.2 % of the
// chord), stair steps along the outline.
//
// Correlated noise. Some scans carry scatter that neighbouring points
// share, which their local fits cannot see: a wander, a smooth random
// offset along the outline with a Gaussian covariance whose correlation
// length is 3–30 mean point gaps, 0.5–2 times the independent scatter, on
// top of it (a hand-held scanner drifting as it sweeps); or a mesh slice,
// the cut of a strip of triangles whose vertices carry the scanner's noise
// (0.7–1.5 times the category's), where each point of the cut mixes the
// noise of the two vertices of the edge it crosses, written in the order
// the cut chains them round the loop; in half of them the station lies
// near a row of vertices (within 3 % of the rows' spacing), and the cut
// leaves its points in near pairs. What stays independent in a mesh slice
// is at most 0.3 of the category's scatter. Scan slices carry it in half the
// cases (mostly the mesh form), voxelised and dense scans in 0.3, the
// general sweep in 0.15. Whether a case carries it and its form and size
// are drawn from a random stream of their own, as is the noise itself, so
// the draws and the file of every case without it are those of a
// generator without it. The true surface stays the noise-free outline:
// the facets' own departure from it is the mesh's, and is left out.
//
// Defects. Up to 5 % of the points moved off the surface by 0.5–5 % of
// the chord (at least ten times the noise), outward or inward: probe slips,
// or runs of 2–4 (up to 8 in clusters) neighbouring points off by about
// the same distance (reflections). Up to 3 % written twice, exactly or a
// hair (1e-7 to 3e-5 chord) apart. A stretch of 5–20 % of the perimeter may
// be measured again (fresh points and noise) and written after the rest,
// moved by up to 0.02 mm (0.05 % of the chord) against it. CAD polylines
// may repeat their first point at the end.
//
// Order. Along the loop, either way round; two probe passes (upper
// surface nose to tail, then lower surface nose to tail), which may
// overlap by 0.5–3 % of the perimeter at the nose or the tail (the first
// pass runs on over what the second measures again) with the second pass
// moved by 0.005–0.03 mm (at most 0.05 % of the chord); or shuffled.
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
// LWPOLYLINE, the unit in $INSUNITS. The habits of the programs that write
// them: CR LF line ends (a fifth of the files), a UTF-8 byte order mark, the
// numbers in scientific notation, a title line (the section's name) before
// everything, blank and comment lines between the points, a separator
// ending every point line.
//
// Every line's truth says what it is: a good point, an outlier, a
// duplicate, a repeat (a second measurement of a stretch another pass
// measured too, with its pass's move, Truth.Shift), or a point of a
// fixture's face (Defects.Fixture: a clamp's jaw 0.01–0.15 chord below the
// section or beyond an edge, which Draw never sets and WithFixture adds
// from a random stream of its own).
//
// # Categories
//
// Draw mixes nine kinds of case: general (the sweep above, noise as a
// chord fraction, outliers up to 5 %), cmm (a probe program: 150–800
// points, slower at the nose, often two passes, absolute CMM noise, 3D in
// a tilted fixture), scan (a slice of a laser scan of a printed blade:
// 300–3000 irregular points, noise to 0.1 mm growing where the beam
// grazes, grazing gaps and holes, unordered, rounded trailing edges),
// cad (40-point noise-free polylines), lift (Kármán–Trefftz sections,
// 1500 points, even or irregular, 0.005 or 0.02 mm noise at 120–200 mm
// chord, for the end-to-end lift check), dense (1e5 points), sparse
// (60–150 points), voxel (a voxelised scan: stair-stepped coordinates,
// grazing noise, 500–3000 points) and passes (a probe program in
// overlapping passes apart, a stretch measured again, a compensation
// error, one surface denser, clusters of outliers).
package scangen
