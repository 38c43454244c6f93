import { fitLabels } from '$lib/diagrams/fit-labels';
import { mount, unmount, type Component } from 'svelte';

/**
 * Lesson bodies are rendered on the server only, for the people who may read them, so no
 * lesson text sits in a public client file. The parts that answer the reader (live
 * calculators, check-yourself questions) are islands: the server renders them inside a
 * `<div data-island="name" data-props="{...}">`, and in the browser `mountIslands` mounts the
 * interactive component there with the same props once it comes near the screen. Only these
 * components' code ships, and only for the islands a reader scrolls towards.
 */

/** Where the server puts the lesson body in a fully rendered page (see $lib/server/lesson-html). */
export const LESSON_BODY_SLOT = '<!--lesson-body-->';

/** Context key under which the lesson renderer passes the lesson's own path to its islands. */
export const LESSON_HREF = 'patchwright:lesson-href';

/** Context key under which the lesson renderer passes the calculators' pictures (see allPictures). */
export const LESSON_PICTURES = 'patchwright:lesson-pictures';

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyComponent = Component<any>;

type IslandProps = Record<string, unknown>;

/** Each island's component with the props it mounts with, or undefined to keep the server's markup. */
const islands: Record<string, (props: IslandProps) => Promise<{ component: AnyComponent; props: IslandProps } | undefined>> = {
	// The calculator's definition (code, not JSON) and its picture, if it draws one, are loaded beside
	// the component: only their own modules ship.
	calculator: async (props) => {
		const id = String(props.id);
		const [{ default: component }, calculator, picture] = await Promise.all([
			import('$lib/components/calc/Calculator.svelte'),
			import('$lib/calc/load').then(({ loadCalculator }) => loadCalculator(id)),
			import('$lib/components/calc/pictures').then(({ loadPicture }) => loadPicture(id))
		]);
		return calculator && { component, props: { ...props, calculator, picture } };
	},
	'check-yourself': async (props) => ({ component: (await import('./CheckYourselfQuestion.svelte')).default, props })
};

export type IslandName = keyof typeof islands;

/**
 * How far beyond the screen an island starts loading: one screen's height, so its code has
 * arrived by the time the reader scrolls to it, and a reader who stops early never loads it.
 */
const LOAD_AHEAD = '100% 0px';

/** Mounts every island under `root` as it comes within a screen of view; returns a function that unmounts them. */
export function mountIslands(root: HTMLElement): () => void {
	const mounted: ReturnType<typeof mount>[] = [];
	let stopped = false;
	// Diagrams stay server HTML (never hydrated), so their labels are fitted here; pictures
	// inside islands fit their own once mounted.
	const fitted = [...root.querySelectorAll<SVGSVGElement>('svg')].filter((svg) => !svg.closest('[data-island]') && svg.querySelector('text')).map((svg) => fitLabels(svg));
	const wake = (element: HTMLElement) => {
		const props = JSON.parse(element.dataset.props ?? '{}');
		islands[element.dataset.island!](props).then((island) => {
			if (stopped || !island) return;
			// The server's markup is replaced in one step, so the reader sees no change.
			element.replaceChildren();
			mounted.push(mount(island.component, { target: element, props: island.props }));
		});
	};
	const watcher =
		typeof IntersectionObserver === 'function'
			? new IntersectionObserver(
					(entries) => {
						for (const entry of entries) {
							if (!entry.isIntersecting) continue;
							watcher?.unobserve(entry.target);
							wake(entry.target as HTMLElement);
						}
					},
					{ rootMargin: LOAD_AHEAD }
				)
			: undefined;
	for (const element of root.querySelectorAll<HTMLElement>('[data-island]')) {
		if (!Object.hasOwn(islands, element.dataset.island ?? '')) continue;
		if (watcher) watcher.observe(element);
		else wake(element);
	}
	return () => {
		stopped = true;
		watcher?.disconnect();
		for (const instance of mounted) unmount(instance);
		for (const fit of fitted) fit.destroy();
	};
}
