// Package testsite is for tests: the demo campus loaded once, synthetic grid campuses of any
// size, and the small "pull grid" campus built from GeoJSON text at latitude 52 (invented).
package testsite
