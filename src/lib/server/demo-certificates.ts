import { getCourse } from '$lib/content';
import { issueIfEarned, revokeCertificate } from './certificates';
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

/** Evidence waiting for a trainer's assessment, for the skill given. */
export async function recordWaitingEvidence(userId: string, courseSlug: string, skillId: string, at: Date, db: DB): Promise<string> {
	const id = crypto.randomUUID();
	await db
		.insertInto('practical_submission')
		.values({ id, trainee_id: userId, course_slug: courseSlug, skill_id: skillId, submitted_by: userId, in_person: 0, note: 'Photos of the rig practice; readings in the note.', readings: '{}', status: 'waiting', submitted_at: at.toISOString(), closed_at: null })
		.execute();
	return id;
}

const DAY = 86_400_000;

/**
 * The demo's certificates, dated relative to `now`: valid, expiring within a month, expired,
 * revoked, and two people one requirement short.
 */
export async function seedDemoCertificates(byEmail: Map<string, string>, db: DB, now = new Date()): Promise<void> {
	const ago = (days: number) => new Date(now.getTime() - days * DAY);
	const trainer = { id: byEmail.get('trainer@fenmoor.test')!, name: 'Mira Calloway' };
	const registrar = byEmail.get('registrar@fenmoor.test')!;
	const earn = async (email: string, course: string, daysAgo: number) => {
		const userId = byEmail.get(email)!;
		await recordPassedTest(userId, course, ago(daysAgo + 5), db);
		await recordSignOffs(userId, course, trainer, ago(daysAgo), db);
		const outcome = await issueIfEarned(userId, course, { db, now: ago(daysAgo) });
		if (!outcome.issued) throw new Error(`Demo certificate for ${email} in ${course} was not issued`);
		return outcome.certificate;
	};
	// valid
	await earn('nell@brindlewick.test', 'point-repair-installer', 60);
	await earn('kit@tarnside.test', 'point-repair-installer', 120);
	// expiring soon: 24-month course issued 23 months and a few days ago
	await earn('owen@brindlewick.test', 'packer-pressure-safety', 24 * 30.44 - 25);
	// expired
	await earn('ivo@brindlewick.test', 'point-repair-installer', 37 * 30.44);
	// revoked
	const rhea = await earn('rhea@tarnside.test', 'point-repair-installer', 90);
	await revokeCertificate(registrar, rhea.number, 'issued-in-error', 'Sign-offs recorded against the wrong person.', { db, now: ago(80) });

	// one requirement short: Nell has every packer sign-off but the PPE one (she sends that evidence in the demo)
	const nell = byEmail.get('nell@brindlewick.test')!;
	const packerSkills = getCourse('packer-pressure-safety')!.practicalSkills.map((s) => s.id).filter((id) => id !== 'ppe-and-resin');
	await recordPassedTest(nell, 'packer-pressure-safety', ago(10), db);
	await recordSignOffs(nell, 'packer-pressure-safety', trainer, ago(8), db, packerSkills);
	// Kit has every transition sign-off but has not passed that course test yet
	await recordSignOffs(byEmail.get('kit@tarnside.test')!, 'transition-patches', trainer, ago(20), db);
}
