package corpus

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"

	"golang.org/x/text/unicode/norm"
)

// era is the part of the journal's life in which a filler word belongs. It
// steers the choice of a generic life so that computing words arrive late and
// steam words fade.
type era int

const (
	eraAny       era = iota // workshop and society words: any shape, any time
	eraSteam                // strong early, fading or dying out
	eraElectric             // rising from the 1880s
	eraMachine              // the motor, concrete and aircraft years, 1900–1970
	eraComputing            // absent before the late 1940s
	eraModern               // absent before the 1980s
)

// word is a vocabulary entry.
type word struct {
	text string
	era  era
	kind kind
	// life, when set, is the word's own kind of life (a headline word);
	// pin and pin2 place its peak (NaN: drawn from the life's window).
	life      *life
	pin, pin2 float64
	// coined is the first year the word can be printed (0: the life
	// decides).
	coined float64
}

// kind says how a term was made. Headline words, each with a life that
// fits its meaning, take the top share ranks, so the demo's top 384 terms
// are all of them; fillers and random compounds make the long tail.
type kind int

const (
	headline kind = iota
	handWritten
	jargon
	compound
)

// words splits a "|"-separated list so entries may contain spaces.
func words(e era, list string) []word {
	var out []word
	for _, s := range strings.Split(list, "|") {
		if s = strings.TrimSpace(s); s != "" {
			out = append(out, word{text: s, era: e, kind: handWritten, pin: math.NaN(), pin2: math.NaN()})
		}
	}
	return out
}

// lived gives every entry of a "|"-separated list the life l. An entry may
// pin its peak year as "term@1903" (give or take two years), a TwinPeak
// entry both waves as "term@1910/2008", and any entry the year the word
// was coined, before which it is never printed, as "term@1965>1948".
func lived(l life, list string) []word {
	var out []word
	for _, s := range strings.Split(list, "|") {
		if s = strings.TrimSpace(s); s == "" {
			continue
		}
		w := word{text: s, kind: headline, life: &l, pin: math.NaN(), pin2: math.NaN()}
		if rest, coined, ok := strings.Cut(s, ">"); ok {
			s, w.text, w.coined = rest, rest, mustYear(coined)
		}
		if name, at, ok := strings.Cut(s, "@"); ok {
			w.text = name
			a, b, two := strings.Cut(at, "/")
			w.pin = mustYear(a)
			if two {
				w.pin2 = mustYear(b)
			}
		}
		out = append(out, w)
	}
	return out
}

func mustYear(s string) float64 {
	y, err := strconv.Atoi(s)
	if err != nil {
		panic("corpus: bad pinned year " + strconv.Quote(s))
	}
	return float64(y)
}

type span = [2]float64

// Lives of the headline words. Windows are calendar years; widths are in
// years (see life).
var (
	// In use in 1868 and fading: old trades, horse and canal days.
	fading = life{shape: Fall, at: span{1878, 1925}, fall: span{4, 16}, base: span{0.02, 0.15}, weight: 2}
	// Gone for good by a year.
	dying = life{shape: Vanish, at: span{1895, 1940}, fall: span{4, 8}}
	// The steam age: strong in the 1870s–90s, a long decline.
	steamAge = life{shape: Hump, at: span{1870, 1895}, rise: span{8, 14}, fall: span{15, 35}, base: span{0.2, 0.5}, after: span{0.02, 0.15}, plateau: span{0, 10}, weight: 2}
	// A few years' fashion.
	burst = life{shape: Burst, at: span{1880, 2020}, rise: span{2.5, 5}, fall: span{4, 9}, after: span{0.02, 0.1}, plateau: span{0, 3}, born: true}
	// A generation's word.
	hump = life{shape: Hump, at: span{1900, 2000}, rise: span{5, 14}, fall: span{8, 30}, after: span{0.05, 0.45}, plateau: span{0, 15}, born: true}
	// Caught on and stayed.
	rise = life{shape: Rise, at: span{1890, 1990}, rise: span{5, 10}, drift: span{0.15, 0.4}, born: true, weight: 3}
	// New words rising to the end of the span.
	arrive = life{shape: Arrive, at: span{1990, 2020}, rise: span{3, 9}, born: true}
	// Two waves decades apart.
	twoWaves = life{shape: TwinPeak, rise: span{4, 8}, fall: span{5, 10}, base: span{0.02, 0.08}, h2: span{0.75, 1.1}, born: true}
	// A second, smaller wave: a revival talked of more than built.
	echo = life{shape: TwinPeak, rise: span{4, 8}, fall: span{5, 10}, base: span{0.02, 0.06}, h2: span{0.25, 0.45}, born: true}
	// Always there.
	steady = life{shape: Flat, weight: 5}
	// Slowly more or less common over the whole span.
	slowRise = life{shape: Rise, at: span{1900, 1990}, rise: span{15, 30}, base: span{0.15, 0.4}, weight: 3}
	slowFall = life{shape: Fall, at: span{1900, 1970}, fall: span{15, 30}, base: span{0.1, 0.3}, weight: 3}
	// Built up over decades, dropped within a few years.
	crash = life{shape: Hump, at: span{1950, 1970}, rise: span{22, 30}, fall: span{4, 6}, after: span{0, 0.02}}
)

// headlines are the words a reader looks for, each given a life that fits
// its meaning. Pinned years follow the invented journal's story, which
// keeps to the broad order of real technical history; the curves are
// fiction. Pairs that hand over (rivetting → welding, slide rule → pocket
// calculator, aeroplane → aircraft, vacuum tube → transistor → microchip,
// telegraph → telephone → email) are pinned so the inserts can tell it.
var headlines = concat(
	lived(fading, `puddling|wrought iron|gaslight@1885|semaphore|canal|aqueduct|sextant|turnpike|
		packet boat|tallow|lamp black|coal gas|navvy|wheelwright|millwright|smithy|ropewalk|cooperage|
		water wheel|mill race|beam engine|paddle wheel|ironmaster|windlass|capstan|treadle|bellows|
		cast iron|lime kiln|logarithm|horse power`),
	lived(dying, `railway mania@1890|hansom@1930|ostler@1925|stagecoach@1905|mail coach@1900|
		whale oil@1910|puddler@1935|gutta-percha@1925|horse tram@1915|spinning mule@1935`),
	lived(steamAge, `steam@1890|boiler@1895|stoker|firebox|smokestack|traction engine@1895|
		steam hammer|slide valve|cross-head|cylinder cock|boilermaker|pig iron|coke oven|caisson|
		dredger|telegraph@1880|tramway@1900|signal box|turntable|firebrick|blacksmith|brass foundry|
		forge|anvil|omnibus|rivetting@1895|locomotive@1900|railway@1885|colliery@1900|coal@1905`),
	lived(burst, `arc lamp@1884|induction coil@1888|coherer@1903|carbon rod@1890|
		electrometer@1882|spark gap@1908|trolley pole@1905|carbide@1906|
		phonograph@1890|
		cable tramway@1892|biplane@1917|monoplane@1925|seaplane@1920|aileron@1920|
		glider@1932|duralumin@1928|time study@1926|cellophane@1938|hovercraft@1967|
		supersonic@1960|afterburner@1958|turbojet@1950|cybernetics@1960|prefabrication@1947|
		synthetic rubber@1943|atomic@1950|punched tape@1958|core memory@1965|time-sharing@1971|
		batch job@1968|floppy disk@1986>1970|minicomputer@1976|kilobyte@1978|megabyte@1990|
		word processor@1985|modem@1993|digitiser@1982|flip-flop@1965|microchip@1988>1970|
		pocket calculator@1978>1968|spreadsheet@1990|nanotechnology@2004|sensor network@2010|
		smart grid@2012|big data@2016|biofuel@2009|broadband@2006|webinar@2021|remote working@2021|
		gigabyte@2003|graphene@2014|touchscreen@2013|telex@1966|fax@1990|pager@1996|microfilm@1960|
		millennium bug@1999|oil crisis@1975|acid rain@1985|ozone layer@1991|containerisation@1972|
		neon sign@1935|gas mantle@1900|space race@1963|transistor radio@1962|CD-ROM@1996|
		carbon footprint@2012|global warming@2005`),
	lived(hump, `galvanometer@1885|accumulator@1900|armature@1900|commutator@1902|dynamo@1895|
		magneto@1918|incandescent@1898|switchboard@1920|alternator@1925|rectifier@1935|electrification@1930|tramcar@1910|
		filament@1915|storage battery@1905|telephone@1948|power station@1935|valve set@1928|
		aerial@1932|electroplating@1910|arc welding@1942|electric light@1900|aeroplane@1922>1903|
		motor car@1920|lorry@1945|petrol@1945|tractor@1945|bulldozer@1958|carburettor@1935|
		radio@1942|radar@1955|jet engine@1958|plastics@1962|vacuum tube@1940|
		reinforced concrete@1920|prestressed concrete@1960|assembly line@1935|mass production@1942|
		television@1965|refrigeration@1930|air conditioning@1968|oscilloscope@1962|fibreglass@1968|
		tower crane@1972|motorway@1970|garage@1928|spark plug@1928|crankcase@1925|propeller@1925|
		fuselage@1942|wind tunnel@1948|isotope@1958|rocket@1962|helicopter@1965|sonar@1955|
		cinema@1925|loudspeaker@1932|gyroscope@1925|linoleum@1905|tungsten@1915|chromium@1935|
		servomechanism@1952|transistor@1965>1948|magnetic tape@1968|mainframe@1977>1952|terminal@1978|
		plotter@1978|logic gate@1972|printed circuit@1965|microprocessor@1984>1970|integrated circuit@1974>1958|
		solid state@1966|systems analysis@1968|operations research@1960|numerical control@1972|
		telemetry@1968|microwave@1965|fibre optics@1990|compiler@1978|subroutine@1968|
		quality control@1962|ergonomics@1978|fault tree@1982|email@2005>1982|website@2006>1991|laptop@2008>1983|
		draughtsman@1935|trade union@1950|typewriter@1915|punched card@1940|teleprinter@1952|
		steam turbine@1915|gas turbine@1958|nuclear power@1975|cathode ray tube@1962|
		fluorescent lamp@1956|container ship@1978|carbon paper@1930|computer-aided design@1992>1960`),
	lived(rise, `concrete@1905|welding@1938|diesel@1930|aluminium@1915|stainless steel@1935|
		hydraulics@1940|polymer@1960|reactor@1960|servo@1955|gearbox@1930|clutch@1920|aircraft@1945|
		transformer@1905|kilowatt@1910|busbar@1915|substation@1925|computer@1965|software@1978|
		algorithm@1985|database@1985|simulation@1972|finite element@1982|silicon@1975|byte@1982|
		robotics@1985|laser@1970|satellite@1965|semiconductor@1962|programming@1972|
		operating system@1985|user interface@1990|keyboard@1982|reliability@1962|bandwidth@1998|
		power grid@1950`),
	lived(arrive, `internet@1998>1975|wi-fi@2008>1998|smartphone@2012>2000|app@2014>2000|cloud storage@2016|
		machine learning@2019>1990|digital twin@2021|drone@2016|3D printing@2015|
		additive manufacturing@2018|sustainability@2004|carbon capture@2012|wind farm@2005|
		offshore wind@2014|lithium battery@2010|net zero@2021>2005|decarbonisation@2020|
		embodied carbon@2021|green steel@2022|cybersecurity@2017|malware@2010|encryption@2004|
		firmware@2000|microcontroller@2005|open source@2010|podcast@2016|e-scooter@2021|
		charging point@2018|battery storage@2019|life-cycle assessment@2008|resilience@2012|
		stakeholder@2005|diversity@2015|inclusion@2019|well-being@2016|terabyte@2012|
		circular economy@2019|climate change@2016|greenhouse gas@2012|LED@2014`),
	lived(twoWaves, `wireless@1910/2008|electric vehicle@1905/2021|heat pump@1980/2023|
		hydrogen economy@1977/2022|photovoltaic@1981/2013|asbestos@1955/1990|retrofit@1978/2016|
		tidal power@1925/1978|district heating@1955/2020`),
	lived(echo, `airship@1925/2004|monorail@1912/1966`),
	lived(steady, `gear|bearing|shaft|lever|pulley|valve|bolt|pump|bridge|girder|beam|column|
		foundation|tunnel|pipe|crane|drill|piston|flange|chain|tolerance|gauge|copper|brass|
		timber|brick|cement|glass|pressure|temperature|load|survey|contract|tender|cost|wages|
		foreman|engineer|inspector|lecture|membership|patent|experiment|instrument|tension|
		harbour|workshop|machine|engine|tool`),
	lived(slowRise, `energy@1950|safety@1950|research@1940|regulation@1965|standard@1920|
		efficiency@1905|training@1955|ethics@1990|noise@1965|traffic@1935|transport@1940|
		insulation@1950|turbine@1910|motor@1915|road@1925|corrosion@1930|fatigue@1950|steel@1885`),
	lived(slowFall, `iron@1910|mining@1920|apprentice@1960|smelting@1915|carriage@1920|wagon@1930|
		lighthouse@1920|viaduct@1920|rivet@1925|sleeper@1940|ballast@1940`),
	lived(crash, `slide rule@1967`),
)

// Fillers: the long tail of the vocabulary, grouped by era, drawn a generic
// life of their era (see generic). A word already given a life in
// headline keeps that one. None is a brand.
var fillers = concat(
	words(eraSteam, `steam|boiler|stoker|firebox|smokestack|beam engine|paddle wheel|treadle|coke oven|
		puddling|wrought iron|gaslight|telegraph|semaphore|canal|aqueduct|horse tram|gutta-percha|sextant|
		cable tramway|cast iron|bellows|windlass|capstan|sluice|mill race|spinning mule|tallow|lamp black|
		whale oil|coal gas|pig iron|rivetting|caisson|dredger|puddler|boilermaker|navvy|turnpike|
		stagecoach|clinker|cross-head|slide valve|cylinder cock|water wheel|tramway|mail coach|
		steam hammer|traction engine|horse power|ironmaster|millwright|signal box|turntable|firebrick|
		lime kiln|packet boat|jenny|hansom|omnibus|clerestory|wheelwright|smithy|forge|anvil|shuttle|
		loom|bobbin|ropewalk|cooperage|ostler|blacksmith|brass foundry|railway mania`),
	words(eraElectric, `dynamo|arc lamp|telephone|switchboard|accumulator|alternator|transformer|
		electrolysis|insulator|wireless|cathode|anode|rectifier|electrification|tramcar|magneto|carbide|
		incandescent|galvanometer|ammeter|voltmeter|induction coil|commutator|armature|filament|
		storage battery|overhead line|power station|substation|feeder|busbar|fuse|conduit|trolley pole|
		cable joint|earthing|kilowatt|ohm|volt|ampere|megohm|phonograph|electrometer|lightning rod|
		galvanising|electroplating|arc welding|carbon rod|spark gap|coherer|aerial|valve set`),
	words(eraMachine, `aeroplane|airship|diesel|motor car|concrete|reinforced concrete|welding|
		assembly line|radio|radar|jet engine|plastics|synthetic rubber|gyroscope|wind tunnel|television|
		vacuum tube|tractor|bulldozer|aluminium|stainless steel|prestressed concrete|hydraulics|servo|
		rocket|reactor|isotope|atomic|carburettor|propeller|fuselage|aileron|seaplane|monoplane|biplane|
		garage|motorway|petrol|lorry|crankcase|gearbox|clutch|spark plug|tungsten|duralumin|chromium|
		loudspeaker|cinema|refrigeration|air conditioning|mass production|time study|prefabrication|
		tower crane|helicopter|hovercraft|supersonic|afterburner|turbojet|sonar|oscilloscope|
		cybernetics|servomechanism|polymer|fibreglass|asbestos|linoleum|cellophane|glider`),
	words(eraComputing, `computer|transistor|semiconductor|software|hardware|algorithm|
		microprocessor|programming|database|compiler|magnetic tape|integrated circuit|silicon|byte|
		bandwidth|network|simulation|finite element|punched tape|mainframe|terminal|flowchart|
		subroutine|debugging|printed circuit|logic gate|flip-flop|kilobyte|megabyte|operating system|
		time-sharing|minicomputer|floppy disk|modem|spreadsheet|word processor|microchip|robotics|
		numerical control|laser|fibre optics|satellite|telemetry|microwave|ergonomics|systems analysis|
		operations research|reliability|quality control|fault tree|user interface|keyboard|display|
		memory chip|solid state|core memory|batch job|plotter|digitiser`),
	words(eraModern, `internet|email|laptop|smartphone|sustainability|carbon capture|photovoltaic|
		wind farm|lithium battery|drone|machine learning|cloud storage|3D printing|
		additive manufacturing|sensor network|microcontroller|open source|cybersecurity|
		electric vehicle|heat pump|net zero|resilience|digital twin|website|broadband|wi-fi|app|
		big data|nanotechnology|graphene|biofuel|life-cycle assessment|retrofit|decarbonisation|
		smart grid|firmware|malware|encryption|touchscreen|gigabyte|terabyte|hydrogen economy|
		circular economy|stakeholder|diversity|inclusion|well-being|remote working|webinar|podcast|
		e-scooter|charging point|battery storage|offshore wind|green steel|embodied carbon`),
	words(eraAny, `gear|bearing|shaft|lever|pulley|valve|bolt|gasket|spring|axle|pump|bridge|girder|
		truss|beam|column|foundation|tunnel|dam|pipe|drain|sewer|crane|winch|lathe|drill|turbine|
		piston|cylinder|crankshaft|flywheel|governor|condenser|nozzle|flange|weld|rivet|chain|cable|
		rope|hook|boiler plate|sheet metal|casting|forging|tolerance|gauge|micrometer|caliper|vice|
		hammer|chisel|file|saw|grindstone|lubricant|grease|oil|friction|torque|stress|strain|fatigue|
		corrosion|rust|alloy|steel|iron|copper|brass|bronze|tin|zinc|lead|nickel|timber|brick|stone|
		mortar|cement|gravel|sand|clay|glass|rubber|leather|coal|coke|gas|water|air|pressure|vacuum|
		temperature|heat|cold|energy|power|force|load|weight|speed|efficiency|safety|accident|
		explosion|fire|flood|survey|drawing|blueprint|specification|contract|tender|estimate|cost|
		wages|apprentice|foreman|engineer|draughtsman|surveyor|inspector|examination|lecture|
		membership|exhibition|patent|standard|regulation|ethics|pension|strike|trade union|
		education|training|research|laboratory|experiment|measurement|calibration|instrument|meter|
		thermometer|barometer|dial|scale|ratio|formula|diagram|graph|table|slide rule|logarithm|
		calculus|geometry|tension|compression|shear|bending|buckling|vibration|resonance|noise|
		insulation|ventilation|drainage|irrigation|harbour|dock|lighthouse|railway|locomotive|
		carriage|wagon|signal|track|sleeper|ballast|viaduct|embankment|cutting|road|pavement|kerb|
		roundabout|traffic|transport|freight|cargo|ship|hull|keel|rudder|anchor|mast|dredging|
		mining|shaft sinking|colliery|quarry|smelting|furnace|crucible|mould|pattern|foundry|factory|
		workshop|mill|plant|machine|engine|motor|tool|jig|fixture|die|press|stamping|punching|
		boring|milling|grinding|polishing|plating|painting|coating|sealing|packing|gland|joint|
		coupling|clutch plate|brake|cam|linkage|ratchet|pawl|worm gear|sprocket|belt|conveyor|
		hoist|elevator|escalator|scaffold|formwork|pile|caisson work|cofferdam|retaining wall|arch|
		vault|dome|roof|floor|wall|window|door|stair|ladder|tank|reservoir|filter|sieve|hopper|
		chute|silo|bunker|boiler house|chimney|flue|damper|draught|exhaust|intake|manifold|
		injector|ejector|turbocharger|radiator|fan|blower|compressor|accumulator tank`),
	// Non-ASCII and hyphenated entries exercise Unicode handling downstream.
	words(eraAny, `Maßstab|café|naïve|rôle|über-gear|façade|régime|coöperation|élan|Wärmepumpe|
		señal lamp|Zündholz|kōgyō|déjà-vu valve|self-starter|fail-safe|
		post-tensioning|cross-section|by-product|rule-of-thumb|know-how|trade-off|half-shaft|
		counter-weight|re-entrant corner|non-destructive testing|x-ray|T-square|U-bolt|V-belt`),
)

// Modifiers and heads for two-word compounds. A compound takes the era of
// its modifier unless that is eraAny, in which case it takes the head's.
var modifiers = concat(
	words(eraSteam, `steam|wrought|horse|paddle|coal-fired|gas-lit|beam|sailing`),
	words(eraElectric, `electric|telegraphic|induction|arc|storage|galvanic|dynamo`),
	words(eraMachine, `diesel|motor|reinforced|jet|radio|atomic|plastic|aircraft|petrol|welded`),
	words(eraComputing, `digital|transistor|programmable|laser|computer|numerical|microwave|solid-state`),
	words(eraModern, `smart|solar|wireless|networked|low-carbon|autonomous|cloud|modular|hybrid|battery`),
	words(eraAny, `hydraulic|pneumatic|cast|high-speed|low-voltage|high-voltage|automatic|portable|
		marine|rotary|compound|thermal|acoustic|optical|mechanical|structural|industrial|municipal|
		agricultural|military|naval|civil|sanitary|chemical|mining|railway|harbour|bridge|tunnel|
		safety|emergency|standard|precision|heavy|light|double|single|twin|variable|fixed|sliding|
		floating|suspension|cantilever|tubular|hollow|flexible|rigid|balanced|self-acting|
		centrifugal|reciprocating|rolling|fluid|vertical|horizontal|underground|overhead|offshore|
		coastal|alpine|tropical|quill|marl|vellum`),
)

var heads = concat(
	words(eraAny, `hammer|engine|pump|valve|brake|motor|beam|bridge|cell|controller|furnace|lamp|
		gauge|relay|drive|turbine|coupling|bearing|switch|cable|crane|winch|lathe|press|boiler|
		condenser|governor|regulator|indicator|recorder|meter|sensor|actuator|transmission|gearbox|
		frame|girder|truss|arch|pier|abutment|foundation|pile|wall|dam|lock|weir|sluice|culvert|
		tunnel|shaft|mine|quarry|kiln|oven|mill|loom|saw|drill|chisel|spanner|wrench|jack|hoist|
		lift|conveyor|belt|chain|spring|axle|wheel|tyre|rail|track|sleeper|signal|points|
		junction|station|depot|yard|dock|slipway|hull|propeller|rudder|mast|anchor|buoy|
		lighthouse|tank|vessel|reservoir|filter|pipe|main|sewer|drain|duct|fan|blower|compressor|
		heater|cooler|radiator|exchanger|injector|nozzle|burner|chimney|stack|flue|damper|
		insulator|conductor|transformer|generator|battery|circuit|network|grid|panel|array|
		display|keyboard|terminal|printer|plotter|scanner|camera|microscope|telescope|
		theodolite|level|compass|chronometer|clock|counter|timer|thermostat|fuse|breaker|plug|
		socket|joint|seal|gasket|washer|rivet|bolt|screw|nut|pin|key|cotter|cam|lever|
		linkage|piston|cylinder|crank|flywheel|clutch|coupler|scaffold|formwork|mould|pattern|
		casting|forging|plate|sheet|bar|rod|tube|wire|mesh|fabric|panel saw|test|trial|survey|
		code|manual|handbook|course|school|works|plant|factory|workshop|laboratory|committee|
		inspection|accident|failure|repair|overhaul`),
)

// Invented jargon: the house names of instruments from the journal's own
// workshops, made from syllables of no language so they name no real word,
// person, place or product. Every one is checked against a general English
// word list (with proper names) in the tests; tails that make real English
// (-ing, -ite, -ane) or read as trade names (-tron, -plex, -dyne) are
// avoided.
var (
	jargonStems = []string{"quill", "torv", "sarn", "keln", "thrann", "ulv", "vell", "yarr",
		"dwess", "frim", "glost", "pravv"}
	jargonTails = []string{"ostat", "ograph", "ometer", "oscope", "olith", "otype", "ophore"}
)

// Town is the invented town the journal is published in.
const Town = "Quillmere"

// MadeUpWords returns every word the generator invents (as opposed to the
// real English words and phrases it uses as terms): all the jargon it can
// make, and the town's name.
func MadeUpWords() []string {
	out := []string{Town}
	for _, s := range jargonStems {
		for _, t := range jargonTails {
			out = append(out, s+t)
		}
	}
	return out
}

func concat(lists ...[]word) []word {
	var out []word
	for _, l := range lists {
		out = append(out, l...)
	}
	return out
}

// pickTerms returns n distinct NFC-normalised terms: headline words first
// (a random subset when n is smaller), then fillers, a little jargon, and
// random compounds.
func pickTerms(n int, rng *rand.Rand) ([]word, error) {
	seen := make(map[string]bool)
	var out []word
	add := func(w word) {
		w.text = norm.NFC.String(w.text)
		if len(out) < n && !seen[w.text] {
			seen[w.text] = true
			out = append(out, w)
		}
	}
	for _, i := range rng.Perm(len(headlines)) {
		add(headlines[i])
	}
	for _, i := range rng.Perm(len(fillers)) {
		add(fillers[i])
	}
	// About one term in forty is jargon.
	nj := min(max(1, n/40), len(jargonStems)*len(jargonTails))
	for _, i := range rng.Perm(len(jargonStems) * len(jargonTails))[:nj] {
		stem, tail := jargonStems[i/len(jargonTails)], jargonTails[i%len(jargonTails)]
		add(word{text: stem + tail, era: eraAny, kind: jargon, pin: math.NaN(), pin2: math.NaN()})
	}
	if len(out) < n {
		capacity := len(modifiers) * len(heads)
		for _, i := range rng.Perm(capacity) {
			if len(out) == n {
				break
			}
			m, h := modifiers[i/len(heads)], heads[i%len(heads)]
			e := m.era
			if e == eraAny {
				e = h.era
			}
			add(word{text: m.text + " " + h.text, era: e, kind: compound, pin: math.NaN(), pin2: math.NaN()})
		}
	}
	if len(out) < n {
		return nil, fmt.Errorf("corpus: cannot make %d distinct terms; at most %d", n, len(out))
	}
	return out, nil
}
