import { fitLabels } from '$lib/diagrams/fit-labels';
import { mount, unmount, type Component } from 'svelte';

/**
 * Lesson bodies are rendered on the server only, for the people who may read them, so no
 * lesson text sits in a public client file. The parts that answer the reader (live
 * calculators, check-yourself questions) are islands: the server renders them inside a
 * `<div data-island="name" data-props="{...}">`, and in the browser `mountIslands` mounts the
 * interactive component there with the same props. Only these components' code ships.
 */

/** Where the server puts the lesson body in a fully rendered page (see $lib/server/lesson-html). */
export const LESSON_BODY_SLOT = '<!--lesson-body-->';

/** Context key under which the lesson renderer passes the lesson's own path to its islands. */
export const LESSON_HREF = 'patchwright:lesson-href';

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyComponent = Component<any>;

const islands: Record<string, () => Promise<{ default: AnyComponent }>> = {
	calculator: () => import('$lib/components/calc/Calculator.svelte'),
	'check-yourself': () => import('./CheckYourselfQuestion.svelte')
};

export type IslandName = keyof typeof islands;

/** Mounts every island under `root`; returns a function that unmounts them. */
export function mountIslands(root: HTMLElement): () => void {
	const mounted: ReturnType<typeof mount>[] = [];
	let stopped = false;
	// Diagrams stay server HTML (never hydrated), so their labels are fitted here; pictures
	// inside islands fit their own once mounted.
	const fitted = [...root.querySelectorAll<SVGSVGElement>('svg')].filter((svg) => !svg.closest('[data-island]') && svg.querySelector('text')).map((svg) => fitLabels(svg));
	for (const element of root.querySelectorAll<HTMLElement>('[data-island]')) {
		const name = element.dataset.island ?? '';
		if (!Object.hasOwn(islands, name)) continue;
		const props = JSON.parse(element.dataset.props ?? '{}');
		islands[name]().then(({ default: component }) => {
			if (stopped) return;
			// The server's markup is replaced in one step, so the reader sees no change.
			element.replaceChildren();
			mounted.push(mount(component, { target: element, props }));
		});
	}
	return () => {
		stopped = true;
		for (const instance of mounted) unmount(instance);
		for (const fit of fitted) fit.destroy();
	};
}
