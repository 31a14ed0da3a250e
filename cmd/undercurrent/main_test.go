package main

import (
	"bytes"
	"context"
	"strings"
	"testing"
)

// runArgs runs the command line in-process with buffers, as restic's tests do.
func runArgs(t *testing.T, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var out, errb bytes.Buffer
	e := &env{stdin: strings.NewReader(""), stdout: &out, stderr: &errb, quiet: true}
	code = run(context.Background(), e, args)
	return code, out.String(), errb.String()
}

// The exit-status table is the project's own, documented in every command's help (after the
// go command's convention of 2 for usage errors).
func TestExitCodes(t *testing.T) {
	tests := []struct {
		args []string
		code int
		out  string
	}{
		{nil, exitUsage, ""},
		{[]string{"--version"}, exitOK, "undercurrent " + version},
		{[]string{"help"}, exitOK, "Commands:"},
		{[]string{"no-such-command"}, exitUsage, ""},
		{[]string{"help", "no-such-command"}, exitUsage, ""},
	}
	for _, tt := range tests {
		code, out, _ := runArgs(t, tt.args...)
		if code != tt.code {
			t.Errorf("%v: exit %d, want %d", tt.args, code, tt.code)
		}
		if !strings.Contains(out, tt.out) {
			t.Errorf("%v: stdout %q lacks %q", tt.args, out, tt.out)
		}
	}
}

// Every subcommand has help with an example and the exit-status table.
func TestEveryCommandHasHelp(t *testing.T) {
	for _, c := range commands {
		code, out, _ := runArgs(t, c.name, "-h")
		if code != exitOK {
			t.Errorf("%s -h: exit %d", c.name, code)
		}
		for _, want := range []string{"usage: undercurrent " + c.name, "Example", "Exit status"} {
			if !strings.Contains(out, want) {
				t.Errorf("%s -h: help lacks %q", c.name, want)
			}
		}
	}
}

// cautionItems turns the redactor's caution text (a paragraph, "- " bullets with indented
// continuation lines, a closing paragraph) into one report item each.
func TestCautionItems(t *testing.T) {
	in := "Intro line one\nline two:\n- first bullet\n  continued\n- second\nClosing one\nclosing two."
	want := []string{"Intro line one line two:", "first bullet continued", "second", "Closing one closing two."}
	got := cautionItems(in)
	if strings.Join(got, "|") != strings.Join(want, "|") {
		t.Fatalf("cautionItems = %q, want %q", got, want)
	}
}

// displayText removes the HTML residue records systems leave (tags and entities, as listed
// in the HTML 4.01 entity set for &nbsp; and &amp;) and keeps everything else.
func TestDisplayText(t *testing.T) {
	tests := []struct{ in, want string }{
		{"plain text, 10-8.", "plain text, 10-8."},
		{"<p>Extra patrol.</p>", " Extra patrol. "},
		{"cleared.<br />Next", "cleared. Next"},
		{"Smith &amp; Sons&nbsp;lot", "Smith & Sons\u00a0lot"},
		{"a < b and c > d", "a < b and c > d"},
		{"<script>x</script>", " x "},
	}
	for _, tt := range tests {
		if got := displayText(tt.in); got != tt.want {
			t.Errorf("displayText(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}
