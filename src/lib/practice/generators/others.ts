/** Problems on the transition taper, cure time, watertightness tests and ASTM F1216 liner thickness. */
import type { Generator, Mistake } from '../types';
import { article, g, HOST_PIPES, inUnit, pickWeighted, SEWER_BORES_MM, TRANSITIONS_MM } from './common';

export const transitionAreaGenerator: Generator = {
	id: 'transition-area',
	calculator: 'transition-area',
	title: 'Transition taper',
	topic: 'Transition taper',
	level: 'foundation',
	tolerancePercent: 3,
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
		const tempC = refTempC + rng.pick([-12, -10, -8, -5, -4, 4, 5, 10]);
		// Air warmer than a cold pipe is the usual trap; a warm pipe is stated alone.
		const airC = tempC < refTempC && rng.chance(0.6) ? tempC + rng.pick([6, 8, 10, 12]) : undefined;
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
	create(rng) {
		const diameterMm = rng.pick(SEWER_BORES_MM);
		const lengthM = rng.step(10, 60, 5);
		const withManholes = rng.chance(0.3);
		const allowanceLPerM2 = withManholes ? 0.2 : 0.15;
		const stated = rng.chance(0.6);
		const asksArea = rng.chance(0.2);
		const scope = withManholes ? 'the pipeline together with its two manholes' : 'the pipeline only, without manholes';
		const allowance = stated ? ` The allowance is ${g(allowanceLPerM2, 'L/m2')} of wetted internal surface in 30 minutes.` : '';
		return {
			inputs: { diameterMm, lengthM, allowanceLPerM2 },
			asks: asksArea ? 'wettedAreaM2' : 'allowedL',
			unit: asksArea ? 'm2' : 'L',
			prompt:
				`After the repair, ${g(lengthM, 'm')} of ${g(diameterMm, 'mm')} ${rng.pick(HOST_PIPES)} is water tested to EN 1610, method W, covering ${scope}.${allowance} ` +
				(asksArea
					? 'What is the wetted internal area, in square metres?'
					: 'What is the most water you may add during the 30-minute test, in litres?')
		};
	},
	mistakes(p) {
		const i = p.inputs;
		const list: Mistake[] = [
			{ hint: 'The wetted internal area is π × D × L with D the diameter, not the radius.', inputs: { ...i, diameterMm: i.diameterMm / 2 } }
		];
		if (p.asks === 'allowedL') {
			const other = i.allowanceLPerM2 === 0.15 ? 0.2 : 0.15;
			list.push({
				hint: 'EN 1610 allows 0.15 L/m² for a pipeline alone and 0.20 L/m² when the manholes are included.',
				inputs: { ...i, allowanceLPerM2: other }
			});
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
				`A ${g(lengthFt, 'ft')} run of ${g(diameterIn, 'in')} gravity sewer is air tested to ASTM F1417 after the repair, timing a drop of ${dropPsig === 1 ? '1.0' : '0.5'} psig from 3.5 psig. ` +
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
				`It is ${g(ovalityPercent, '%')} oval. The liner's long-term flexural modulus is ${g(longTermModulusPsi, 'psi')} and its long-term flexural strength 2250 psi; take K = 7, ν = 0.3 and a factor of safety of 2. ` +
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
