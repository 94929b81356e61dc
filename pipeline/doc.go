// Package pipeline implements foilwright's reproducible pipeline file: it
// parses and checks the file (every error names the key path and its
// line:column), plans the work (inputs expanded, stages ordered by their
// dependencies), runs each input section through the geometry chain and the
// stages, and writes the run folder with its manifest. Verify re-runs a
// manifest and reports every output that no longer matches byte for byte.
//
// # The pipeline file
//
// A pipeline file is a JSON object:
//
//	{
//	  "foilwright": 1,
//	  "name": "mast-rotor",
//	  "inputs": [
//	    {"name": "r040", "files": ["scan/blade.stl"], "cut": "z=240", "station": 240},
//	    {"files": ["probe/*.csv"], "per_file": true, "columns": "2,3", "units": "in"}
//	  ],
//	  "prepare": {"units": "mm", "panels": 160, "spacing": "cosine", "te": "auto"},
//	  "stages": [
//	    {"id": "vortex", "stage": "vortex-panel", "params": {"alpha_deg": [0, 4, 8]}},
//	    {"id": "report", "stage": "./stages/report", "sha256": "…", "after": ["vortex"],
//	     "on_error": "continue", "timeout_s": 30}
//	  ],
//	  "outputs": {"folder": "runs/mast-rotor", "documents": ["section", "nodes", "results"]}
//	}
//
// Paths and globs are relative to the folder of the pipeline file. Each
// input is one section made from all its files, or, with "per_file", one
// section per matching file. "prepare" holds every prep option under its
// pipeline key (see prep.Settings); an input may override the reading keys
// (format, columns, units, cut, band, flat_tol). A stage sees the results of
// the stages it lists in "after", and only those.
//
// Stage keys: "id" (names results/<id>.json), "stage", "sha256" (pins an
// executable), "params" (any object, handed to the stage as written),
// "after", "on_error" ("stop", the default, fails the section; "continue"
// records the failure and skips only the stages that run after it) and
// "timeout_s", "env" (names of variables of foilwright's environment the
// stage may see, besides the minimal ones; recorded with their values in
// the manifest), "pins" (more files the stage depends on, path →
// sha256, checked with the file: a wrapper script's pin covers only the
// script, not the binary it runs; a folder's pin is its tree digest) and
// "keep" (the detail of results/<id>.json: "all", the default, "cases"
// without distributions and fields, or "scalars"; later stages and
// exports see everything). Output keys: "folder" (default runs/<name>), "documents"
// (any of "section", "nodes", "results"; all by default) and "plots" (a
// list of names, checked and recorded; artifacts the stages return are
// always written).
//
// # Comparing with the design
//
// A "compare" object, at the top level and per input, holds each section
// against its design (package compare): "design" (a reference shape such
// as "naca4:2412", or a file relative to the pipeline file), "design_units",
// "chord", "twist", "offset" ([x, y]), "align", "datum", "scale",
// "tolerance" (a number for ±, or "+a/-b"), "zones" ([{"name", "x": [from,
// to], "surface", "tolerance"}]), "alpha_deg", "cp_alpha", "aero" and
// "magnify". An input's keys override the top-level ones; its zones replace
// them. Each compared section gets compare.json and compare.csv
// (documents "compare") and its pictures (plots "compare"); the manifest
// records the settings, the design file's sha256 and the verdict with its
// figures, and verdicts.csv at the root of the run folder is the batch
// table of verdicts. The aerodynamic comparison runs the built-in
// vortex-panel and thin-aerofoil stages through the worker's StageRunner.
//
// # Checks
//
// Parse reports every problem it finds, not only the first, each as
// file:line:column: key path: reason — invalid JSON, unknown and duplicate
// keys (also inside "params"), wrong types, values out of range, files and
// globs that match nothing, duplicate or unknown stage ids, dependency
// cycles, stages that are neither built in nor an executable, and (given
// ParseOptions.Describe) parameters a built-in stage would refuse. A file
// past the json-bytes limit or nested past json-depth is refused first, in
// one pass, at the bracket that goes too deep. A UTF-8 byte-order mark is
// read past. Run checks an external stage's parameters against its
// description before any section is made.
//
// # Running
//
// Run makes the sections with a Preparer and runs the stages through a
// StageRunner, one per worker. A section that fails is reported with its
// reason and does not touch the others. When the context is cancelled, the
// sections already done keep their outputs, the one under way writes
// nothing, and the manifest says the run was interrupted.
//
// # The run folder
//
// One subfolder per section, named after it, holding section.json,
// nodes.dat, results/<stage-id>.json, compare.json and compare.csv, and the
// artifacts the stages returned under plots/; manifest.json (and
// verdicts.csv, stations.svg) at the root. Two runs of the same pipeline
// over the same inputs with the same stages give identical bytes in every
// file, except the "timings" field of the manifest.
//
// A run folder is committed as a whole (folder.go): the run is written
// into a staging folder beside it and swapped into place at the end, so a
// crash at any moment leaves the earlier run whole and no half new one. A
// replacement (RunOptions.Replace) is kept only when every section
// succeeded; a folder holding anything an earlier run did not write (a
// symbolic link, a file its manifest does not list) is never replaced, and
// nothing is ever deleted through a symbolic link. A lock file beside the
// folder holds the process id of the run writing it; a second run into the
// same folder is refused (ErrFolderLocked).
//
// Verify hashes the run folder on disk against the manifest and re-runs it,
// naming every file that differs in either.
package pipeline
