// Package campaign runs the robustness campaign of the geometry chain
// (issue 10): generated scans with known truth (internal/scangen) go
// through the chain in process, as `foilwright prep` would take them, and
// each section is compared with the truth. The records add up to the
// table of issue 10 (Figures, WriteTable), breakdowns by kind of input
// (WriteBreakdowns) and the failure messages (WriteFailures).
//
// # Measures
//
// All in the tool's own convention (leading edge = the outline point
// farthest from the trailing-edge point), so the convention's offset on a
// cambered NACA section is not counted as error:
//
//   - success: the chain returned a section (the command would exit 0);
//     overall and for well-sampled cases (≥ 300 good points, gap σ ≤ 0.5,
//     and no missing stretch or sparse zone, which the generator adds);
//   - chord error (relative), twist error (the angle between the true and
//     the stated chord line, in space for 3D points, so the mirror flag and
//     the plane basis the tool picks do not matter), leading-edge position
//     error, and the node error: the largest distance of a section node from
//     the true normalised outline, in chords;
//   - wrong: exit 0 with the chord off by more than 0.5 %, the twist by
//     more than 0.2° or a node by more than 0.005 c, beyond the section's own
//     stated uncertainty (the document's "uncertainty" key, missing = 0);
//   - trailing-edge kind: sharp, blunt or rounded as the truth, with a
//     base or rounding smaller than four times the scatter of the points
//     allowed to read as sharp; "open" is never right; the rate is over
//     the cases whose points decide the kind, and those they cannot are
//     counted apart, under two judgements that read only the truth and
//     the points as drawn, never the section: stop 23's (teUndecidable:
//     a rounded end with fewer than three points on its arc, a blunt base
//     with none on it whose surfaces, carried on to where they meet, leave
//     a gap round the end that the spacing of the last points allows;
//     teIndistinct: noise that hides a base from an arc or an arc from a
//     corner) and stop 26's (teJudge: one likelihood-ratio test of the
//     truth against the best end of every other kind, the points'
//     positions and the gap round the end, at 95 %); -rejudge makes both
//     again on the records of any run;
//   - good points dropped (any drop but a duplicate merge, lines of
//     duplicate pairs and repeated stretches left out) and planted
//     outliers caught;
//   - stated uncertainty covering the true error, per figure;
//   - lift: on the Kármán–Trefftz lift cases, Cl at 4° from the vortex-panel
//     solver on a 200-panel section against the exact solution by
//     conformal mapping, for the same physical flow, and the Cp RMS error
//     for 0.02 ≤ x ≤ 0.95.
//
// chain.go is the only file that calls the chain; lift.go the only one
// that calls the solver.
package campaign
