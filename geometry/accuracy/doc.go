// Package accuracy estimates how far a prepared section may be from the
// part it was measured from: 95 % bounds on the error of its chord, twist,
// leading edge and surface (Uncertainty, the section document's
// "uncertainty" key).
//
// The estimate is a resampling one. Replicas of the fit (curve.FitReport.
// Replica) take the fitted curve for the truth, displace its points by
// simulated noise of the fit's own noise figure, correlated along the
// outline as the fit's residuals are, and go through the rest
// of the chain (trailing-edge corner, edges, normalisation) as the section
// did; how far they scatter about the section measures the effect of the
// noise. The fits of every second point alone (curve.FitReport.Half)
// measure the error the spacing of the points leaves between them, which
// is all there is for exact data, and a second look at the noise that
// uses the real residuals. Each figure is the larger of the two, times a
// coverage factor set so that the bounds cover the true error in 95 % of
// the robustness campaign's cases (internal/campaign). The fits need
// only the fit report: Begin starts them on a goroutine of its own while
// the caller normalises the section, Finish hands it the section to
// measure them against, and Wait returns what Estimate would.
//
// Gaps in the sampling that the section cannot bridge (the nose sampled
// by one point) are reported with their size and the points either side
// (Gaps).
package accuracy
