package media

// BondingItem is the bill item of bonding the metallic members of a conductive fibre cable
// where it enters a building from outside: NFPA 70 770.93 asks that the non-current-carrying
// metallic members of an optical fibre cable entering a building be bonded or grounded as
// close to the point of entrance as practicable, or interrupted there by an insulating joint,
// and 770.100 how (a bonding conductor to the building's intersystem bonding termination or
// grounding electrode system) (the section numbers and their words from memory; that such
// members are bonded or interrupted near the entrance, NFPA 70 Article 770, also from memory).
// The bill takes bonding, the usual way; a designer who interrupts the members instead prices
// the insulating joint at the same key.
const BondingItem = "bonding of metallic members, fibre cable end entering a building from outside"

// BondingEnds is what bonding the metallic members of cableEnds cable ends of construction k
// at the buildings they enter from outside puts on the bill: one kit per cable end (the bonding
// clamp or kit, its conductor to the building's bonding termination, installed), priced at
// metallic_member_bonding_each, or listed not priced without it (PriceBook.NotPriced); nothing
// for a construction without metallic members (Construction.MetallicMembers) or no ends. The
// caller counts the ends: two per cable of a route that leaves the buildings, entrance
// transition or not, since the outside cable enters the building at either end before any
// splice. The one list of the bonding's items: the rule engine's cost of a laying (Engine
// .cost), the optimizer's option (routing's addOption) and the bill (estimate's legItems) all
// read it.
func BondingEnds(k *Construction, cableEnds int) []Quantity {
	if k == nil || !k.MetallicMembers || cableEnds <= 0 {
		return nil
	}
	return []Quantity{{Category: CategoryMaterial, Item: BondingItem, Unit: UnitEach, Amount: float64(cableEnds), Price: PriceKey{Item: PriceBonding}}}
}
