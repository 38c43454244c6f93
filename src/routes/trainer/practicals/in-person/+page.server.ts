import { redirect } from '@sveltejs/kit';
import { courses } from '$lib/content';
import { readingSpecs } from '$lib/practicals/readings';
import { requireRole } from '$lib/server/authz';
import { receiveInPersonAssessment } from '$lib/server/evidence-upload';
import { failFrom } from '$lib/server/sign-off-forms';
import { assessablePeople, findSkill, mailAssessment } from '$lib/server/sign-offs';
import type { Actions, PageServerLoad } from './$types';

/**
 * Assessing on the training day without prior evidence: pick the trainee and the skill
 * (a plain GET form, so it works without JavaScript), then grade, add photos and sign.
 */
export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'trainer');
	const people = await assessablePeople(me.id);
	const traineeId = event.url.searchParams.get('trainee') ?? '';
	const [courseSlug, skillId] = (event.url.searchParams.get('skill') ?? '').split('/');
	const trainee = people.find((p) => p.id === traineeId) ?? null;
	const found = findSkill(courseSlug ?? '', skillId ?? '');
	return {
		people: people.map((p) => ({ id: p.id, label: p.name ? `${p.name} (${p.email})` : p.email })),
		skills: courses.flatMap((c) => c.practicalSkills.map((s) => ({ value: `${c.slug}/${s.id}`, course: c.title, title: s.title }))),
		chosen:
			trainee && found
				? {
						trainee: { id: trainee.id, name: trainee.name ?? trainee.email },
						course: { slug: found.course.slug, title: found.course.title },
						skill: { id: found.skill.id, title: found.skill.title, criteria: found.skill.criteria },
						readingSpecs: readingSpecs(found.course.slug, found.skill.id)
					}
				: null,
		signatureName: me.name ?? '',
		today: new Date().toISOString().slice(0, 10)
	};
};

export const actions: Actions = {
	assess: async (event) => {
		const me = requireRole(event, 'trainer');
		let outcome;
		try {
			outcome = await receiveInPersonAssessment(event.request, me.id);
		} catch (err) {
			return failFrom(err);
		}
		await mailAssessment(outcome.result, event.url.origin);
		redirect(303, `/trainer/practicals?done=${encodeURIComponent(outcome.result.outcome)}`);
	}
};
