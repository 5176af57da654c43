package rating

import "testing"

// TestCounted: the noun agrees with the count (English grammar).
func TestCounted(t *testing.T) {
	for _, tc := range []struct {
		n    int
		want string
	}{{0, "0 profiles"}, {1, "1 profile"}, {2, "2 profiles"}} {
		if got := Counted(tc.n, "profile", "profiles"); got != tc.want {
			t.Errorf("Counted(%d) = %q, want %q", tc.n, got, tc.want)
		}
	}
}

// TestJoinAnd: a list in prose (English usage, no serial comma).
func TestJoinAnd(t *testing.T) {
	for _, tc := range []struct {
		w    []string
		want string
	}{{nil, ""}, {[]string{"a"}, "a"}, {[]string{"a", "b"}, "a and b"}, {[]string{"a", "b", "c"}, "a, b and c"}} {
		if got := JoinAnd(tc.w); got != tc.want {
			t.Errorf("JoinAnd(%q) = %q, want %q", tc.w, got, tc.want)
		}
	}
}
