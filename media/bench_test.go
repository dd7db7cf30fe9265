package media

import (
	"sync"
	"testing"
)

var (
	benchOnce   sync.Once
	benchEngine *Engine
)

func benchSetup(b *testing.B) *Engine {
	benchOnce.Do(func() {
		e, err := NewEngine(nil, nil, nil, EngineOptions{LossMarginDB: 1})
		if err != nil {
			b.Fatal(err)
		}
		benchEngine = e
	})
	return benchEngine
}

func BenchmarkChoose(b *testing.B) {
	e := benchSetup(b)
	l := Link{RouteM: 580, RiserM: 20, SlackM: 12, RateGbps: 10, FutureRateGbps: 40, Outdoor: true, ConnectorPairs: 2, Strands: 12}
	for b.Loop() {
		e.chosen.Purge() // the rule engine's work, not its memory of the answer
		e.Choose(l)
	}
}

// BenchmarkChooseRemembered is the same question asked again: a sweep's usual case.
func BenchmarkChooseRemembered(b *testing.B) {
	e := benchSetup(b)
	l := Link{RouteM: 580, RiserM: 20, SlackM: 12, RateGbps: 10, FutureRateGbps: 40, Outdoor: true, ConnectorPairs: 2, Strands: 12}
	for b.Loop() {
		e.Choose(l)
	}
}

func BenchmarkMaxChannelM(b *testing.B) {
	e := benchSetup(b)
	l := Link{ConnectorPairs: 2, Outdoor: true}
	for b.Loop() {
		e.MaxChannelM("os2", 10, 40, l)
	}
}

func BenchmarkParseCatalog(b *testing.B) {
	for b.Loop() {
		if _, err := ParseCatalog("catalog.yaml", catalogYAML); err != nil {
			b.Fatal(err)
		}
	}
}
