// Package vortexpanel implements the linear-strength vortex panel method for
// the inviscid, incompressible flow about a lifting section, with the Kutta
// condition at the trailing edge.
//
// The surface is divided into flat panels between the section's nodes. The
// vortex strength γ varies linearly along each panel and is continuous at the
// nodes, so a section of N panels has N+1 unknown node strengths γ₀ … γ_N
// (γ₀ on the upper and γ_N on the lower side of the trailing edge). The
// normal velocity is zero at the midpoint of every panel (N equations) and
// the Kutta condition γ₀ + γ_N = 0 closes the system.
//
// References:
//
//	Katz, J. and Plotkin, A., Low-Speed Aerodynamics, 2nd ed., Cambridge
//	University Press (2001), §11.4 (linear-strength vortex method).
//
// # Conventions
//
// Nodes follow the node order and normalised frame of package geometry (see
// geometry/doc.go): trailing edge, upper surface, leading edge, lower surface,
// trailing edge, counter-clockwise, unit chord from (0, 0) to (1, 0). The free
// stream is V∞ (cos α, sin α) with V∞ = 1 and α in radians. Force
// coefficients use the unit chord; Cm is about the quarter chord (0.25, 0),
// positive nose-up. Cp = 1 − (V/V∞)².
//
// γ is counted positive counter-clockwise, the sense of the node order; with
// the body's interior at rest, γ at a node is the surface velocity along the
// contour in the node direction, so γ < 0 on most of the upper surface, and
// the pressure coefficient at node k is Cp = 1 − γₖ². Results are given at
// the nodes.
//
// # Cusped trailing edge
//
// When the two panels at a sharp trailing edge make an angle below CuspAngle
// (a Joukowski section, say), they nearly coincide, and a pair of equal and
// opposite strengths γ₀ = −γ_N on them induces almost nothing: the Kutta
// condition leaves that pair undetermined and the system becomes nearly
// singular. For such a cusp the zero-normal-flow equations at the midpoints
// of the two trailing-edge panels are replaced by linear extrapolation of γ
// in arc length from the two neighbouring nodes,
//
//	γ₀ = γ₁ + (γ₁ − γ₂) s₀/s₁,  γ_N = γ_{N−1} + (γ_{N−1} − γ_{N−2}) s_{N−1}/s_{N−2},
//
// with the Kutta condition kept. Against the exact Joukowski solution this
// brings Cl from errors of about 10% to 0.1% at 160 panels (see the tests).
//
// # Blunt trailing edge
//
// When the first and last node differ, the gap between them is closed by a
// straight base panel carrying a constant source strength σ, one more
// unknown, with zero normal velocity at its midpoint as one more equation;
// the Kutta condition stays γ₀ + γ_N = 0 between the two trailing-edge nodes.
// This makes the body closed and impermeable at the base panel's midpoint
// while the base itself carries no vorticity, so the circulation (and Cl from
// Kutta–Joukowski) comes from the section's own surface only. The base
// panel's pressure is not integrated: a real base is a separated wake, so
// the difference between the Kutta–Joukowski and the pressure lift grows
// with the gap. The base source has a net outflow σ·gap, which the case
// reports; the stream function is then many-valued and is given with its
// branch cut along the wake strip downstream of the base.
//
// # Sweeps
//
// The influence matrix depends on the geometry only, so New builds and
// factors it once, and the solution is linear in (cos α, sin α): New
// computes the α = 0 and α = 90° solutions by two back-substitutions, and
// Solve obtains every angle of a sweep by superposition. A Solver keeps
// those two solutions, not the matrix. The pressure integrals, quadratic
// in γ, are quadratic forms in (cos α, sin α): New sums their coefficients
// once, and each angle's lift, drag and moment take a few operations
// instead of a pass over the panels.
//
// # Speed
//
// On amd64 with AVX2 and FMA the influence rows are built four panels at a
// time in assembly (influence_amd64.s), eight at a time where the CPU has
// AVX-512F, with the operations of the Go formulas in their order, so that
// the matrix is the same bit for bit: the logarithm is the math package's
// algorithm, the angle its atan2's polynomial with the argument reduced in
// one division (angle, within a unit in the last place of math.Atan2), and
// the panel length's divisions are multiplications by its reciprocal;
// elsewhere, and with the purego build tag, the Go formulas run. From 100 panels the rows are
// shared between goroutines. The matrix is factored by package
// internal/dense (blocked LU with partial pivoting on both cores, or
// OpenBLAS with the openblas build tag), whose condition estimate is the
// one Cond reports, and then goes back to a pool for the next New of the
// same size: a fresh matrix of megabytes costs page faults and zeroing.
package vortexpanel
