/**
 * One calculator's definition, loaded on demand: a page ships the module its calculator
 * lives in, not the whole registry of ./index (every calculator). Keep the ids in step
 * with ./index; load.test.ts checks they match.
 */
import type { CalculatorDef } from './types';

const materials = () => import('./materials');
const transition = () => import('./transition');
const pressure = () => import('./pressure');
const cure = () => import('./cure');
const f1216 = () => import('./f1216');
const watertightness = () => import('./watertightness');

const loaders: Record<string, () => Promise<CalculatorDef>> = {
	'resin-quantity': async () => (await materials()).resinQuantityCalculator,
	'laminate-volume': async () => (await materials()).laminateVolumeCalculator,
	'mat-size': async () => (await materials()).matSizeCalculator,
	'mix-ratio': async () => (await materials()).mixRatioCalculator,
	'transition-area': async () => (await transition()).transitionAreaCalculator,
	'groundwater-head': async () => (await pressure()).groundwaterHeadCalculator,
	'pressure-window': async () => (await pressure()).pressureWindowCalculator,
	'end-thrust': async () => (await pressure()).endThrustCalculator,
	'cure-time': async () => (await cure()).cureTimeCalculator,
	'f1216-partial': async () => (await f1216()).f1216PartialCalculator,
	'f1216-full': async () => (await f1216()).f1216FullCalculator,
	'air-test': async () => (await watertightness()).airTestCalculator,
	'water-test': async () => (await watertightness()).waterTestCalculator
};

/** The ids loadCalculator knows. */
export const loadableIds: readonly string[] = Object.keys(loaders);

/** The calculator with this id, or undefined for an unknown id. */
export async function loadCalculator(id: string): Promise<CalculatorDef | undefined> {
	return Object.hasOwn(loaders, id) ? loaders[id]() : undefined;
}
