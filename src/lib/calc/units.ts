/**
 * Unit conversion for the quantities a crew meets on a point-repair job.
 *
 * Every unit is stored as a linear map to the SI base of its quantity:
 * base = value × factor + offset (offset only for temperatures).
 * Factors are exact by definition where a definition exists:
 * inch 0.0254 m, foot 0.3048 m, avoirdupois pound 0.45359237 kg, US gallon 231 in³,
 * standard gravity 9.80665 m/s² (kgf, conventional metre and foot of water),
 * pound-force = pound × standard gravity. Source: NIST SP 811 (2008), Appendix B.
 */

export type Quantity =
	| 'length'
	| 'area'
	| 'volume'
	| 'mass'
	| 'pressure'
	| 'force'
	| 'time'
	| 'temperature'
	| 'ratio'
	| 'arealDensity'
	| 'density'
	| 'unitWeight'
	| 'angle';

export type UnitSystem = 'metric' | 'imperial';

interface UnitDef {
	quantity: Quantity;
	factor: number;
	offset?: number;
	/** How the unit is printed to a person. */
	label: string;
	/** Which system a person means by the unit; absent when both use it. */
	system?: UnitSystem;
}

const INCH_M = 0.0254;
const FOOT_M = 0.3048;
const POUND_KG = 0.45359237;
const OUNCE_KG = POUND_KG / 16;
const GALLON_M3 = 231 * INCH_M ** 3;
const STANDARD_GRAVITY = 9.80665;
const POUND_FORCE_N = POUND_KG * STANDARD_GRAVITY;
const PSI_PA = POUND_FORCE_N / INCH_M ** 2;
/** Conventional metre of water: 1 m × 1000 kg/m³ × standard gravity (NIST SP 811, B.8). */
const METRE_OF_WATER_PA = 1000 * STANDARD_GRAVITY;

const UNITS: Record<string, UnitDef> = {
	mm: { quantity: 'length', factor: 1e-3, label: 'mm', system: 'metric' },
	cm: { quantity: 'length', factor: 1e-2, label: 'cm', system: 'metric' },
	m: { quantity: 'length', factor: 1, label: 'm', system: 'metric' },
	in: { quantity: 'length', factor: INCH_M, label: 'in', system: 'imperial' },
	ft: { quantity: 'length', factor: FOOT_M, label: 'ft', system: 'imperial' },
	/** Litres per square metre of surface, as water-test allowances are stated: 1 L/m² = 1 mm. */
	'L/m2': { quantity: 'length', factor: 1e-3, label: 'L/m²', system: 'metric' },

	mm2: { quantity: 'area', factor: 1e-6, label: 'mm²', system: 'metric' },
	cm2: { quantity: 'area', factor: 1e-4, label: 'cm²', system: 'metric' },
	m2: { quantity: 'area', factor: 1, label: 'm²', system: 'metric' },
	in2: { quantity: 'area', factor: INCH_M ** 2, label: 'in²', system: 'imperial' },
	ft2: { quantity: 'area', factor: FOOT_M ** 2, label: 'ft²', system: 'imperial' },

	mL: { quantity: 'volume', factor: 1e-6, label: 'mL', system: 'metric' },
	L: { quantity: 'volume', factor: 1e-3, label: 'L', system: 'metric' },
	m3: { quantity: 'volume', factor: 1, label: 'm³', system: 'metric' },
	in3: { quantity: 'volume', factor: INCH_M ** 3, label: 'in³', system: 'imperial' },
	gal: { quantity: 'volume', factor: GALLON_M3, label: 'US gal', system: 'imperial' },
	ft3: { quantity: 'volume', factor: FOOT_M ** 3, label: 'ft³', system: 'imperial' },

	g: { quantity: 'mass', factor: 1e-3, label: 'g', system: 'metric' },
	kg: { quantity: 'mass', factor: 1, label: 'kg', system: 'metric' },
	oz: { quantity: 'mass', factor: OUNCE_KG, label: 'oz', system: 'imperial' },
	lb: { quantity: 'mass', factor: POUND_KG, label: 'lb', system: 'imperial' },

	Pa: { quantity: 'pressure', factor: 1, label: 'Pa', system: 'metric' },
	kPa: { quantity: 'pressure', factor: 1e3, label: 'kPa', system: 'metric' },
	MPa: { quantity: 'pressure', factor: 1e6, label: 'MPa', system: 'metric' },
	mbar: { quantity: 'pressure', factor: 100, label: 'mbar', system: 'metric' },
	bar: { quantity: 'pressure', factor: 1e5, label: 'bar', system: 'metric' },
	psi: { quantity: 'pressure', factor: PSI_PA, label: 'psi', system: 'imperial' },
	mH2O: { quantity: 'pressure', factor: METRE_OF_WATER_PA, label: 'm H₂O', system: 'metric' },
	ftH2O: {
		quantity: 'pressure',
		factor: METRE_OF_WATER_PA * FOOT_M,
		label: 'ft H₂O',
		system: 'imperial'
	},
	inH2O: {
		quantity: 'pressure',
		factor: METRE_OF_WATER_PA * INCH_M,
		label: 'in H₂O',
		system: 'imperial'
	},

	N: { quantity: 'force', factor: 1, label: 'N', system: 'metric' },
	kN: { quantity: 'force', factor: 1e3, label: 'kN', system: 'metric' },
	kgf: { quantity: 'force', factor: STANDARD_GRAVITY, label: 'kgf', system: 'metric' },
	lbf: { quantity: 'force', factor: POUND_FORCE_N, label: 'lbf', system: 'imperial' },

	s: { quantity: 'time', factor: 1, label: 's' },
	min: { quantity: 'time', factor: 60, label: 'min' },
	h: { quantity: 'time', factor: 3600, label: 'h' },

	K: { quantity: 'temperature', factor: 1, offset: 0, label: 'K', system: 'metric' },
	degC: { quantity: 'temperature', factor: 1, offset: 273.15, label: '°C', system: 'metric' },
	degF: {
		quantity: 'temperature',
		factor: 5 / 9,
		offset: 273.15 - (32 * 5) / 9,
		label: '°F',
		system: 'imperial'
	},

	'': { quantity: 'ratio', factor: 1, label: '' },
	'%': { quantity: 'ratio', factor: 0.01, label: '%' },

	'g/m2': { quantity: 'arealDensity', factor: 1e-3, label: 'g/m²', system: 'metric' },
	'kg/m2': { quantity: 'arealDensity', factor: 1, label: 'kg/m²', system: 'metric' },
	'oz/ft2': {
		quantity: 'arealDensity',
		factor: OUNCE_KG / FOOT_M ** 2,
		label: 'oz/ft²',
		system: 'imperial'
	},

	'kg/m3': { quantity: 'density', factor: 1, label: 'kg/m³', system: 'metric' },
	'g/cm3': { quantity: 'density', factor: 1000, label: 'g/cm³', system: 'metric' },
	'kg/L': { quantity: 'density', factor: 1000, label: 'kg/L', system: 'metric' },
	'lb/gal': {
		quantity: 'density',
		factor: POUND_KG / GALLON_M3,
		label: 'lb/US gal',
		system: 'imperial'
	},

	/** Weight per volume (soil loads): pound-force per cubic foot, "pcf". */
	'lb/ft3': {
		quantity: 'unitWeight',
		factor: POUND_FORCE_N / FOOT_M ** 3,
		label: 'lb/ft³',
		system: 'imperial'
	},
	'kN/m3': { quantity: 'unitWeight', factor: 1e3, label: 'kN/m³', system: 'metric' },

	deg: { quantity: 'angle', factor: Math.PI / 180, label: '°' },
	rad: { quantity: 'angle', factor: 1, label: 'rad' }
};

/** Other spellings people type, mapped to the codes above. Matched exactly, then lower-cased. */
const ALIASES: Record<string, string> = {
	millimetre: 'mm',
	millimeter: 'mm',
	millimetres: 'mm',
	millimeters: 'mm',
	metre: 'm',
	meter: 'm',
	metres: 'm',
	meters: 'm',
	inch: 'in',
	inches: 'in',
	'"': 'in',
	foot: 'ft',
	feet: 'ft',
	"'": 'ft',
	'mm²': 'mm2',
	'mm^2': 'mm2',
	'cm²': 'cm2',
	'cm^2': 'cm2',
	'm²': 'm2',
	'm^2': 'm2',
	'sq m': 'm2',
	'in²': 'in2',
	'in^2': 'in2',
	'sq in': 'in2',
	'ft²': 'ft2',
	'ft^2': 'ft2',
	'sq ft': 'ft2',
	l: 'L',
	litre: 'L',
	liter: 'L',
	litres: 'L',
	liters: 'L',
	ml: 'mL',
	millilitre: 'mL',
	milliliter: 'mL',
	'm³': 'm3',
	'm^3': 'm3',
	'in³': 'in3',
	'in^3': 'in3',
	'ft³': 'ft3',
	'ft^3': 'ft3',
	'cu ft': 'ft3',
	gallon: 'gal',
	gallons: 'gal',
	'us gal': 'gal',
	'gal (us)': 'gal',
	gram: 'g',
	grams: 'g',
	kilogram: 'kg',
	kilograms: 'kg',
	kgs: 'kg',
	lbs: 'lb',
	lbm: 'lb',
	pound: 'lb',
	pounds: 'lb',
	ounce: 'oz',
	ounces: 'oz',
	pa: 'Pa',
	kpa: 'kPa',
	mpa: 'MPa',
	barg: 'bar',
	psig: 'psi',
	mh2o: 'mH2O',
	'm h2o': 'mH2O',
	'm h₂o': 'mH2O',
	'm wc': 'mH2O',
	mwc: 'mH2O',
	fth2o: 'ftH2O',
	'ft h2o': 'ftH2O',
	'ft h₂o': 'ftH2O',
	'ft wc': 'ftH2O',
	inh2o: 'inH2O',
	'in h2o': 'inH2O',
	n: 'N',
	kn: 'kN',
	newton: 'N',
	newtons: 'N',
	kilonewton: 'kN',
	kilonewtons: 'kN',
	lbf: 'lbf',
	sec: 's',
	secs: 's',
	second: 's',
	seconds: 's',
	mins: 'min',
	minute: 'min',
	minutes: 'min',
	hr: 'h',
	hrs: 'h',
	hour: 'h',
	hours: 'h',
	'°c': 'degC',
	degc: 'degC',
	celsius: 'degC',
	'°f': 'degF',
	degf: 'degF',
	fahrenheit: 'degF',
	k: 'K',
	kelvin: 'K',
	percent: '%',
	ratio: '',
	gsm: 'g/m2',
	'g/m²': 'g/m2',
	'g/m^2': 'g/m2',
	'kg/m²': 'kg/m2',
	'kg/m^2': 'kg/m2',
	'oz/ft²': 'oz/ft2',
	'oz/ft^2': 'oz/ft2',
	'kg/m³': 'kg/m3',
	'kg/m^3': 'kg/m3',
	'g/cm³': 'g/cm3',
	'g/cm^3': 'g/cm3',
	'g/ml': 'g/cm3',
	'kg/l': 'kg/L',
	pcf: 'lb/ft3',
	'°': 'deg',
	degree: 'deg',
	degrees: 'deg',
	'l/m2': 'L/m2',
	'l/m²': 'L/m2',
	'lb/ft³': 'lb/ft3',
	'lb/ft^3': 'lb/ft3',
	'kn/m3': 'kN/m3',
	'kn/m³': 'kN/m3',
	'kn/m^3': 'kN/m3'
};

/**
 * The code a unit is known by, or undefined when it is not known. The text is a person's, so
 * only the tables' own keys count ("constructor" and "__proto__" are unknown units).
 */
export function resolveUnit(unit: string): string | undefined {
	if (typeof unit !== 'string') return undefined;
	const trimmed = unit.trim().replace(/\s+/g, ' ');
	if (Object.hasOwn(UNITS, trimmed)) return trimmed;
	if (Object.hasOwn(ALIASES, trimmed)) return ALIASES[trimmed];
	const lower = trimmed.toLowerCase();
	return Object.hasOwn(ALIASES, lower) ? ALIASES[lower] : undefined;
}

function definition(unit: string): UnitDef {
	const code = resolveUnit(unit);
	if (code === undefined) throw new Error(`Unknown unit "${unit}"`);
	return UNITS[code];
}

/** The quantity a unit measures, or undefined for a unit this module does not know. */
export function quantityOf(unit: string): Quantity | undefined {
	const code = resolveUnit(unit);
	return code === undefined ? undefined : UNITS[code].quantity;
}

/**
 * Converts a value between two units of the same quantity.
 * Throws for an unknown unit or for units of different quantities.
 */
export function convert(value: number, fromUnit: string, toUnit: string): number {
	const from = definition(fromUnit);
	const to = definition(toUnit);
	if (from.quantity !== to.quantity) {
		throw new Error(`Cannot convert ${fromUnit} (${from.quantity}) to ${toUnit} (${to.quantity})`);
	}
	if (from === to) return value;
	const base = value * from.factor + (from.offset ?? 0);
	return (base - (to.offset ?? 0)) / to.factor;
}

/** Every unit code this module knows, for tests and pickers. */
export function unitCodes(): string[] {
	return Object.keys(UNITS);
}

/** The unit as printed to a person: "m²", "°C", "US gal". Unknown units print as given. */
export function unitLabel(unit: string): string {
	// the calculators' own steps name units by their codes: no need to tidy and look up aliases
	if (Object.hasOwn(UNITS, unit)) return UNITS[unit].label;
	const code = resolveUnit(unit);
	return code === undefined ? unit : UNITS[code].label;
}

export function systemOf(unit: string): UnitSystem | undefined {
	const code = resolveUnit(unit);
	return code === undefined ? undefined : UNITS[code].system;
}

/** The unit a person working in the other system would read a value in. */
const COUNTERPARTS: Record<string, string> = {
	mm: 'in',
	cm: 'in',
	m: 'ft',
	in: 'mm',
	ft: 'm',
	m2: 'ft2',
	mm2: 'in2',
	ft2: 'm2',
	in2: 'mm2',
	L: 'gal',
	gal: 'L',
	m3: 'ft3',
	ft3: 'm3',
	g: 'oz',
	kg: 'lb',
	oz: 'g',
	lb: 'kg',
	bar: 'psi',
	kPa: 'psi',
	psi: 'kPa',
	mH2O: 'ftH2O',
	ftH2O: 'mH2O',
	N: 'lbf',
	kN: 'lbf',
	kgf: 'lbf',
	lbf: 'kN',
	degC: 'degF',
	degF: 'degC',
	'g/m2': 'oz/ft2',
	'oz/ft2': 'g/m2',
	'lb/ft3': 'kN/m3',
	'kN/m3': 'lb/ft3'
};

/**
 * The unit to show a value in when the person works in `system`: the unit itself when it
 * already belongs there (or to both), else its counterpart (mm → in, bar → psi, psi → kPa).
 */
export function displayUnit(unit: string, system: UnitSystem): string {
	const code = resolveUnit(unit);
	if (code === undefined) return unit;
	const own = UNITS[code].system;
	if (own === undefined || own === system) return code;
	return Object.hasOwn(COUNTERPARTS, code) ? COUNTERPARTS[code] : code;
}
