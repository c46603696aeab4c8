package corpus

import (
	"fmt"
	"math/rand/v2"
	"strings"

	"golang.org/x/text/unicode/norm"
)

// era is the part of the journal's life in which a word belongs. It steers
// the choice of shape so that computing words arrive late and steam words
// fade, which keeps the demo believable at a glance.
type era int

const (
	eraAny       era = iota // workshop and society words: any shape, any time
	eraSteam                // strong early, fading or dying out
	eraElectric             // rising from the 1880s
	eraMachine              // the motor, concrete and aircraft years, 1900–1970
	eraComputing            // absent before the late 1940s
	eraModern               // absent before the 1980s
)

// word is a vocabulary entry written by hand for this demo.
type word struct {
	text string
	era  era
	kind kind
}

// kind says how a term was made; hand-written words make the best headline
// terms, so they are favoured for the top share ranks.
type kind int

const (
	handWritten kind = iota
	jargon
	compound
)

// words splits a "|"-separated list so entries may contain spaces.
func words(e era, list string) []word {
	var out []word
	for _, s := range strings.Split(list, "|") {
		if s = strings.TrimSpace(s); s != "" {
			out = append(out, word{s, e, handWritten})
		}
	}
	return out
}

// Single terms, grouped by era. All invented for the demo; none is a brand.
var singles = concat(
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

// Invented jargon: built from syllables so it cannot name a real product.
var (
	jargonStems = []string{"quill", "marl", "torv", "sarn", "vell", "brisk", "drom", "keln",
		"ostr", "pell", "rund", "thran", "ulv", "wend", "yarr", "zeph"}
	jargonTails = []string{"ostat", "ograph", "olith", "otron", "ometer", "oplex", "odyne",
		"ite", "ane", "ing", "ator", "oscope"}
)

func concat(lists ...[]word) []word {
	var out []word
	for _, l := range lists {
		out = append(out, l...)
	}
	return out
}

// pickTerms returns n distinct NFC-normalised terms with their eras. Hand
// written singles come first, then a little jargon, then random compounds.
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
	// With fewer terms than singles, take a random subset so that small
	// demos still mix eras.
	order := rng.Perm(len(singles))
	for _, i := range order {
		add(singles[i])
	}
	// About one term in forty is jargon.
	nj := min(max(1, n/40), len(jargonStems)*len(jargonTails))
	for _, i := range rng.Perm(len(jargonStems) * len(jargonTails))[:nj] {
		stem, tail := jargonStems[i/len(jargonTails)], jargonTails[i%len(jargonTails)]
		add(word{stem + tail, eraAny, jargon})
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
			add(word{m.text + " " + h.text, e, compound})
		}
	}
	if len(out) < n {
		return nil, fmt.Errorf("corpus: cannot make %d distinct terms; at most %d", n, len(out))
	}
	return out, nil
}
