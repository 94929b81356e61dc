package pipeline

import (
	"fmt"
	"io"
	"strings"
)

// Write prints the summary for a person: one line per section with its
// status, then the reason of every failure and each stage that failed.
func (s *Summary) Write(w io.Writer) error {
	var b strings.Builder
	counts := map[string]int{}
	for _, r := range s.Sections {
		counts[r.Status]++
		fmt.Fprintf(&b, "%-9s %s", r.Status, r.Name)
		if r.Summary != "" {
			fmt.Fprintf(&b, ": %s", strings.ReplaceAll(strings.TrimSpace(r.Summary), "\n", "; "))
		}
		b.WriteByte('\n')
		if r.Err != "" {
			fmt.Fprintf(&b, "          %s\n", r.Err)
		}
		for _, st := range r.Stages {
			if st.Status == "failed" || st.Status == "skipped" {
				if st.Err != "" && !strings.Contains(r.Err, st.Err) {
					fmt.Fprintf(&b, "          stage %q %s: %s\n", st.ID, st.Status, st.Err)
				}
			}
		}
	}
	var compared []SectionReport
	for _, r := range s.Sections {
		if r.Compare != nil {
			compared = append(compared, r)
		}
	}
	if len(compared) > 0 {
		b.WriteString("verdicts against the design:\n")
		for _, r := range compared {
			b.WriteString(verdictLine(r) + "\n")
		}
	}
	fmt.Fprintf(&b, "%d section(s): %d ok", len(s.Sections), counts[StatusOK])
	for _, st := range []string{StatusPartial, StatusFailed, StatusCancelled} {
		if counts[st] > 0 {
			fmt.Fprintf(&b, ", %d %s", counts[st], st)
		}
	}
	if n := len(s.OutOfTolerance()); n > 0 {
		fmt.Fprintf(&b, ", %d out of tolerance", n)
	}
	if s.Kept {
		fmt.Fprintf(&b, "; the earlier run in %s was kept (a replacement is kept only when every section succeeds)\n", s.Folder)
	} else {
		fmt.Fprintf(&b, "; manifest %s\n", s.Manifest)
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// Write prints the verify report for a person: every difference, change
// and note, then the verdict.
func (r *VerifyReport) Write(w io.Writer) error {
	var b strings.Builder
	disk := 0
	for _, d := range r.Differences {
		where := "in the re-run"
		if d.OnDisk {
			where, disk = "on disk", disk+1
		}
		fmt.Fprintf(&b, "differs %s: %s\n", where, d)
	}
	for _, c := range r.Changes {
		fmt.Fprintf(&b, "changed: %s\n", c)
	}
	for _, n := range r.Notes {
		fmt.Fprintf(&b, "note: %s\n", n)
	}
	if r.Folder != "" {
		fmt.Fprintf(&b, "re-run kept in %s\n", r.Folder)
	}
	if r.OK() {
		fmt.Fprintf(&b, "reproduced: %d output(s) match %s, on disk and in the re-run\n", r.Checked, r.Manifest)
	} else {
		fmt.Fprintf(&b, "not reproduced: %d file(s) of the run folder differ from %s, %d output(s) of the re-run differ, %d section(s) changed\n",
			disk, r.Manifest, len(r.Differences)-disk, len(r.Changes))
	}
	_, err := io.WriteString(w, b.String())
	return err
}
