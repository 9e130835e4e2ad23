package units

import "testing"

func BenchmarkParse(b *testing.B) {
	for _, s := range []string{"MWh", "mwh", "MMBtu HHV", "GJ (NCV)", "  metric  ton "} {
		b.Run(s, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Parse(s); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
	b.Run("unknown", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := Parse("kwhh"); err == nil {
				b.Fatal("no error")
			}
		}
	})
}

func BenchmarkFactor(b *testing.B) {
	from, to := mustParse(b, "MMBtu HHV"), mustParse(b, "GJ")
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Factor(from, to); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkConvert(b *testing.B) {
	from, to := mustParse(b, "short_ton"), mustParse(b, "t")
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Convert(12.5, from, to); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkRatio(b *testing.B) {
	from, to := mustParse(b, "bbl"), mustParse(b, "m3")
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Ratio(from, to); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkTableBuild measures the one-time cost of building the unit table at start-up.
func BenchmarkTableBuild(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		build(unitDefs(), ambiguities())
	}
}
