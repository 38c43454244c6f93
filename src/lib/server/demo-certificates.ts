import { getCourse } from '$lib/content';
import type { DB } from './db';

/**
 * Shortcuts for the demo seed and tests: record a passed course test and trainers' sign-offs
 * as the test runner and the practical sign-off flow would leave them, dated in the past.
 */
export async function recordPassedTest(userId: string, courseSlug: string, at: Date, db: DB): Promise<void> {
	const course = getCourse(courseSlug)!;
	const when = at.toISOString();
	await db
		.insertInto('test_attempt')
		.values({
			id: crypto.randomUUID(),
			user_id: userId,
			course_slug: courseSlug,
			started_at: new Date(at.getTime() - 30 * 60_000).toISOString(),
			deadline_at: null,
			submitted_at: when,
			closed_by: 'person',
			draw_seed: 1,
			items: '[]',
			answers: '{}',
			item_count: 20,
			pass_mark: course.passMark,
			correct_count: 18,
			score_percent: 90,
			passed: 1,
			results: '[]',
			wait_waived_at: null,
			wait_waived_by: null
		})
		.execute();
}

/** Signs off the given skills (default: all of the course's) by one trainer at `at`. */
export async function recordSignOffs(
	userId: string,
	courseSlug: string,
	trainer: { id: string; name: string },
	at: Date,
	db: DB,
	skillIds: string[] = getCourse(courseSlug)!.practicalSkills.map((s) => s.id)
): Promise<void> {
	const when = at.toISOString();
	for (const skillId of skillIds) {
		const submissionId = crypto.randomUUID();
		const assessmentId = crypto.randomUUID();
		await db
			.insertInto('practical_submission')
			.values({ id: submissionId, trainee_id: userId, course_slug: courseSlug, skill_id: skillId, submitted_by: trainer.id, in_person: 1, note: 'Shown at the training rig.', readings: '{}', status: 'signed off', submitted_at: when, closed_at: when })
			.execute();
		await db
			.insertInto('practical_assessment')
			.values({ id: assessmentId, submission_id: submissionId, trainer_id: trainer.id, outcome: 'signed off', criteria: '[]', reasons: '[]', place: 'Training rig', practical_date: when.slice(0, 10), signature_name: trainer.name, assessed_at: when })
			.execute();
		await db
			.insertInto('sign_off')
			.values({ id: crypto.randomUUID(), user_id: userId, course_slug: courseSlug, skill_id: skillId, assessment_id: assessmentId, trainer_id: trainer.id, signed_off_at: when, voided_at: null, voided_by: null, void_reason: null })
			.execute();
	}
}
