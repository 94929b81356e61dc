package scangen

// Spec is a case: everything that decides a generated scan except the
// random draws, which come from the seed given to Generate. It encodes to
// JSON so a case can be written down and rerun.
type Spec struct {
	// Category names the kind of measurement the spec imitates (see Draw):
	// general, cmm, scan, cad, lift, dense.
	Category  string    `json:"category"`
	Shape     ShapeSpec `json:"shape"`
	Sampling  Sampling  `json:"sampling"`
	Noise     Noise     `json:"noise"`
	Defects   Defects   `json:"defects"`
	Order     Order     `json:"order"`
	Placement Placement `json:"placement"`
	File      FileSpec  `json:"file"`
}

// Sampling says where along the outline the points fall.
type Sampling struct {
	// Points is the number of points drawn on the outline, before
	// missing stretches take theirs away.
	Points int `json:"points"`
	// Sigma is the σ of the log-normal factor of each arc-length gap.
	Sigma float64 `json:"sigma"`
	// Wave is the amplitude of a slow random wave in the log of the point
	// density (a few periods round the outline).
	Wave float64 `json:"wave"`
	// Zone is "" (none), "nose" (a denser nose: the probe operator slows
	// there) or "sparse" (a stretch the scanner's beam grazed).
	Zone string `json:"zone,omitempty"`
	// ZoneFactor is the density at the zone's centre relative to
	// elsewhere: > 1 denser, < 1 sparser.
	ZoneFactor float64 `json:"zone_factor,omitempty"`
	// Missing stretches of the outline hold no point; each is MissingLen
	// of the perimeter long.
	Missing    int     `json:"missing,omitempty"`
	MissingLen float64 `json:"missing_len,omitempty"`
	// CAD, when set, replaces all of the above by the stations of a CAD
	// export: "cosine" (chord stations by the cosine law on a NACA
	// section, even steps of the circle angle on a Kármán–Trefftz one) or
	// "uniform" (even arc-length steps), PerSurface intervals a surface.
	CAD        string `json:"cad,omitempty"`
	PerSurface int    `json:"per_surface,omitempty"`
	// Surface, "upper" or "lower", is sampled SurfaceFactor times denser
	// than the other (a probe program with a finer step on one side, a
	// scanner that sees one side square on).
	Surface       string  `json:"surface,omitempty"`
	SurfaceFactor float64 `json:"surface_factor,omitempty"`
}

// Noise is the scatter of the points normal to the surface (and out of
// the plane of 3D points), a standard deviation: either a fraction of the
// chord or an absolute figure in millimetres.
type Noise struct {
	Chord float64 `json:"chord,omitempty"`
	MM    float64 `json:"mm,omitempty"`
	// Grazing makes the scatter vary along the outline: σ(t) = σ·(1 +
	// Grazing·(1 − |n·b|)) with n the surface normal and b the direction
	// of a scanner's beam at BeamDeg in the section's frame, so it is up to
	// 1 + Grazing times larger where the beam grazes the surface.
	Grazing float64 `json:"grazing,omitempty"`
	BeamDeg float64 `json:"beam_deg,omitempty"`
	// OffsetMM moves every point of the surface by the same distance along
	// its outward normal (negative: inward): the error of a probe-radius
	// compensation, systematic and invisible in the points themselves.
	OffsetMM float64 `json:"offset_mm,omitempty"`
	// StepMM quantises the written coordinates to multiples of the step
	// (a voxelised scan's stair steps), in millimetres; 0 leaves them.
	StepMM float64 `json:"step_mm,omitempty"`
	// Correlated, when set, adds scatter normal to the surface that
	// neighbouring points share (a mesh's noisy vertices, a scanner that
	// drifts); nil for none.
	Correlated *Correlated `json:"correlated,omitempty"`
}

// Defects are the lines that are not clean points of the outline.
type Defects struct {
	// Outliers is the share of points moved off the surface by 0.5–5 % of
	// the chord (at least ten times the noise), either side: probe slips.
	Outliers float64 `json:"outliers,omitempty"`
	// Bursts groups the outliers in runs of 2–4 neighbouring points off
	// by about the same distance, as a scanner's reflections leave them.
	Bursts bool `json:"bursts,omitempty"`
	// BurstMax is the longest run of a burst (0 means 4): clusters of
	// up to BurstMax neighbouring points.
	BurstMax int `json:"burst_max,omitempty"`
	// Repeat is the share of the perimeter measured a second time, at a
	// random place, written after the rest as a pass of its own and moved
	// by RepeatShiftMM (in a random direction) against the first.
	Repeat        float64 `json:"repeat,omitempty"`
	RepeatShiftMM float64 `json:"repeat_shift_mm,omitempty"`
	// Duplicates is the share of points written twice; NearShare of those
	// copies differ from their original by a hair (1e-7 to 3e-5 chord).
	Duplicates float64 `json:"duplicates,omitempty"`
	NearShare  float64 `json:"near_share,omitempty"`
	// CloseLoop repeats the first point at the end (a CAD export that
	// closes its polyline by repeating the start).
	CloseLoop bool `json:"close_loop,omitempty"`
	// Fixture, when set, is a fixture's face measured with the part (see
	// Fixture and WithFixture); Draw never sets it.
	Fixture *Fixture `json:"fixture,omitempty"`
}

// Order is the order of the lines in the file.
type Order struct {
	// Mode is "loop" (along the outline from a random start), "two-pass"
	// (upper surface nose to tail, then lower surface nose to tail, as a
	// probe program runs) or "shuffled".
	Mode    string `json:"mode"`
	Reverse bool   `json:"reverse,omitempty"` // a loop the other way round
	// Start is where a loop starts: "" anywhere, "nose" at the leading
	// edge, "te" exactly at the trailing-edge point.
	Start string `json:"start,omitempty"`
	// Overlap, for two passes, is the share of the perimeter the first
	// pass runs on past where the passes meet (Meet: "nose" or "te"),
	// over what the second pass measures again; the second pass is moved
	// by PassShiftMM in a random direction (the part re-seated or the
	// probe re-qualified between passes).
	Overlap     float64 `json:"overlap,omitempty"`
	Meet        string  `json:"meet,omitempty"`
	PassShiftMM float64 `json:"pass_shift_mm,omitempty"`
}

// Placement puts the normalised section onto the part.
type Placement struct {
	ChordMM  float64 `json:"chord_mm"`
	TwistDeg float64 `json:"twist_deg"` // nose-up, before the orientation
	// Orientation is "standard" (nose towards −x, upper side +y),
	// "reversed" (nose towards +x), "upside-down" or
	// "reversed-upside-down".
	Orientation string     `json:"orientation"`
	LEMM        [2]float64 `json:"le_mm"` // leading edge in the plane, mm
	// Plane is "" (2D points), "z" (3D points at a constant z) or
	// "tilted" (3D points in a plane tilted by TiltDeg about a horizontal
	// axis at SpinDeg, through a point at height ZMM).
	Plane   string  `json:"plane,omitempty"`
	ZMM     float64 `json:"z_mm,omitempty"`
	TiltDeg float64 `json:"tilt_deg,omitempty"`
	SpinDeg float64 `json:"spin_deg,omitempty"`
}

// FileSpec is the format of the file.
type FileSpec struct {
	// Format is "csv", "blank" (blank-separated columns), "tab",
	// "semicolon" (with decimal commas), "dxf-points" or "dxf-polyline".
	Format string `json:"format"`
	Units  string `json:"units"` // mm, m or in
	// Header is "none" (units in a comment), "names" (x,y[,z] and a units
	// comment), "units" (x [mm],y [mm]...), "idx" (idx,x,y,z) or "point"
	// (point,x,y).
	Header string `json:"header,omitempty"`
	// Decimals is the number of decimals written; -1 writes every digit.
	Decimals int `json:"decimals"`
	// Title is a text line (the section's name) written first, before
	// the header; "" writes none.
	Title string `json:"title,omitempty"`
	// CRLF ends lines with CR LF; BOM starts the file with a UTF-8 byte
	// order mark; Sci writes the numbers in scientific notation; Breaks
	// is the share of point lines followed by a blank or comment line;
	// TrailingSep ends every point line with the separator.
	CRLF        bool    `json:"crlf,omitempty"`
	BOM         bool    `json:"bom,omitempty"`
	Sci         bool    `json:"sci,omitempty"`
	Breaks      float64 `json:"breaks,omitempty"`
	TrailingSep bool    `json:"trailing_sep,omitempty"`
}
