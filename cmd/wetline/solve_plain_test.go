package main

import (
	"strings"
	"testing"
)

// A wide section's discharges are written in plain decimal, never
// 2.971e+04. Closed forms (Chow 1959, sections 3-2 and 6-4), for a
// rectangle 300 m wide, 10 m deep: critical Q = b·√(g·y³) = 29 709 m³/s;
// Manning at n 0.03, S 0.001: A 3000 m², R = 3000/320, Q = 14 060 m³/s.
func TestSolveWritesPlainDischarges(t *testing.T) {
	t.Parallel()
	out, errs, code := runCLI(t, "solve", "--shape", "rectangle:width=300", "--n", "0.03", "--slope", "0.001", "--stage", "10")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"the critical discharge is 29710 m3/s", "carries 14060 m3/s"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	if strings.Contains(out, "e+0") {
		t.Errorf("e-notation in\n%s", out)
	}
}
