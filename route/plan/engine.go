package plan

import (
	"fmt"

	"spanwright/geo/input"
	"spanwright/media"
)

// CheckRates reports every rate of the plan the catalog does not know: the defaults' and
// each link's own. A future_rate may also be FutureRateNone.
func (p *Plan) CheckRates(cat *media.Catalog) []error {
	var errs []error
	check := func(key, rate string) {
		if _, err := cat.ParseRate(rate); rate != "" && err != nil {
			errs = append(errs, p.Problem(key, err))
		}
	}
	check("defaults.rate", p.Defaults.Rate)
	check("defaults.future_rate", FutureRate(p.Defaults.FutureRate))
	for i, l := range p.Links {
		check(fmt.Sprintf("links[%d].rate", i), l.Rate)
		check(fmt.Sprintf("links[%d].future_rate", i), FutureRate(l.FutureRate))
	}
	return errs
}

// Engine builds the media rule engine of a plan: its catalog, rules and price book (the
// embedded defaults where the plan names none) and its design options.
func Engine(p *Plan) (*media.Engine, error) {
	return engine(p, media.NewEngine)
}

// CheckEngine is Engine for a check that goes on past missing prices (media.NewCheckEngine):
// when the files read and fit together but for prices the book lacks, it returns the
// engine with those problems. The engine must never plan.
func CheckEngine(p *Plan) (*media.Engine, error) {
	return engine(p, media.NewCheckEngine)
}

func engine(p *Plan, build func(*media.Catalog, *media.Rules, *media.PriceBook, media.EngineOptions) (*media.Engine, error)) (*media.Engine, error) {
	var cat *media.Catalog
	var rules *media.Rules
	var prices *media.PriceBook
	var errs []error
	// read reads a file the plan names under the plan's cap, and parses it.
	read := func(name string, parse func(string, []byte) error) {
		path := p.Path(name)
		data, err := input.ReadFile(path, input.Cap(p.MaxInputBytes, input.DefaultTextMiB))
		if err == nil {
			err = parse(path, data)
		} else {
			err = &input.Problem{File: path, Err: fmt.Errorf("read: %w", input.Cause(err))}
		}
		if err != nil {
			errs = append(errs, err)
		}
	}
	if p.Catalog != "" {
		read(p.Catalog, func(path string, data []byte) (err error) { cat, err = media.ParseCatalog(path, data); return err })
	}
	if p.Rules != "" {
		read(p.Rules, func(path string, data []byte) (err error) { rules, err = media.ParseRules(path, data); return err })
	}
	if p.Prices != "" {
		read(p.Prices, func(path string, data []byte) (err error) { prices, err = media.ParsePriceBook(path, data); return err })
	}
	if len(errs) > 0 {
		return nil, problems(errs)
	}
	return build(cat, rules, prices, EngineOptions(p))
}

// EngineOptions are the options of a plan's media engine, from its design section: with
// the catalog, rule and price files, all that Engine reads.
func EngineOptions(p *Plan) media.EngineOptions {
	return media.EngineOptions{LossMarginDB: p.Design.LossMarginDB, AllowOutdoorCopper: p.Design.AllowOutdoorCopper,
		PairLossDB: p.Design.PairLossDB, SpliceLossDB: p.Design.SpliceLossDB, Termination: p.Design.Termination, CopperCordsM: p.Design.CopperCordsM,
		WastePct: p.Design.WastePct}
}

// MaxCopperChannelM is the longest copper channel, in metres: a 90 m permanent link plus
// 10 m of cords (ANSI/TIA-568.2, seen). Copper is never spliced, so a reel must hold it.
const MaxCopperChannelM = 100.0
