package report

import "strings"

// jacketHex is the screen colour drawn for a TIA-598 colour name. TIA-598 specifies the
// colours by Munsell notation; these sRGB values are close renderings chosen for contrast
// on a white map, not the standard's colorimetry.
var jacketHex = map[string]string{
	"blue":       "#1f5fbf",
	"orange":     "#f07f13",
	"green":      "#2e8b3a",
	"brown":      "#8b5a2b",
	"slate":      "#708090",
	"white":      "#f4f4f4",
	"red":        "#d62828",
	"black":      "#1b1b1b",
	"yellow":     "#f2c500",
	"violet":     "#7b3fb5",
	"rose":       "#e88aa7",
	"aqua":       "#00b3c4",
	"lime green": "#8cd316",
}

// copperHex is drawn for a medium without a TIA-598 colour (copper): TIA-598 covers
// optical fibre only, and copper jacket colours are site convention.
const copperHex = "#9a4f1b"

// unknownHex is drawn for a colour name the table does not know.
const unknownHex = "#888888"

// colourOf returns the drawn colour of a jacket colour name and the name shown beside it.
func colourOf(name string) (hex, label string) {
	n := strings.ToLower(strings.TrimSpace(name))
	if n == "" {
		return copperHex, "no TIA-598 colour"
	}
	if h, ok := jacketHex[n]; ok {
		return h, n
	}
	return unknownHex, n + " (not a TIA-598 colour name)"
}
