package main

import (
	"os"
	"strings"
	"testing"
)

// The quick start of the README writes nothing into the repository's own
// folders: every output goes under runs/, which git ignores (the quick
// start once left section.json and four pictures in the root).
func TestQuickStartWritesUnderRuns(t *testing.T) {
	data, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	text := string(data)
	i := strings.Index(text, "## Quick start")
	if i < 0 {
		t.Fatal("README has no quick start")
	}
	block := text[i:]
	block = block[strings.Index(block, "```sh")+5:]
	block = block[:strings.Index(block, "```")]
	outputs := 0
	for _, line := range strings.Split(block, "\n") {
		fields := strings.Fields(line)
		for k := 0; k+1 < len(fields); k++ {
			switch fields[k] {
			case "-o", "--output", "--plot", "--nodes":
				outputs++
				if !strings.HasPrefix(fields[k+1], "runs/") {
					t.Errorf("quick start writes %s outside runs/: %s", fields[k+1], line)
				}
			}
		}
	}
	if outputs == 0 {
		t.Error("the quick start writes nothing: the test found no output")
	}
	ignore, _ := os.ReadFile("../../.gitignore")
	if !strings.Contains(string(ignore), "/runs/") {
		t.Error(".gitignore does not ignore runs/")
	}
}
