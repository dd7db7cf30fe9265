package input

import (
	"errors"
	"math"
	"testing"
)

func TestRange(t *testing.T) {
	t.Parallel()
	metres := Range{Min: 0, Max: 1000, Unit: "metres"}
	above := Range{Min: 0, Max: 10, AboveMin: true, Unit: "metres"}
	count := Range{Min: 1, Max: 10000, Whole: true}
	cases := []struct {
		name string
		r    Range
		x    float64
		want string // "" when x is in range
	}{
		// IEEE 754: NaN compares false with everything, so "x < 0" lets it through.
		{"NaN", metres, math.NaN(), "want metres from 0 to 1000, got NaN"},
		{"+Inf", metres, math.Inf(1), "want metres from 0 to 1000, got +Inf"},
		{"-Inf", metres, math.Inf(-1), "got -Inf"},
		{"huge", metres, 1e308, "got 1e+308"},
		{"negative", metres, -0.5, "got -0.5"},
		{"lower end", metres, 0, ""},
		{"upper end", metres, 1000, ""},
		{"lower end excluded", above, 0, "want metres above 0 and at most 10, got 0"},
		{"just above", above, 1e-9, ""},
		{"fraction where whole wanted", count, 1.5, "want an integer from 1 to 10000, got 1.5"},
		{"whole", count, 12, ""},
	}
	for _, tc := range cases {
		err := tc.r.Check(tc.x)
		switch {
		case tc.want == "" && err != nil:
			t.Errorf("%s: got %v, want nil", tc.name, err)
		case tc.want != "" && (err == nil || !errors.Is(err, ErrOutOfRange) || !contains(err.Error(), tc.want)):
			t.Errorf("%s: got %v, want %q", tc.name, err, tc.want)
		}
	}
	// A strand count past int64's float precision is printed exactly (Go spec: int64 range).
	if err := count.CheckInt(math.MaxInt64); err == nil || !contains(err.Error(), "got 9223372036854775807") {
		t.Errorf("MaxInt64: got %v", err)
	}
	if err := count.CheckInt(144); err != nil {
		t.Errorf("144: got %v", err)
	}
}

func contains(s, sub string) bool {
	for i := 0; i+len(sub) <= len(s); i++ {
		if s[i:i+len(sub)] == sub {
			return true
		}
	}
	return false
}
