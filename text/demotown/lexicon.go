package demotown

// Everything in this file is invented for the demo: the town, its districts, streets,
// businesses and people. Given names are common English given names; every surname is
// made up (checked not to be a famous person's name when paired with the given names here,
// from memory). Street names are made-up words or generic numbered streets.

// TownName is the invented town the corpus describes.
const TownName = "Quillmere"

// Districts are the invented patrol districts (read only).
var Districts = []string{"Lantern Hill", "Millrace", "Cobble Flats", "Eastwater", "Sorrel Park"}

// street is an invented street: a name and its USPS Publication 28 standard suffix
// abbreviation (St, Ave, Rd, Ln, Ct, Blvd, Dr, Way, Pl, Ter, Cir, Pkwy).
type street struct{ name, suffix string }

var streets = []street{
	{"Marrowell", "St"}, {"Quennel", "Ave"}, {"Tarrowby", "Rd"}, {"Wrenfield", "Ln"},
	{"Yarrowick", "Ct"}, {"Mossgrove", "Blvd"}, {"Pellinger", "Dr"}, {"Thistlecombe", "Way"},
	{"Brindlewood", "Ave"}, {"Cinderhill", "Rd"}, {"Larkmoor", "St"}, {"Juniperhall", "Ln"},
	{"Ashcombe", "Dr"}, {"Bellhollow", "Rd"}, {"Corriden", "Ave"}, {"Dunnerfell", "St"},
	{"Fennowick", "Pl"}, {"Gorsebury", "Ter"}, {"Hallowmere", "Cir"}, {"Kestrelline", "Pkwy"},
	{"Elm", "St"}, {"Alder", "Ave"}, {"Sumac", "Ln"}, {"Tamarack", "Ct"},
	{"2nd", "St"}, {"3rd", "Ave"}, {"4th", "Ave"}, {"5th", "St"}, {"7th", "St"}, {"9th", "Ave"},
	{"Orchardine", "Rd"}, {"Veltmoor", "Blvd"},
}

// Businesses and places: capitalised non-names a name detector must leave alone.
var places = []string{
	"Larkmoor Market", "the Quennel Ave laundromat", "Brindle Park", "Quillmere Public Library",
	"the Millrace Transit Center", "Corriden Elementary", "the Gas-N-Go on 4th Ave",
	"Hallowmere Apartments", "the Sorrel Park pool", "Veltmoor Plaza", "the Eastwater boat launch",
	"Tarrowby Hardware", "the Cobble Flats rec center", "Dunnerfell Diner", "Pellinger Storage",
}

// First names (common given names) and invented surnames. Exported so that a redaction
// test can use them as a user name list.
var (
	MaleFirstNames = []string{
		"James", "Robert", "Michael", "David", "Daniel", "Joseph", "Thomas", "Anthony", "Kevin",
		"Brian", "Jason", "Eric", "Marcus", "Luis", "Carlos", "Andre", "Tyler", "Dylan",
		"Caleb", "Jordan", "Travis", "Derek", "Shawn", "Victor", "Omar", "Hector", "Wesley",
		"Darnell", "Gary", "Kenneth",
	}
	FemaleFirstNames = []string{
		"Maria", "Jennifer", "Linda", "Patricia", "Jessica", "Ashley", "Amanda", "Stephanie",
		"Nicole", "Melissa", "Rachel", "Tanya", "Denise", "Keisha", "Rosa", "Ana", "Brittany",
		"Crystal", "Heather", "Megan", "Latoya", "Gloria", "Yolanda", "Erin", "Kayla",
		"Monique", "Sandra", "Teresa", "Vanessa", "Dana",
	}
	Surnames = []string{
		"Ashwick", "Brenholt", "Carrowby", "Dellacort", "Emberlin", "Farrowgate", "Gillmoth",
		"Hasselby", "Iverholt", "Jorvane", "Kettleby", "Larrowin", "Mossford", "Nettlecomb",
		"Orrendale", "Pellowin", "Quarrison", "Rushcombe", "Stallowin", "Tamberlee",
		"Umberlin", "Vantrell", "Wickerham", "Yarnholt", "Zobrecht", "Abernoll", "Blackwither",
		"Cassingale", "Drumberly", "Eskerwood", "Fallowmere", "Grendahl", "Hollifax",
		"Ingleby-Rourke", "Jessamont", "Kildarrow", "Lomaxton", "Merriwold", "Nockwell",
		"Osterhagen", "Pruitfield", "Quintover", "Rosgarde", "Sellbourne", "Thackmoor",
		"Underhay", "Vollmering", "Westerhold", "Yelverstone", "Zandervoort", "Alcantero",
		"Benavidro", "Castrejon", "Dominguel", "Escalvo", "Fuentaral", "Gallardino",
		"Herrezuela", "Okonkwele", "Nwachurin", "Tranhoven", "Nguyenberg", "Kowalczar",
		"Petrosky-Vane",
	}
)

// abbrevs maps each abbreviation the corpus writes (lower case, without a trailing period)
// to its expansion. These are common incident-report abbreviations (common practice,
// written from memory).
var abbrevs = map[string]string{
	"veh": "vehicle", "vehs": "vehicles", "subj": "subject", "rp": "reporting party", "dob": "date of birth",
	"ofc": "officer", "susp": "suspect", "vic": "victim", "w/": "with", "b/c": "because",
	"approx": "approximately", "res": "residence", "dept": "department", "goa": "gone on arrival",
	"utl": "unable to locate", "y/o": "years old", "hrs": "hours", "lic": "license",
	"info": "information", "w/o": "without", "r/o": "reporting officer", "dl": "driver license",
	"nfa": "no further action", "apt": "apartment", "comp": "complainant", "poss": "possible",
	"sgt": "sergeant", "wm": "white male", "bm": "black male", "hm": "hispanic male",
	"wf": "white female", "bf": "black female", "hf": "hispanic female", "pd": "police department",
	"ems": "emergency medical services", "mh": "mental health", "wx": "weather",
	"resp": "responded", "adv": "advised", "dispo": "disposition", "loc": "location",
	"ppl": "people", "blk": "block", "n/b": "northbound", "s/b": "southbound",
	"e/b": "eastbound", "w/b": "westbound", "mph": "miles per hour", "ssn": "social security number",
	"vin": "vehicle identification number",
}

// syn holds the synonym sets that {name} slots in templates draw from. An alternative that
// starts with '^' is an abbreviation (its text after '^' must be a key of abbrevs, ignoring
// case and a trailing period). Alternatives may contain further {slots}. Many sets are used
// by several themes so that themes share vocabulary.
var syn = map[string][]string{
	"veh":       {"vehicle", "vehicle", "vehicle", "car", "^veh", "^veh"},
	"vehs":      {"vehicles", "cars", "^vehs"},
	"subj":      {"subject", "subject", "{male}", "individual", "^subj"},
	"asubj":     {"a subject", "a subject", "a {male}", "an individual"},
	"subjf":     {"subject", "female", "woman", "^subj"},
	"rp":        {"the RP", "the reporting party", "the caller", "the complainant", "the RP", "the comp"},
	"RP":        {"^RP", "^RP", "The reporting party", "The caller", "The complainant", "^RP"},
	"ofc":       {"officers", "units", "I", "we", "^ofc", "R/O"},
	"I":         {"I", "I", "R/O", "This officer", "Writer"},
	"contacted": {"contacted", "contacted", "spoke with", "made contact with", "met with", "talked to"},
	"advised":   {"advised", "advised", "told", "informed", "^adv"},
	"arrived":   {"arrived", "arrived on scene", "got on scene", "responded"},
	"approx":    {"approximately", "about", "around", "^approx", "^approx"},
	"w":         {"with", "with", "^w/"},
	"wo":        {"without", "^w/o"},
	"bcof":      {"because of", "^b/c of", "due to"},
	"ofcobj":    {"officers", "me", "^ofc", "my partner"},
	"bc":        {"because", "since", "as", "^b/c"},
	"res":       {"residence", "residence", "house", "home", "^res", "apartment"},
	"dept":      {"department", "^dept", "^PD", "agency"},
	"area":      {"area", "area", "vicinity", "neighborhood", "block"},
	"checked":   {"checked", "checked", "searched", "canvassed", "patrolled"},
	"located":   {"located", "found", "observed", "saw"},
	"stated":    {"stated", "stated", "said", "reported", "explained", "told me"},
	"left":      {"left", "left the area", "departed", "went on his way"},
	"info":      {"information", "^info", "details"},
	"time":      {"{approx} {hhmm} hrs", "{approx} {hhmm} hours", "{hhmm} hrs", "{approx} {hhmm}"},
	"itime":     {"{approx} {ihhmm} hrs", "{approx} {ihhmm} hours", "{ihhmm} hrs"},
	"later":     {"a short time later", "shortly after", "a few minutes later", "later"},
	"officer":   {"officer", "officer", "^ofc"},
	"male":      {"male", "man", "guy", "male subject"},
	"female":    {"female", "woman", "lady"},
	"desc":      {"a ^WM", "a ^BM", "a ^HM", "a ^WF", "a ^BF", "a ^HF", "a male", "a female", "a juvenile"},
	"clothes":   {"a dark hoodie", "a red jacket", "jeans and a white shirt", "a gray sweatshirt", "a black beanie", "a green backpack", "work boots", "a yellow rain coat"},
	"color":     {"black", "white", "silver", "gray", "red", "blue", "green", "tan", "maroon"},
	"make":      {"sedan", "pickup", "SUV", "minivan", "hatchback", "work van", "coupe", "Honda", "Toyota", "Ford", "Chevy", "Nissan"},
	"item":      {"a backpack", "a laptop", "a wallet", "sunglasses", "loose change", "a purse", "tools", "a phone charger", "a gym bag", "a tablet", "paperwork", "a handgun case", "prescription medication", "a garage door opener"},
	"animal":    {"dog", "dog", "dog", "cat", "raccoon", "goat", "horse", "pit bull", "German shepherd", "stray dog", "deer", "rooster"},
	"noise":     {"loud music", "a party", "a car alarm", "yelling", "a barking dog", "bass from a car stereo", "fireworks", "construction noise", "a generator", "people shouting"},
	"alarm":     {"burglary alarm", "alarm", "panic alarm", "motion alarm", "door alarm", "glass break alarm"},
	"aalarm":    {"a burglary alarm", "an alarm", "an audible alarm", "a panic alarm", "a motion alarm", "a door alarm", "a glass break alarm"},
	"business":  {"business", "store", "office", "warehouse", "shop", "restaurant"},
	"street":    {"{st}", "{st}", "{st}"},
	"place":     {"{pl}"},
	"days":      {"two weeks", "ten days", "a month", "several weeks", "three days", "over a week"},
	"dur":       {"ten minutes", "about an hour", "twenty minutes", "most of the night", "several hours", "a few minutes", "two days"},
	"nfa":       {"No further action.", "^NFA.", "Nothing further.", "No further action taken.", "No report needed."},
	"code":      {"Code 4.", "10-8.", "Code 4, 10-8.", "10-98, back in service.", "Returned to service, 10-8."},
	"cleared":   {"Cleared.", "Cleared, no report.", "Call cleared.", "Unit cleared.", "Cleared the call."},
	"goa":       {"^GOA", "gone on arrival", "^GOA", "gone prior to arrival"},
	"utl":       {"^UTL", "unable to locate", "^UTL"},
	"dir":       {"northbound", "southbound", "eastbound", "westbound", "^N/B", "^S/B", "^E/B", "^W/B"},
	"possibly":  {"possibly", "^poss", "maybe", "likely"},
	"people":    {"people", "^ppl", "subjects", "persons"},
	"comp":      {"complainant", "^comp", "caller", "reporting party"},
	"ems":       {"^EMS", "medics", "fire and ^EMS", "an ambulance"},
	"mh":        {"mental health", "^MH", "behavioral health"},
	"crisis":    {"crisis team", "mobile crisis unit", "^MH clinician", "crisis line"},
	"dl":        {"driver license", "^DL", "license", "^lic"},
	"speed":     {"45", "52", "38", "61", "47", "33", "70", "29"},
	"limit":     {"25", "30", "35", "40", "45"},
	"sgt":       {"^Sgt.", "the sergeant", "a supervisor", "the shift supervisor"},
	"quickly":   {"quickly", "immediately", "right away"},
	"susp":      {"suspect", "suspect", "^susp"},
	"vic":       {"victim", "victim", "^vic"},
}

// stop lists the short function words that are never chosen for OCR noise (content words
// only get noise). Written from memory.
var stop = map[string]bool{
	"the": true, "and": true, "that": true, "with": true, "from": true, "this": true,
	"they": true, "them": true, "their": true, "there": true, "were": true, "was": true,
	"have": true, "had": true, "been": true, "into": true, "about": true, "would": true,
	"could": true, "which": true, "when": true, "then": true, "than": true, "what": true,
	"also": true, "over": true, "after": true, "before": true, "while": true, "where": true,
	"will": true, "said": true, "very": true, "some": true,
}

// misspellings maps words of the templates to misspellings that writers of incident
// reports commonly make (common practice; written from memory, not from any list).
var misspellings = map[string][]string{
	"advised":       {"adviced", "advized"},
	"arrived":       {"arived", "arrivied"},
	"neighbor":      {"nieghbor", "neighbour", "neigbor"},
	"neighbors":     {"nieghbors", "neigbors"},
	"registration":  {"registation", "regestration"},
	"business":      {"buisness", "bussiness"},
	"warrant":       {"warrent"},
	"insurance":     {"insurence", "insureance"},
	"vehicle":       {"vehical", "vehicel", "vehicule"},
	"trespass":      {"tresspass", "trespas"},
	"responded":     {"responed", "respoded"},
	"description":   {"discription", "descripton"},
	"argument":      {"arguement"},
	"license":       {"liscense", "lisence", "licence"},
	"suspicious":    {"suspicous", "suspisious"},
	"juveniles":     {"juvenilles"},
	"across":        {"accross"},
	"residence":     {"residance", "recidence"},
	"medication":    {"medicaton", "medecation"},
	"information":   {"infomation", "informaton"},
	"handcuffed":    {"handcufed", "hand cuffed"},
	"cooperative":   {"cooperitive", "coperative"},
	"sergeant":      {"sargent", "sergant"},
	"approximately": {"approximatly", "aproximately"},
	"apartment":     {"appartment", "apartmant"},
	"until":         {"untill"},
	"threatening":   {"threatning"},
	"separated":     {"seperated"},
	"equipment":     {"equiptment"},
	"belongings":    {"belogings"},
	"immediately":   {"immediatly", "imediately"},
	"explained":     {"explaned"},
	"located":       {"locatd"},
	"hospital":      {"hospitol"},
	"returned":      {"retuned"},
	"stopped":       {"stoped"},
	"property":      {"propery", "proprety"},
	"parked":        {"parkd"},
	"officer":       {"offcier", "oficer"},
}
