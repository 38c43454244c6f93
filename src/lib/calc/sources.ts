/**
 * Where each formula comes from, as shown under a calculation. Wording is ours; the
 * standards are named by number and clause so a reader can look them up.
 */
export const SOURCES = {
	geometryCylinder: 'Geometry: the wall of a cylinder has area π × D × L',
	geometryAnnulus: 'Geometry: a ring of wall t in a bore D has area π × t × (D − t)',
	geometryFrustum:
		'Geometry: the side of a cone frustum has area π × (r₁ + r₂) × s; a cone unrolls into a flat ring sector',
	resinRatio:
		'Resin to glass weight ratios for hand lay-up: composites handbook ranges, from memory (chopped strand mat 25–35 % glass by weight, about 1.9–3 : 1; well-consolidated mat about 1.5–1.9; woven cloth 1.0–1.5); the mat or resin data sheet comes first',
	wasteAllowance: 'Waste allowance of 10–20 %: common practice',
	matWrap: 'Mat cut width = plies × circumference + overlap; patch = defect + at least 150 mm each end: common practice',
	mixRatio: 'Splitting a mix by ratio and converting volume to mass with density: arithmetic; the resin data sheet gives the ratio',
	hydrostatics: 'Hydrostatics: p = ρ × g × h with ρ = 1000 kg/m³ and g = 9.80665 m/s²',
	nist811:
		'NIST SP 811 (2008), Appendix B: 1 m of water (conventional) = 9.80665 kPa, 1 psi = 6.894757 kPa, 1 bar = 100 kPa, 1 kgf = 9.80665 N, 1 lbf = 4.448222 N',
	pressureWindow:
		"Inflate above the groundwater head and never above the packer maker's rated maximum for the diameter: common practice, stated in municipal point-repair specifications",
	thrust: 'Statics: the force on a pressurised end is F = p × A, with A = π × D² / 4',
	cureRule:
		'Reaction rate roughly doubles per 10 °C rise (factor 1.5–2.5 by resin): common practice; the resin data sheet comes first',
	f1216X11:
		'ASTM F1216, Appendix X1, Eq. X1.1: partially deteriorated gravity pipe, buckling under groundwater',
	f1216X12: 'ASTM F1216, Appendix X1, Eq. X1.2: partially deteriorated oval pipe, bending',
	f1216Dr100:
		'ASTM F1216, Appendix X1: with no groundwater above the invert, a maximum DR of about 100 (from memory)',
	f1216X13:
		'ASTM F1216, Appendix X1, Eq. X1.3: fully deteriorated gravity pipe under water, soil and live load',
	f1216X14: 'ASTM F1216, Appendix X1, Eq. X1.4: minimum stiffness E × I / D³ ≥ 0.093 psi',
	f1417:
		'ASTM F1417, low-pressure air test of plastic gravity sewer lines: T = 0.085 × D × K / Q, K = 0.000419 × D × L (not below 1), Q = 0.0015 ft³/min per ft²; clay lines: ASTM C828, concrete lines: ASTM C924',
	en1610:
		'EN 1610, clause 13.3, water test (method W): 30 min test, water added not above 0.15 L/m² of wetted internal surface for pipelines (0.20 for pipelines with their manholes, the manholes’ wetted surface counted; 0.40 for manholes alone)',
	f1216Table1:
		'ASTM F1216, Table 1: minimum short-term properties of felt-tube CIPP, flexural strength 4500 psi and flexural modulus 250 000 psi; glass-mat laminates are usually much stiffer and stronger, so use the maker’s tested values'
} as const;
