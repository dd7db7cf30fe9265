package geo

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"iter"
	"math"
	"slices"
	"strconv"
	"unicode/utf8"

	"github.com/paulmach/orb"
)

// Step is one span of a route, taken From → To, or To → From when Reverse is set.
type Step struct {
	SpanID  string
	Reverse bool
}

// RouteFeature is one route to draw: from a building's access, along spans, to a building's
// access. FromBuilding or ToBuilding may be "" for a route that starts or ends at a junction.
// Props become the feature's properties as they are (nil writes {}).
type RouteFeature struct {
	FromBuilding, ToBuilding string
	// FromEntrance and ToEntrance name the entrances (Entry IDs) the route uses at each
	// building; "" means the building's Access.
	FromEntrance, ToEntrance string
	Steps                    []Step
	Props                    map[string]any
}

// entranceOf is building b's entrance named id, or its Access when id is "".
func (n *Network) entranceOf(b, id string) (Access, bool) {
	if id == "" {
		return n.AccessOf(b)
	}
	e, ok := n.Entry(b, id)
	return e.Access, ok
}

// CoordDecimals is how many decimals of a degree the writers keep (1e-7° is about 1 cm).
const CoordDecimals = 7

// RouteLine returns the geometry of f: the from-building's lateral, the spans in travel
// direction and the to-building's lateral reversed, with repeated vertices dropped after
// rounding to CoordDecimals. It fails when a building or span is unknown or when consecutive
// steps do not meet at a junction. The line has fewer than two points only when the route
// has no steps and no lateral.
func (n *Network) RouteLine(f RouteFeature) (orb.LineString, error) {
	var pts orb.LineString
	add := func(ls orb.LineString) {
		for _, p := range ls {
			p = roundPoint(p)
			if len(pts) == 0 || pts[len(pts)-1] != p {
				pts = append(pts, p)
			}
		}
	}
	cur := ""
	if f.FromBuilding != "" {
		a, ok := n.entranceOf(f.FromBuilding, f.FromEntrance)
		if !ok {
			return nil, fmt.Errorf("geo: route from unknown building %q or entrance %q", f.FromBuilding, f.FromEntrance)
		}
		add(a.Lateral)
		cur = a.Junction
	}
	for i, st := range f.Steps {
		s, ok := n.Span(st.SpanID)
		if !ok {
			return nil, fmt.Errorf("geo: step %d: unknown span %q", i+1, st.SpanID)
		}
		from, to, line := s.From, s.To, s.Line
		if st.Reverse {
			from, to, line = s.To, s.From, reversed(s.Line)
		}
		if cur != "" && from != cur {
			return nil, fmt.Errorf("geo: step %d: span %q (reverse %v) starts at junction %q, want %q", i+1, s.ID, st.Reverse, from, cur)
		}
		add(line)
		cur = to
	}
	if f.ToBuilding != "" {
		a, ok := n.entranceOf(f.ToBuilding, f.ToEntrance)
		if !ok {
			return nil, fmt.Errorf("geo: route to unknown building %q or entrance %q", f.ToBuilding, f.ToEntrance)
		}
		if cur != "" && a.Junction != cur {
			return nil, fmt.Errorf("geo: route ends at junction %q, but building %q is reached at %q", cur, f.ToBuilding, a.Junction)
		}
		add(reversed(a.Lateral))
	}
	return pts, nil
}

func reversed(ls orb.LineString) orb.LineString {
	out := make(orb.LineString, len(ls))
	for i, p := range ls {
		out[len(ls)-1-i] = p
	}
	return out
}

func roundPoint(p orb.Point) orb.Point {
	return orb.Point{roundCoord(p[0]), roundCoord(p[1])}
}

func roundCoord(x float64) float64 {
	r := math.Round(x*1e7) / 1e7
	if r == 0 {
		return 0 // no "-0"
	}
	return r
}

// Rounded returns a copy of g with every coordinate rounded to CoordDecimals, as the writers
// keep them: an orb.Point, orb.LineString, orb.Polygon or orb.MultiPolygon; any other
// geometry is returned as it is.
func Rounded(g orb.Geometry) orb.Geometry {
	line := func(ls []orb.Point) []orb.Point {
		out := make([]orb.Point, len(ls))
		for i, p := range ls {
			out[i] = roundPoint(p)
		}
		return out
	}
	poly := func(p orb.Polygon) orb.Polygon {
		out := make(orb.Polygon, len(p))
		for i, r := range p {
			out[i] = orb.Ring(line(r))
		}
		return out
	}
	switch t := g.(type) {
	case orb.Point:
		return roundPoint(t)
	case orb.LineString:
		return orb.LineString(line(t))
	case orb.Polygon:
		return poly(t)
	case orb.MultiPolygon:
		out := make(orb.MultiPolygon, len(t))
		for i, p := range t {
			out[i] = poly(p)
		}
		return out
	}
	return g
}

func fmtCoordOut(x float64) string {
	return strconv.FormatFloat(roundCoord(x), 'f', -1, 64)
}

// WriteRoutes writes feats as a GeoJSON FeatureCollection, one LineString feature per route
// (see RouteLine; a route of fewer than two points gets a null geometry), one feature per
// line. The output depends only on the network and feats: property keys are sorted and
// coordinates rounded to CoordDecimals. It fails, writing nothing, on an unknown building or
// span, steps that do not meet, or properties JSON cannot encode (such as NaN).
func (n *Network) WriteRoutes(w io.Writer, feats []RouteFeature) error {
	return n.WriteRoutesContext(context.Background(), w, feats)
}

// routeCheckEvery is how many routes WriteRoutesContext renders between two looks at the
// context.
const routeCheckEvery = 64

// WriteRoutesContext is WriteRoutes that gives up when ctx is done, every routeCheckEvery
// routes, returning ctx's error and writing nothing.
func (n *Network) WriteRoutesContext(ctx context.Context, w io.Writer, feats []RouteFeature) error {
	var buf bytes.Buffer
	if err := n.WriteRoutesSeq(ctx, &buf, nil, slices.Values(feats)); err != nil {
		return err
	}
	_, err := w.Write(buf.Bytes())
	return err
}

// routesPiece is how many bytes WriteRoutesSeq gathers before it writes them.
const routesPiece = 64 << 10

// WriteRoutesSeq is WriteRoutesContext for routes given one at a time, each written (in
// pieces of about routesPiece bytes) before the next is asked for, so that neither the
// routes nor the file are held whole: on failure w may hold part of the file. members are
// text members of the collection itself (GeoJSON's foreign members, RFC 7946 §6.1), each a
// key and its value, written in their order before the features.
func (n *Network) WriteRoutesSeq(ctx context.Context, w io.Writer, members [][2]string, feats iter.Seq[RouteFeature]) error {
	var buf bytes.Buffer
	buf.WriteString(`{"type":"FeatureCollection",`)
	for _, m := range members {
		k, _ := json.Marshal(m[0]) // a string always encodes
		v, _ := json.Marshal(m[1])
		buf.Write(k)
		buf.WriteByte(':')
		buf.Write(v)
		buf.WriteByte(',')
	}
	buf.WriteString(`"features":[`)
	i := 0
	for f := range feats {
		if i%routeCheckEvery == 0 {
			if err := ctx.Err(); err != nil {
				return err
			}
		}
		ls, err := n.RouteLine(f)
		if err != nil {
			return fmt.Errorf("route %d (%s to %s): %w", i+1, f.FromBuilding, f.ToBuilding, err)
		}
		if i > 0 {
			buf.WriteByte(',')
		}
		buf.WriteString("\n")
		if err := writeFeature(&buf, ls, f.Props); err != nil {
			return fmt.Errorf("route %d (%s to %s): %w", i+1, f.FromBuilding, f.ToBuilding, err)
		}
		if buf.Len() >= routesPiece {
			if _, err := w.Write(buf.Bytes()); err != nil {
				return err
			}
			buf.Reset()
		}
		i++
	}
	buf.WriteString("\n]}\n")
	_, err := w.Write(buf.Bytes())
	return err
}

// WriteNetwork writes the network as a GeoJSON FeatureCollection for inspection: every span
// as a LineString (properties id, pathway, from, to, length_m to the centimetre, type,
// status, bends_deg to a tenth of a degree), then every junction as a Point (id, kind,
// structure_type), then every lateral (building, junction, via, length_m), each group in ID
// order, one feature per line.
func (n *Network) WriteNetwork(w io.Writer) error {
	bw := bufio.NewWriter(w)
	var buf bytes.Buffer
	bw.WriteString(`{"type":"FeatureCollection","features":[`)
	first := true
	emit := func(g orb.Geometry, props map[string]any) error {
		buf.Reset()
		if !first {
			buf.WriteByte(',')
		}
		first = false
		buf.WriteString("\n")
		if err := writeFeature(&buf, g, props); err != nil {
			return err
		}
		_, err := bw.Write(buf.Bytes())
		return err
	}
	for _, s := range n.Spans {
		bends := make([]float64, len(s.BendsDeg))
		for i, b := range s.BendsDeg {
			bends[i] = math.Round(b*10) / 10
		}
		if err := emit(s.Line, map[string]any{
			"id": s.ID, "pathway": s.PathwayID, "from": s.From, "to": s.To,
			"length_m": math.Round(s.LengthM*100) / 100, "type": s.Type, "status": s.Status, "bends_deg": bends,
		}); err != nil {
			return fmt.Errorf("span %q: %w", s.ID, err)
		}
	}
	for _, j := range n.Junctions {
		props := map[string]any{"id": j.ID, "kind": j.Kind}
		if j.StructureType != "" {
			props["structure_type"] = j.StructureType
		}
		if err := emit(j.Point, props); err != nil {
			return fmt.Errorf("junction %q: %w", j.ID, err)
		}
	}
	for _, a := range n.Access {
		if len(a.Lateral) < 2 {
			continue
		}
		if err := emit(a.Lateral, map[string]any{
			"building": a.Building, "junction": a.Junction, "via": a.Via, "length_m": math.Round(a.LateralM*100) / 100,
		}); err != nil {
			return fmt.Errorf("lateral of %q: %w", a.Building, err)
		}
	}
	bw.WriteString("\n]}\n")
	return bw.Flush()
}

// writeFeature writes one GeoJSON Feature with a Point or LineString geometry (or null).
func writeFeature(buf *bytes.Buffer, g orb.Geometry, props map[string]any) error {
	buf.WriteString(`{"type":"Feature","geometry":`)
	switch t := g.(type) {
	case orb.Point:
		buf.WriteString(`{"type":"Point","coordinates":`)
		writePos(buf, t)
		buf.WriteString(`}`)
	case orb.LineString:
		if len(t) < 2 {
			buf.WriteString("null")
			break
		}
		buf.WriteString(`{"type":"LineString","coordinates":[`)
		for i, p := range t {
			if i > 0 {
				buf.WriteByte(',')
			}
			writePos(buf, p)
		}
		buf.WriteString(`]}`)
	default:
		buf.WriteString("null")
	}
	buf.WriteString(`,"properties":`)
	out, err := appendProps(buf.AvailableBuffer(), props)
	if err != nil {
		return fmt.Errorf("properties: %w", err)
	}
	buf.Write(out)
	buf.WriteString(`}`)
	return nil
}

// appendProps appends props as a JSON object, byte for byte as encoding/json writes a map
// with HTML escaping off: keys sorted, strings, numbers, booleans and string lists written
// here (routes have thousands of them), any other value by encoding/json.
func appendProps(b []byte, props map[string]any) ([]byte, error) {
	keys := make([]string, 0, len(props))
	for k := range props {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	b = append(b, '{')
	for i, k := range keys {
		if i > 0 {
			b = append(b, ',')
		}
		b = appendJSONString(b, k)
		b = append(b, ':')
		var err error
		if b, err = appendJSONValue(b, props[k]); err != nil {
			return nil, err
		}
	}
	return append(b, '}'), nil
}

func appendJSONValue(b []byte, v any) ([]byte, error) {
	switch x := v.(type) {
	case string:
		return appendJSONString(b, x), nil
	case bool:
		return strconv.AppendBool(b, x), nil
	case int:
		return strconv.AppendInt(b, int64(x), 10), nil
	case int64:
		return strconv.AppendInt(b, x, 10), nil
	case float64:
		if !math.IsNaN(x) && !math.IsInf(x, 0) {
			return appendJSONFloat(b, x), nil
		}
	case []string:
		if x == nil {
			return append(b, "null"...), nil
		}
		b = append(b, '[')
		for i, s := range x {
			if i > 0 {
				b = append(b, ',')
			}
			b = appendJSONString(b, s)
		}
		return append(b, ']'), nil
	}
	var pb bytes.Buffer
	enc := json.NewEncoder(&pb)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	return append(b, bytes.TrimRight(pb.Bytes(), "\n")...), nil
}

// appendJSONFloat writes a finite float as encoding/json does: the shortest decimal that
// reads back the same, in exponent form below 1e-6 and from 1e21, with a one-digit negative
// exponent where it has one digit.
func appendJSONFloat(b []byte, f float64) []byte {
	format := byte('f')
	if a := math.Abs(f); a != 0 && (a < 1e-6 || a >= 1e21) {
		format = 'e'
	}
	b = strconv.AppendFloat(b, f, format, -1, 64)
	if format == 'e' {
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b
}

// appendJSONString writes s as a JSON string as encoding/json does with HTML escaping off:
// quote and backslash escaped, control characters as \b \f \n \r \t or \u00XX, invalid
// UTF-8 as \ufffd, and U+2028 and U+2029 escaped.
func appendJSONString(b []byte, s string) []byte {
	const hex = "0123456789abcdef"
	b = append(b, '"')
	start := 0
	for i := 0; i < len(s); {
		if c := s[i]; c < utf8.RuneSelf {
			if c >= 0x20 && c != '"' && c != '\\' {
				i++
				continue
			}
			b = append(b, s[start:i]...)
			switch c {
			case '\\', '"':
				b = append(b, '\\', c)
			case '\b':
				b = append(b, '\\', 'b')
			case '\f':
				b = append(b, '\\', 'f')
			case '\n':
				b = append(b, '\\', 'n')
			case '\r':
				b = append(b, '\\', 'r')
			case '\t':
				b = append(b, '\\', 't')
			default:
				b = append(b, '\\', 'u', '0', '0', hex[c>>4], hex[c&0xF])
			}
			i++
			start = i
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			b = append(b, s[start:i]...)
			b = append(b, `\ufffd`...)
		case r == '\u2028' || r == '\u2029':
			b = append(b, s[start:i]...)
			b = append(b, '\\', 'u', '2', '0', '2', hex[r&0xF])
		default:
			i += size
			continue
		}
		i += size
		start = i
	}
	b = append(b, s[start:]...)
	return append(b, '"')
}

func writePos(buf *bytes.Buffer, p orb.Point) {
	buf.WriteByte('[')
	buf.WriteString(fmtCoordOut(p[0]))
	buf.WriteByte(',')
	buf.WriteString(fmtCoordOut(p[1]))
	buf.WriteByte(']')
}
