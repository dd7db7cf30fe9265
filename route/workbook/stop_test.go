package workbook

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"testing"

	"spanwright/geo/ctxtest"
)

// bigSample is a workbook of two sheets of 2,000 rows.
func bigSample() *Workbook {
	w := New()
	for s := 0; s < 2; s++ {
		sh := w.AddSheet(fmt.Sprintf("sheet %d", s), Column{Name: "id"}, Column{Name: "length", Unit: "m"})
		for r := 0; r < 2000; r++ {
			sh.Append(Text(fmt.Sprintf("L-%d", r)), Number(float64(r)/3, 1))
		}
	}
	return w
}

// TestBytesContext checks that a context never done gives Bytes' bytes, and that one
// cancelled at any of the looks BytesContext takes (sheets, rows, writes of the packed file)
// makes it return context.Canceled and no bytes.
func TestBytesContext(t *testing.T) {
	t.Parallel()
	w := bigSample()
	want, err := w.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	count := ctxtest.New(0)
	got, err := w.BytesContext(count)
	if err != nil || !bytes.Equal(got, want) {
		t.Fatalf("BytesContext with a context never done: %v, equal to Bytes: %v", err, bytes.Equal(got, want))
	}
	total := count.Looks()
	if total < 2*2000/rowCheckEvery {
		t.Fatalf("%d looks at the context, want at least one per %d rows", total, rowCheckEvery)
	}
	for at := int64(1); at <= total; at++ {
		ctx := ctxtest.New(at)
		data, err := w.BytesContext(ctx)
		if !errors.Is(err, context.Canceled) || data != nil {
			t.Errorf("cancelled at look %d of %d: got %d bytes, %v; want none and context.Canceled", at, total, len(data), err)
		}
	}
}
