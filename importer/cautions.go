package importer

// Cautions shown with the results, each fitting a kind of table: the
// combustion-factor caution under combustion and fugitive tables, the
// life-cycle caution under a build plan, the grid caution under purchased
// energy; the regulated-reporting caution always.
const (
	CautionTier1     = "Default factors are Tier 1 estimates (IPCC 2006 defaults, US EPA Hub averages), not measurements of these fuels or plants."
	CautionRegulated = "Regulated reporting follows the jurisdiction's rules and accredited verification: check the figures and factors before relying on them."
	// CautionLifeCycle is shown under a build plan: its figures are
	// life-cycle intensities, whose published values spread widely.
	CautionLifeCycle = "Build-plan figures use life-cycle intensities: the medians of the published assessments reviewed in IPCC AR5 WG3 Annex III (Table A.III.2), whose studies range widely around them (the low and high given here); they are screening figures, not an assessment of these projects."
	// CautionGrid is shown under purchased electricity and heat (Scope 2).
	CautionGrid = "Scope 2 figures use grid-average (location-based) factors of the edition named in " + SheetSources + "; a market-based figure needs the supplier's or contract's own factor, and grid factors change from year to year: use the edition of the reporting year."
)

// cautions are the cautions that fit the tables of the workbook, the
// regulated-reporting caution last. A workbook with nothing computed gets
// the combustion caution, which states what the defaults are.
func (res *ScanResult) cautions() []string {
	comb, plan, grid := false, false, false
	for _, t := range res.sc.tables {
		if t.copyOf != nil || len(t.rules) == 0 {
			continue
		}
		main, scope2 := t.baseKinds()
		switch main {
		case KindEmbodied:
			plan = true
		case KindScope2:
			grid = true
		case "":
		default:
			comb = true
		}
		if scope2 {
			grid = true
		}
		if t.rowKind != nil {
			for i := range t.rowKind.len() {
				if t.rowKind.at(i) == rowScope2 {
					grid = true
					break
				}
			}
		}
	}
	var out []string
	if comb || !plan && !grid {
		out = append(out, CautionTier1)
	}
	if plan {
		out = append(out, CautionLifeCycle)
	}
	if grid {
		out = append(out, CautionGrid)
	}
	return append(out, CautionRegulated)
}
