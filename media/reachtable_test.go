package media

import (
	"bytes"
	"strings"
	"testing"
)

// TestReachTable: beside IEEE 802.3's ranges, `spanwright media` says how far a plan with the
// default design goes (verify 18 V7). 10GBASE-SR on OM3: (2.6 dB, IEEE 802.3 Clause 52 −
// 2 × 0.5 dB design pairs − 2 × 0.3 dB pigtail splices − 0.5 dB margin, 2 × (0.75 − 0.5) to
// the ANSI/TIA-568.3-D maxima) / 3.5 dB/km = 143 m (from memory: IEEE's channel loss,
// TIA-568.3-D's multimode attenuation); on OM4 (2.9 dB) 229 m. 25GBASE-SR on OM3 allows
// 1.8 dB (IEEE 802.3 Clause 112, from memory), less than the 2.1 dB of connections and margin
// alone: none.
func TestReachTable(t *testing.T) {
	t.Parallel()
	var b bytes.Buffer
	if err := DefaultCatalog().ReachTable(&b, 0); err != nil {
		t.Fatal(err)
	}
	rows := map[string][]string{}
	for _, line := range strings.Split(b.String(), "\n") {
		if f := strings.Fields(line); len(f) == 4 {
			rows[f[0]+" "+f[1]] = f[2:]
		}
	}
	for key, want := range map[string][2]string{
		"10G om3": {"143", "143"},
		"10G om4": {"229", "229"},
		"25G om3": {"none", "none"},
	} {
		if got := rows[key]; len(got) != 2 || got[0] != want[0] || got[1] != want[1] {
			t.Errorf("%s: %v, want inside %s, between %s:\n%s", key, got, want[0], want[1], b.String())
		}
	}
	if got := rows["10G os2"]; len(got) != 2 || got[0] == "none" || got[1] == "none" {
		t.Errorf("10G os2: %v, want a reach both inside and between buildings", got)
	}
}
