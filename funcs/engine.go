package funcs

import (
	"sort"
	"strings"
	"sync"
	"sync/atomic"

	"github.com/fluecell/fluecell/funcs/units"
)

// Engine holds the loaded packs and the catalog. It is immutable after New
// apart from internal caches, and safe for concurrent use.
type Engine struct {
	packs       *packSet
	fuels       *fuelIndex
	techs       *techIndex
	gases       *gasIndex
	grids       *gridIndex
	vehNames    *vehicleIndex // distance-table vehicles and their names
	catalog     *catalogIndex
	defaultPack string

	plans     sync.Map // planKey -> *plan
	planCount atomic.Int64
	unitCache sync.Map // string -> units.Unit
	unitCount atomic.Int64
}

// Option configures New.
type Option func(*config)

type config struct {
	factorFiles []string
	factorData  []namedData
	defaultPack string
	readFile    func(string) ([]byte, error)
}

type namedData struct {
	name string
	data []byte
}

// WithFactorFiles loads user packs from CSV files after the embedded packs;
// later files override earlier ones row by row (same pack, id and quantity).
func WithFactorFiles(paths ...string) Option {
	return func(c *config) { c.factorFiles = append(c.factorFiles, paths...) }
}

// WithFactorData loads a user pack from CSV bytes (for example a workbook's
// own "Carbon factors" sheet); name appears in error messages and sources.
func WithFactorData(name string, data []byte) Option {
	return func(c *config) { c.factorData = append(c.factorData, namedData{name, data}) }
}

// WithDefaultPack sets the pack used when a call names none (default ipcc2006).
func WithDefaultPack(name string) Option {
	return func(c *config) { c.defaultPack = name }
}

// New loads the embedded packs and the user packs of the options. A user file
// that cannot be read or parsed fails New with an *Error of code CodePack
// whose message names the file and line; nothing is half-loaded.
func New(opts ...Option) (*Engine, error) {
	cfg := config{defaultPack: DefaultPack}
	for _, o := range opts {
		o(&cfg)
	}
	ps, err := loadPacks(cfg.factorFiles, cfg.readFile)
	if err != nil {
		return nil, packError(err)
	}
	for _, d := range cfg.factorData {
		rows, err := parseFactorCSV(d.data, d.name, "")
		if err != nil {
			return nil, packError(err)
		}
		ps.add(rows, d.name)
	}
	ps.finish()
	e := &Engine{packs: ps}
	fuels := builtinFuels()
	known := map[string]bool{}
	for _, f := range fuels {
		known[f.ID] = true
	}
	for _, name := range ps.names {
		for k := range ps.packs[name].rows {
			if !known[k.id] && isFuelQuantity(k.quantity) {
				known[k.id] = true
				fuels = append(fuels, Fuel{ID: k.id, Name: strings.ReplaceAll(k.id, "_", " "), Custom: true})
			}
		}
	}
	vocab, err := embeddedFuelNames()
	if err != nil {
		return nil, packError(err)
	}
	if e.fuels, err = newFuelIndex(fuels, vocab); err != nil {
		return nil, packError(err)
	}
	if _, ok := ps.packs[cfg.defaultPack]; !ok || cfg.defaultPack == CommonPack {
		return nil, &Error{Code: CodeBadArgument, Param: "pack", Msg: "unknown pack " + quote(cfg.defaultPack) + ": accepted are " + strings.Join(ps.names, ", ")}
	}
	e.defaultPack = cfg.defaultPack
	if e.techs, err = newTechIndex(e.technologies()); err != nil {
		return nil, packError(err)
	}
	tables, err := embeddedGasTables()
	if err != nil {
		return nil, packError(err)
	}
	if e.gases, err = newGasIndex(ps, tables); err != nil {
		return nil, packError(err)
	}
	if e.grids, err = buildGridIndex(ps); err != nil {
		return nil, packError(err)
	}
	if e.vehNames, err = newVehicleIndex(ps); err != nil {
		return nil, packError(err)
	}
	e.catalog = newCatalogIndex(buildCatalog(e))
	return e, nil
}

func isFuelQuantity(q string) bool {
	switch q {
	case "ncv", "gcv", "density", "co2_ef", "ch4_ef", "n2o_ef", "carbon_content", "biogenic_fraction":
		return true
	}
	return false
}

func packError(err error) error {
	if fe, ok := AsError(err); ok {
		return fe
	}
	return &Error{Code: CodePack, Param: "factors", Msg: err.Error(), Err: err}
}

// DefaultPackName is the pack used when a call names none.
func (e *Engine) DefaultPackName() string { return e.defaultPack }

// PackNames lists the selectable packs, sorted.
func (e *Engine) PackNames() []string { return append([]string(nil), e.packs.names...) }

// Packs describes every loaded pack, the common pack last.
func (e *Engine) Packs() []PackInfo {
	var out []PackInfo
	for _, n := range e.packs.names {
		out = append(out, e.packs.packs[n].info())
	}
	if c := e.packs.packs[CommonPack]; c != nil {
		out = append(out, c.info())
	}
	return out
}

// Version is a short hash of every loaded row; it changes whenever a value,
// unit or source changes, so that cached outputs can be recomputed.
func (e *Engine) Version() string { return e.packs.hash }

// Functions returns the catalog in declaration order.
func (e *Engine) Functions() []*Function { return append([]*Function(nil), e.catalog.list...) }

// Function returns the catalog function with the given name.
func (e *Engine) Function(name string) (*Function, bool) {
	f, ok := e.catalog.byName[name]
	return f, ok
}

// Fuels returns the canonical fuels, sorted by id, custom ones included.
func (e *Engine) Fuels() []Fuel {
	out := make([]Fuel, 0, len(e.fuels.ordered))
	for _, f := range e.fuels.ordered {
		out = append(out, *f)
	}
	return out
}

// ResolveFuel maps a fuel name, alias, statistics code or blend name to its canonical fuel
// (for a blend such as E10, its fossil base fuel); alias is true when the name was not the id
// itself. The error is an *Error of code CodeUnknownFuel saying what the name is when it is
// known not to be a fuel, else with a suggestion where one is close. LookupFuel is the cheap
// test that builds no message.
func (e *Engine) ResolveFuel(name string) (f Fuel, alias bool, err error) {
	p, alias, err := e.resolveFuel(name)
	if err != nil {
		return Fuel{}, false, err
	}
	return *p, alias, nil
}

func (e *Engine) resolveFuel(name string) (*Fuel, bool, error) {
	m, err := e.fuels.resolve(name)
	if err != nil {
		return nil, false, err
	}
	return m.entry.fuel, m.alias, nil
}

// Factors lists the rows of a pack ("" = the default pack), with the common
// rows after them; fuel, when not empty, keeps only that fuel's rows (and the
// rows its computations draw on: the NCV/GCV ratio of its family).
func (e *Engine) Factors(packName, fuel string) ([]*Factor, error) {
	name, err := e.resolvePack(packName)
	if err != nil {
		return nil, err
	}
	var keep func(f *Factor) bool
	if fuel != "" {
		fu, _, err := e.resolveFuel(fuel)
		if err != nil {
			return nil, err
		}
		keep = func(f *Factor) bool {
			return f.ID == fu.ID || (fu.Family != "" && f.ID == fu.Family && f.Quantity == "ncv_per_gcv")
		}
	}
	var out []*Factor
	for _, p := range []*pack{e.packs.packs[name], e.packs.packs[CommonPack]} {
		if p == nil {
			continue
		}
		for _, f := range p.sorted() {
			if keep == nil || keep(f) {
				out = append(out, f)
			}
		}
	}
	return out, nil
}

// resolvePack maps "" to the default pack and checks the name.
func (e *Engine) resolvePack(name string) (string, error) {
	if name == "" {
		return e.defaultPack, nil
	}
	if p, ok := e.packs.packs[name]; ok && name != CommonPack && !p.gridOnly() {
		return name, nil
	}
	lower := strings.ToLower(strings.TrimSpace(name))
	if p, ok := e.packs.packs[lower]; ok && lower != CommonPack && !p.gridOnly() {
		return lower, nil
	}
	msg := "unknown pack " + quote(name) + ": accepted are " + strings.Join(e.packs.names, ", ")
	if sug := suggestFrom(lower, e.packs.names); sug != "" {
		msg += " (did you mean " + sug + "?)"
	}
	return "", &Error{Code: CodeBadArgument, Param: "pack", Msg: msg}
}

const maxCachedUnits = 4096

// parseUnit is units.Parse behind a bounded cache.
func (e *Engine) parseUnit(s string) (units.Unit, error) {
	if u, ok := e.unitCache.Load(s); ok {
		return u.(units.Unit), nil
	}
	u, err := units.Parse(s)
	if err != nil {
		return units.Unit{}, err
	}
	if e.unitCount.Load() < maxCachedUnits {
		if _, loaded := e.unitCache.LoadOrStore(s, u); !loaded {
			e.unitCount.Add(1)
		}
	}
	return u, nil
}

// Units lists every unit fluecell accepts.
func (e *Engine) Units() []units.Entry { return units.List() }

// hasID reports whether the pack itself has any row about id.
func (ps *packSet) hasID(packName, id string) bool {
	p := ps.packs[packName]
	if p == nil {
		return false
	}
	for k := range p.rows {
		if k.id == id {
			return true
		}
	}
	return false
}

// packsWithID lists the selectable packs with any row about id.
func (ps *packSet) packsWithID(id string) []string {
	var out []string
	for _, n := range ps.names {
		if ps.hasID(n, id) {
			out = append(out, n)
		}
	}
	sort.Strings(out)
	return out
}
