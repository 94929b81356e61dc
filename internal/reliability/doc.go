// Package reliability is the reliability campaign of the command line: it
// builds a catalogue of bad inputs for every reader and the pipeline file,
// stage faults (crashes, hangs in start and in run, garbage on stdout,
// oversize replies, bad documents, shell wrappers without exec,
// grandchildren, a stage that ignores SIGTERM, one that eats memory, …),
// Ctrl-C at three moments, concurrent runs into one folder, and symlinks
// and special files as inputs and outputs; it runs each case against a
// foilwright binary as a user would (a process of its own, in a folder of
// its own) and tallies the outcomes in the tables of issue 11.
//
// Every case runs with a cap on its data segment (CapBytes, not under the
// race detector) and on its time, so that a defect costs the machine at
// most that; a case that reaches either counts as over the figure the
// table names. After each case the runner compares the case's folder with
// the snapshot taken before (a new file after a failure is a partial
// output; a file changed, removed or of another type is a replaced target)
// and looks for processes the case left behind: fault stages and their
// grandchildren carry the case folder on their command line, built-in
// stages run from the campaign's own copy of the binary.
//
// Case folders hold invented data only (NACA 2412 from the NACA Report
// 824 equations, scaled to an invented chord), never measured data.
//
// The fast part of the catalogue runs in the normal test suite
// (cmd/foilwright, TestReliabilityCampaign); all of it, with the large
// inputs, runs from scripts/reliability.sh.
package reliability
