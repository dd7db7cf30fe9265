package workbook

import (
	"strconv"
	"testing"
)

func TestReader(t *testing.T) {
	t.Parallel()
	data, err := sample().Bytes()
	if err != nil {
		t.Fatal(err)
	}
	r, err := Open(data)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	if got := r.Sheets(); len(got) != 2 || got[0] != "links" || got[1] != "totals" {
		t.Errorf("sheets: got %v", got)
	}
	cases := []struct {
		name, sheet, ref string
		value, formula   string
		calc             string
	}{
		{"header", "links", "B1", "length (m)", "", "length (m)"},
		{"number", "links", "B2", "412.35", "", "412.35"},
		{"money in currency units", "links", "D2", "12345.67", "", "12345.67"},
		{"boolean", "links", "E3", "0", "", "FALSE"},
		{"formula, its cached value stored", "totals", "B3", "12345.72", "SUM('links'!$D$2:$D$4)", "12345.72"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			v, err := r.Value(tc.sheet, tc.ref)
			if err != nil || v != tc.value {
				t.Errorf("%s: value got %q (%v), want %q", tc.name, v, err, tc.value)
			}
			f, err := r.Formula(tc.sheet, tc.ref)
			if err != nil || f != tc.formula {
				t.Errorf("%s: formula got %q (%v), want %q", tc.name, f, err, tc.formula)
			}
			c, err := r.Calc(tc.sheet, tc.ref)
			if err != nil || c != tc.calc {
				t.Errorf("%s: calculated got %q (%v), want %q", tc.name, c, err, tc.calc)
			}
		})
	}
	// An edited input moves the formula's result.
	if err := r.SetNumber("links", "D2", 100); err != nil {
		t.Fatal(err)
	}
	c, err := r.Calc("totals", "B3")
	if got, _ := strconv.ParseFloat(c, 64); err != nil || got != 100.05 {
		t.Errorf("after the edit: got %q (%v), want 100.05", c, err)
	}
	rows, err := r.Rows("links")
	if err != nil || len(rows) != 4 || rows[1][0] != "ADM-LIB" {
		t.Errorf("rows: got %v (%v)", rows, err)
	}
	if _, err := r.Value("nope", "A1"); err == nil {
		t.Errorf("unknown sheet: no error")
	}
	if _, err := Open([]byte("not a workbook")); err == nil {
		t.Errorf("open garbage: no error")
	}
}
