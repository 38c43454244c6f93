import { error } from '@sveltejs/kit';
import type { Component } from 'svelte';
import type { PageLoad } from './$types';

/**
 * Adds the compiled lesson body; the server load has already decided who may read it.
 * The glob is lazy and `$lib/content` stays out of this file: importing its eager metadata
 * in the browser would bundle every lesson body into one chunk for every lesson page.
 */
const bodies = import.meta.glob<{ default: Component }>('/content/courses/*/lessons/*.md');

export const load: PageLoad = async ({ data }) => {
	const load = bodies[`/content/courses/${data.course.slug}/lessons/${data.lesson.slug}.md`];
	if (!load) error(404, 'No such lesson');
	return { ...data, body: (await load()).default };
};
