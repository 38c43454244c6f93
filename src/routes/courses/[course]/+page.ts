import type { Component } from 'svelte';
import type { PageLoad } from './$types';

/** The course description is the body of `course.md`, compiled by mdsvex. */
const descriptions = import.meta.glob<{ default: Component }>('/content/courses/*/course.md');

export const load: PageLoad = async ({ data }) => {
	const load = descriptions[`/content/courses/${data.course.slug}/course.md`];
	return { ...data, description: load ? (await load()).default : null };
};
