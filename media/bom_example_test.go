package media_test

import (
	"fmt"

	"spanwright/media"
)

// Pricing a small bill of materials from the embedded demo price book (invented prices):
// 412 m at 60 m/h is 6.87 h; the book's bid item project management is 4 % of the 1673.76 of
// the other categories, 66.95, making the subtotal 1740.71; contingency 10 % and overhead 12 %
// of it are 174.07 and 208.89; the book taxes material and optics only: 7.25 % of
// 951.72 + 90.00 = 1041.72 is 75.52 (computed).
func ExamplePriceBook_Bill() {
	book := media.DefaultPriceBook()
	bom, err := book.Bill([]media.Quantity{
		{Category: media.CategoryMaterial, Item: "cable os2 osp-loose-tube, 24 strands", Unit: media.UnitM, Amount: 412,
			Price: media.PriceKey{Item: media.PriceCable, Medium: "os2", Construction: "osp-loose-tube", Count: 24}},
		{Category: media.CategoryLabour, Item: "pull cable in duct", Unit: media.UnitM, Amount: 412,
			Price: media.PriceKey{Item: media.PriceLabourHour}, Rate: media.PriceKey{Item: media.RatePull, Name: "duct"}},
		{Category: media.CategoryOptics, Item: "transceiver 10GBASE-LR", Unit: media.UnitEach, Amount: 2,
			Price: media.PriceKey{Item: media.PriceTransceiver, Name: "10GBASE-LR"}},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, l := range bom.Lines {
		fmt.Printf("%-8s %-50s %7.2f %-4s × %7s = %8s\n", l.Category, l.Describe(nil), l.Quantity, l.Unit,
			media.FormatCents(l.UnitCents), media.FormatCents(l.ExtendedCents))
	}
	fmt.Println("subtotal", media.FormatCents(bom.SubtotalCents), "total", media.FormatCents(bom.TotalCents), bom.Currency)
	// Output:
	// material cable os2 osp-loose-tube, 24 strands                412.00 m    ×    2.31 =   951.72
	// labour   pull cable in duct: 412.0 m at 60.0 m per hour        6.87 h    ×   92.00 =   632.04
	// optics   transceiver 10GBASE-LR                                2.00 each ×   45.00 =    90.00
	// bid items project management, 4 % of material + labour + construction + optics    1.00 each ×   66.95 =    66.95
	// subtotal 1740.71 total 2199.19 USD
}
