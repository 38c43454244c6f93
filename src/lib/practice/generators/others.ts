/** Problems on the transition taper, cure time, watertightness tests and ASTM F1216 liner thickness. */
import type { Generator, Mistake } from '../types';
import { SLOW_CURE_BELOW_C } from '../../calc/cure';
import { manholeWettedAreaM2 } from '../../calc/watertightness';
import { article, g, inUnit, pickHost, pickWeighted, SEWER_BORES_MM, TRANSITIONS_MM } from './common';

export const transitionAreaGenerator: Generator = {
	id: 'transition-area',
	calculator: 'transition-area',
	title: 'Transition taper',
	topic: 'Transition taper',
	level: 'foundation',
	tolerancePercent: 3,
	ranges: {
		smallDiameterMm: { min: 100, max: 225, basis: 'small side of the common concentric transitions (common practice)' },
		largeDiameterMm: { min: 150, max: 300, basis: 'large side of the common concentric transitions (common practice)' },
		taperLengthMm: { min: 50, max: 300, basis: 'reducer and taper lengths met in DN100-300, from short reducers of about 50 mm to 300 mm tapers (common practice)' }
	},
	create(rng) {
		const [smallDiameterMm, largeDiameterMm] = rng.pick(TRANSITIONS_MM);
		const taperLengthMm = rng.pick([100, 150, 200, 250, 300]);
		const asksSlant = rng.chance(0.35);
		return {
			inputs: { smallDiameterMm, largeDiameterMm, taperLengthMm },
			asks: asksSlant ? 'slantMm' : 'areaM2',
			unit: asksSlant ? 'mm' : 'm2',
			prompt:
				`A concentric transition runs from a ${g(smallDiameterMm, 'mm')} to a ${g(largeDiameterMm, 'mm')} pipe over a taper ${g(taperLengthMm, 'mm')} long. ` +
				(asksSlant
					? 'How long is the taper measured along its sloping side (the slant length), in millimetres?'
					: 'What is the area of the sloping taper surface the patch must cover, in square metres?')
		};
	},
	mistakes(p) {
		const i = p.inputs;
		return [
			{ hint: 'The frustum formulas take radii: halve each diameter first.', inputs: { ...i, smallDiameterMm: i.smallDiameterMm * 2, largeDiameterMm: i.largeDiameterMm * 2 } },
			{
				hint: 'The taper rises by the difference in radii, (D₂ − D₁) ÷ 2, not the difference in diameters.',
				inputs: { ...i, largeDiameterMm: 2 * i.largeDiameterMm - i.smallDiameterMm }
			}
		];
	}
};

export const cureTimeGenerator: Generator = {
	id: 'cure-time',
	calculator: 'cure-time',
	title: 'Cure time at pipe temperature',
	topic: 'Cure time',
	level: 'foundation',
	tolerancePercent: 3,
	ranges: {
		refMinutes: { min: 60, max: 240, basis: 'ambient-cure patch resins, 1-4 h at the data sheet temperature (common practice)' },
		refTempC: { min: 20, max: 25, basis: 'data sheets state cure times at 20-25 °C (common practice)' },
		// The doubling rule is taught as holding above about 13 °C; colder pipes need heat or a low-temperature system.
		tempC: { min: SLOW_CURE_BELOW_C + 1, max: 40, basis: 'pipe temperatures where the lesson says the doubling rule holds (above about 13 °C), up to a hot day for pot life' },
		factorPer10C: { min: 2, max: 2, basis: 'the doubling rule the lesson teaches (common practice)' },
		potLifeRefMinutes: { min: 20, max: 45, basis: 'pot lives of ambient-cure patch resins at 20-25 °C (common practice)' },
		airC: { min: 20, max: 31, basis: 'air at the manhole on a mild day, warmer than the pipe (common practice)' }
	},
	create(rng) {
		const refMinutes = rng.pick([60, 90, 120, 180, 240]);
		const refTempC = pickWeighted(rng, [[20, 3], [25, 1]] as [number, number][]);
		const potLifeRefMinutes = rng.pick([20, 30, 40, 45]);
		const asksPotLife = rng.chance(0.2);
		const rule = 'Use the rule of thumb that times double for every 10 °C colder and halve for every 10 °C warmer.';
		if (asksPotLife) {
			const tempC = refTempC + rng.pick([5, 8, 10, 12, 15]);
			return {
				inputs: { refMinutes, refTempC, tempC, factorPer10C: 2, potLifeRefMinutes },
				asks: 'potLifeMinutes',
				unit: 'min',
				prompt:
					`The resin data sheet gives a pot life of ${g(potLifeRefMinutes, 'min')} and a cure time of ${g(refMinutes, 'min')} at ${g(refTempC, 'degC')}. On a hot day the mixed resin is at ${g(tempC, 'degC')}. ` +
					`${rule} About how long do you have to finish the wet-out after mixing, in minutes?`
			};
		}
		// Colder pipes stay above 13 °C, where the lesson says the rule holds.
		const colder = refTempC === 20 ? [14, 15, 16, 17, 18] : [15, 17, 19, 20, 21];
		const tempC = rng.chance(0.7) ? rng.pick(colder) : refTempC + rng.pick([4, 5, 10]);
		// Air warmer than a cold pipe is the usual trap; a warm pipe is stated alone.
		const airC = tempC < refTempC && rng.chance(0.6) ? Math.max(20, tempC + rng.pick([6, 8, 10])) : undefined;
		const unit = rng.chance(0.6) ? 'min' : 'h';
		const where =
			airC === undefined
				? `The pipe is at ${g(tempC, 'degC')}.`
				: `The air at the manhole is ${g(airC, 'degC')}; the flow and the pipe wall measure ${g(tempC, 'degC')}.`;
		return {
			inputs: { refMinutes, refTempC, tempC, factorPer10C: 2, potLifeRefMinutes },
			asks: unit === 'min' ? 'minutes' : 'hours',
			unit,
			given: airC === undefined ? undefined : { airC },
			prompt:
				`The resin data sheet gives a cure time of ${g(refMinutes, 'min')} at ${g(refTempC, 'degC')}. ${where} ${rule} ` +
				`How long do you hold the packer pressure before checking the witness cup, ${inUnit(unit)}?`
		};
	},
	mistakes(p) {
		const i = p.inputs;
		const list: Mistake[] = [
			{ hint: 'Colder means slower: below the data sheet temperature the time gets longer, not shorter.', inputs: { ...i, tempC: 2 * i.refTempC - i.tempC } },
			{ hint: 'Correct the data sheet time for the temperature: it holds only at the temperature it was measured at.', inputs: { ...i, tempC: i.refTempC } }
		];
		const air = p.given?.airC;
		if (air !== undefined) {
			list.push({ hint: 'The resin cures at the pipe and flow temperature, not the air temperature at the top of the manhole.', inputs: { ...i, tempC: air } });
		}
		if (p.asks !== 'potLifeMinutes') {
			list.push({ hint: 'That is the pot life. The question asks for the cure time.', asks: 'potLifeMinutes' });
		}
		return list;
	}
};

export const waterTestGenerator: Generator = {
	id: 'water-test',
	calculator: 'water-test',
	title: 'Water test allowance',
	topic: 'Watertightness tests',
	level: 'foundation',
	tolerancePercent: 3,
	ranges: {
		diameterMm: { min: 100, max: 300, basis: 'DN100-300 sewers and drains, the scope of the courses (common practice)' },
		lengthM: { min: 10, max: 60, basis: 'one manhole-to-manhole length of 10-60 m (common practice)' },
		allowanceLPerM2: { min: 0.15, max: 0.2, basis: 'EN 1610 13.3: 0.15 L/m² for a pipeline, 0.20 with its manholes' },
		manholeAreaM2: { min: 0, max: 22, basis: 'two round manholes of 1.0-1.2 m filled 1.0-2.5 m deep, walls and base (geometry)' },
		manholeDiameterMm: { min: 1000, max: 1200, basis: 'round manholes of 1.0-1.2 m on DN100-300 sewers (common practice)' },
		manholeWaterDepthM: { min: 1, max: 2.5, basis: 'test water standing 1.0-2.5 m deep in the manholes, 0.1-0.25 bar at the pipe (EN 1610 tests at 0.1-0.5 bar)' }
	},
	create(rng) {
		const diameterMm = rng.pick(SEWER_BORES_MM);
		const lengthM = rng.step(10, 60, 5);
		const withManholes = rng.chance(0.3);
		const allowanceLPerM2 = withManholes ? 0.2 : 0.15;
		const manholeDiameterMm = rng.pick([1000, 1200]);
		const manholeWaterDepthM = rng.step(1, 2.5, 0.5);
		const manholeAreaM2 = withManholes ? Number((2 * manholeWettedAreaM2(manholeDiameterMm / 1000, manholeWaterDepthM)).toFixed(1)) : 0;
		const stated = rng.chance(0.6);
		const asksArea = rng.chance(0.2);
		const scope = withManholes
			? `the pipeline together with its two manholes, whose walls and bases add ${g(manholeAreaM2, 'm2')} of wetted surface (${g(manholeDiameterMm, 'mm')} manholes filled ${g(manholeWaterDepthM, 'm')} deep)`
			: 'the pipeline only, without manholes';
		const allowance = stated ? ` The allowance is ${g(allowanceLPerM2, 'L/m2')} of wetted internal surface in 30 minutes.` : '';
		return {
			inputs: { diameterMm, lengthM, allowanceLPerM2, manholeAreaM2 },
			asks: asksArea ? 'wettedAreaM2' : 'allowedL',
			unit: asksArea ? 'm2' : 'L',
			given: withManholes ? { manholeDiameterMm, manholeWaterDepthM } : undefined,
			prompt:
				`After the repair, ${g(lengthM, 'm')} of ${g(diameterMm, 'mm')} ${pickHost(rng, diameterMm)} is water tested to EN 1610, method W, covering ${scope}.${allowance} ` +
				(asksArea
					? 'What is the whole wetted internal area under test, in square metres?'
					: 'What is the most water you may add during the 30-minute test, in litres?')
		};
	},
	mistakes(p) {
		const i = p.inputs;
		const list: Mistake[] = [
			{ hint: 'The wetted internal area is π × D × L with D the diameter, not the radius.', inputs: { ...i, diameterMm: i.diameterMm / 2 } }
		];
		if (i.manholeAreaM2 > 0) {
			list.push({
				hint: 'The manholes are part of the test: their wetted walls and bases count in the area, and 0.20 L/m² applies to the whole of it.',
				inputs: { ...i, manholeAreaM2: 0, allowanceLPerM2: 0.15 }
			});
		}
		if (p.asks === 'allowedL') {
			list.push({ hint: 'That is the wetted area. Multiply it by the allowance per square metre.', asks: 'wettedAreaM2' });
		}
		return list;
	}
};

export const airTestGenerator: Generator = {
	id: 'air-test',
	calculator: 'air-test',
	title: 'Air test time',
	topic: 'Watertightness tests',
	level: 'foundation',
	tolerancePercent: 3,
	ranges: {
		diameterIn: { min: 4, max: 12, basis: '4-12 in plastic gravity sewers, within ASTM F1417 and the DN100-300 scope' },
		lengthFt: { min: 100, max: 600, basis: 'one manhole-to-manhole length of about 100-600 ft (common practice)' },
		dropPsig: { min: 0.5, max: 1, basis: 'ASTM F1417 times a 1.0 or a 0.5 psig drop' }
	},
	create(rng) {
		const diameterIn = rng.pick([4, 6, 8, 10, 12]);
		const lengthFt = rng.step(100, 600, 50);
		const dropPsig = rng.chance(0.5) ? 1 : 0.5;
		const unit = rng.chance(0.6) ? 's' : 'min';
		return {
			inputs: { diameterIn, lengthFt, dropPsig },
			asks: unit === 's' ? 'minimumSeconds' : 'minimumMinutes',
			unit,
			prompt:
				`A ${g(lengthFt, 'ft')} run of ${g(diameterIn, 'in')} PVC gravity sewer is air tested to ASTM F1417 after the repair, timing a drop of ${dropPsig === 1 ? '1.0' : '0.5'} psig from 3.5 psig. ` +
				`What is the shortest time the drop may take for the line to pass, ${inUnit(unit)}${unit === 'min' ? ' (decimals or min:s)' : ''}?`
		};
	},
	mistakes(p) {
		const i = p.inputs;
		const list: Mistake[] = [
			{
				hint: `The time is for the drop timed: a 0.5 psig drop takes half as long as a 1.0 psig drop.`,
				inputs: { ...i, dropPsig: i.dropPsig === 1 ? 0.5 : 1 }
			}
		];
		if (i.diameterIn / 2 >= 4) list.push({ hint: 'D in T = 0.085 × D × K ÷ Q is the pipe diameter in inches, not the radius.', inputs: { ...i, diameterIn: i.diameterIn / 2 } });
		return list;
	}
};

/** Water pressure per foot of head as ASTM F1216 Appendix X1 writes it (psi/ft). */
const PSI_PER_FT = 0.433;

export const f1216PartialGenerator: Generator = {
	id: 'f1216-partial',
	calculator: 'f1216-partial',
	title: 'Liner thickness (ASTM F1216)',
	topic: 'Liner design',
	level: 'advanced',
	tolerancePercent: 3,
	ranges: {
		diameterIn: { min: 6, max: 18, basis: 'gravity sewers of 6-18 in, where F1216 designs are usually checked (common practice)' },
		pressurePsi: { min: 1.73, max: 8.67, basis: '4-20 ft of groundwater over the invert at 0.433 psi/ft (ASTM F1216 X1)' },
		waterFt: { min: 4, max: 20, basis: 'groundwater 4-20 ft over the invert, about 1.2-6 m (common practice)' },
		ovalityPercent: { min: 0, max: 5, basis: 'host pipes up to 5 % oval; more is a case for the engineer (common practice)' },
		longTermModulusPsi: { min: 100000, max: 150000, basis: 'long-term moduli of felt-tube CIPP, about half the 250 000 psi short-term minimum of ASTM F1216 Table 1' },
		enhancementK: { min: 7, max: 7, basis: 'ASTM F1216 X1.1: K = 7' },
		poisson: { min: 0.3, max: 0.3, basis: 'ASTM F1216 X1.1: ν = 0.3' },
		safetyFactor: { min: 2, max: 2, basis: 'ASTM F1216 X1: N = 2 typical' },
		flexuralStrengthPsi: { min: 2250, max: 2250, basis: 'half the 4500 psi felt-tube minimum of ASTM F1216 Table 1' }
	},
	create(rng) {
		const diameterIn = rng.pick([6, 8, 10, 12, 15, 18]);
		const waterFt = rng.step(4, 20, 2);
		const pressurePsi = Number((waterFt * PSI_PER_FT).toFixed(2));
		const ovalityPercent = rng.pick([0, 2, 3, 5]);
		const longTermModulusPsi = rng.pick([100000, 125000, 150000]);
		const unit = rng.chance(0.6) ? 'mm' : 'in';
		return {
			inputs: {
				diameterIn,
				pressurePsi,
				ovalityPercent,
				longTermModulusPsi,
				enhancementK: 7,
				poisson: 0.3,
				safetyFactor: 2,
				flexuralStrengthPsi: 2250
			},
			asks: unit === 'mm' ? 'thicknessMm' : 'thicknessIn',
			unit,
			given: { waterFt },
			prompt:
				`${article(String(diameterIn)) === 'an' ? 'An' : 'A'} ${g(diameterIn, 'in')} gravity sewer is partially deteriorated: it still carries the soil, but groundwater stands ${g(waterFt, 'ft')} above its invert (${g(pressurePsi, 'psi')} at 0.433 psi per foot). ` +
				`It is ${g(ovalityPercent, '%')} oval. The liner maker gives a long-term flexural modulus of ${g(longTermModulusPsi, 'psi')}; for the long-term flexural strength use 2250 psi, half the 4500 psi felt-tube minimum of ASTM F1216 Table 1. Take K = 7, ν = 0.3 and a factor of safety of 2. ` +
				`What wall thickness does ASTM F1216 Appendix X1 call for, ${inUnit(unit)}?`
		};
	},
	mistakes(p) {
		const i = p.inputs;
		const list: Mistake[] = [
			{ hint: 'Apply the factor of safety N = 2 in the denominator.', inputs: { ...i, safetyFactor: 1 } },
			{ hint: 'The pressure is in psi: 0.433 psi per foot of water, not the feet themselves.', inputs: { ...i, pressurePsi: p.given!.waterFt } }
		];
		if (i.ovalityPercent > 0) {
			list.push({ hint: 'An oval host pipe weakens the liner: include the ovality reduction factor C (and the X1.2 bending check).', inputs: { ...i, ovalityPercent: 0 } });
		}
		return list;
	}
};
