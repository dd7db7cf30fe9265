// Package input reads the files spanwright is given and holds the checks every input format
// shares: regular files only, up to a size cap; no key given twice in a JSON object or a YAML
// mapping; numbers finite and within a stated range; YAML read strictly (Decoder). Every
// problem with an input is one *Problem, and the problems of a run one Problems.
//
// It imports no package of ours, so geo, media, route and route/sweep all use it.
package input
