package input

import (
	"bytes"
	"encoding/json"
	"fmt"
	"testing"
)

// tokenDuplicates is the slow, obvious way to find names given twice: encoding/json's token
// stream, a set of names per open object. JSONDuplicates must agree with it.
func tokenDuplicates(data []byte) ([]string, error) {
	type frame struct {
		obj     bool
		wantKey bool
		names   map[string]bool
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	var stack []*frame
	var out []string
	value := func() { // a value ended: the enclosing object now wants a name
		if n := len(stack); n > 0 && stack[n-1].obj {
			stack[n-1].wantKey = true
		}
	}
	for {
		tok, err := dec.Token()
		if err != nil {
			if len(stack) == 0 {
				return out, nil
			}
			return nil, err
		}
		top := (*frame)(nil)
		if len(stack) > 0 {
			top = stack[len(stack)-1]
		}
		switch t := tok.(type) {
		case json.Delim:
			switch t {
			case '{':
				stack = append(stack, &frame{obj: true, wantKey: true, names: map[string]bool{}})
			case '[':
				stack = append(stack, &frame{})
			default:
				stack = stack[:len(stack)-1]
				value()
			}
		case string:
			if top != nil && top.obj && top.wantKey {
				if top.names[t] {
					out = append(out, t)
				}
				top.names[t] = true
				top.wantKey = false
				continue
			}
			value()
		default:
			value()
		}
	}
}

// FuzzJSONDuplicates compares the one-pass scanner with the token-stream reference on every
// valid JSON input the fuzzer finds.
func FuzzJSONDuplicates(f *testing.F) {
	for _, s := range []string{`{"a":1,"a":2}`, `{"a":{"b":1,"b":[{"c":1,"c":2}]},"\u0061":3}`, `[1,"a",{"x":"}","x":"{"}]`,
		`{"k\"":1,"k\"":2}`, `{"":1,"":2}`, `"s"`, `{"a":[],"b":{},"a":null}`, "{\"\xff\":1,\"\xfe\":2}", `{"é":1,"\u00e9":2}`} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		if !json.Valid(data) {
			JSONDuplicates(data) // must not panic on anything
			return
		}
		want, err := tokenDuplicates(data)
		if err != nil {
			t.Skip(err)
		}
		var got []string
		for _, d := range JSONDuplicates(data) {
			got = append(got, d.Key)
		}
		if fmt.Sprintf("%q", got) != fmt.Sprintf("%q", want) {
			t.Errorf("%q: got %q, want %q", data, got, want)
		}
	})
}
