import type { Component } from 'svelte';
import type { Inputs, ResultValue } from '$lib/calc/types';

/** What every calculator picture is drawn from: the inputs as computed and the results. */
export interface PictureProps {
	inputs: Inputs;
	result: Record<string, ResultValue>;
}

export type Picture = Component<PictureProps>;

/** The calculators that draw a picture; each picture's code loads only where it is drawn. */
const pictures: Record<string, () => Promise<{ default: Picture }>> = {
	'transition-area': () => import('./TaperPicture.svelte'),
	'pressure-window': () => import('./PressureWindowBar.svelte'),
	'cure-time': () => import('./CureCurvePlot.svelte')
};

/** The picture drawn beside calculator `id`, or undefined where it has none. */
export async function loadPicture(id: string): Promise<Picture | undefined> {
	return Object.hasOwn(pictures, id) ? (await pictures[id]()).default : undefined;
}

/** Every picture by calculator id: the server has them at hand when it renders a lesson's calculators. */
export async function allPictures(): Promise<ReadonlyMap<string, Picture>> {
	return new Map(await Promise.all(Object.entries(pictures).map(async ([id, load]) => [id, (await load()).default] as const)));
}
