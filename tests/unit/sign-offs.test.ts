import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { listAudit } from '$lib/server/audit';
import { seedDemo } from '$lib/server/demo-seed';
import {
	assessInPerson,
	assessmentQueue,
	assessSubmission,
	crewSignOffCounts,
	mayViewEvidenceOf,
	practicalOverview,
	queueCount,
	signedOffSkills,
	SignOffError,
	submitEvidence,
	voidSignOff,
	withdrawEvidence
} from '$lib/server/sign-offs';
import { loadIdentity } from '$lib/server/roles';
import { findUserByEmail } from '$lib/server/users';
import { getCourse } from '$lib/content';
import { createTestDb } from '../helpers/db';

type Db = Awaited<ReturnType<typeof createTestDb>>;
let db: Db;
const ids: Record<string, string> = {};

beforeEach(async () => {
	db = await createTestDb();
	await seedDemo(db);
	for (const who of ['sam@brindlewick.test', 'priya@brindlewick.test', 'trainer@fenmoor.test', 'admin@tarnside.test', 'ade@tarnside.test', 'admin@brindlewick.test', 'registrar@fenmoor.test']) {
		ids[who.split('@')[0] + '@' + who.split('@')[1].split('.')[0]] = (await findUserByEmail(who, db))!.id;
	}
});
afterEach(async () => db.destroy());

const sam = () => ids['sam@brindlewick'];
const mira = () => ids['trainer@fenmoor'];
const dana = () => ids['admin@tarnside'];
const ade = () => ids['ade@tarnside'];
const criteriaOf = (course: string, skill: string) => getCourse(course)!.practicalSkills.find((s) => s.id === skill)!.criteria;

function grades(course: string, skill: string, result: 'met' | 'not met' | 'not observed' = 'met') {
	return criteriaOf(course, skill).map(() => ({ result, remark: '' }));
}
const signOff = (course: string, skill: string) => ({
	criteria: grades(course, skill),
	outcome: 'signed off',
	place: 'Training rig, bay 2',
	practicalDate: '2026-11-30',
	signatureName: 'Mira Calloway'
});

async function send(trainee: string, skill = 'wet-out', course = 'point-repair-installer', note = 'Mat wetted out on the bench.') {
	return submitEvidence({ traineeId: trainee, courseSlug: course, skillId: skill, note, readings: {}, files: [] }, db);
}

async function rejection(promise: Promise<unknown>): Promise<SignOffError> {
	const err = await promise.then(() => null, (e) => e);
	expect(err).toBeInstanceOf(SignOffError);
	return err as SignOffError;
}

describe('practical sign-offs', () => {
	it('evidence goes to the queue, is returned with reasons, resubmitted and signed off; history and audit kept', async () => {
		const first = await send(sam());
		expect((await practicalOverview(sam(), 'point-repair-installer', db)).find((s) => s.id === 'wet-out')!.state).toBe('waiting');
		expect(await queueCount(mira(), db)).toBe(1);

		const notMet = grades('point-repair-installer', 'wet-out');
		notMet[1] = { result: 'not met', remark: 'Dry fibre at the trailing edge' };
		const returned = await assessSubmission(first, mira(), { criteria: notMet, outcome: 'returned', reasons: 'Work the edges from both faces.', place: 'Rig 1', practicalDate: '2026-11-30', signatureName: 'Mira Calloway' }, db);
		expect(returned.outcome).toBe('returned');
		expect(await signedOffSkills(sam(), 'point-repair-installer', db)).toEqual([]);
		const afterReturn = (await practicalOverview(sam(), 'point-repair-installer', db)).find((s) => s.id === 'wet-out')!;
		expect(afterReturn.state).toBe('returned');
		expect(afterReturn.history[0].assessment!.reasons).toBe('Work the edges from both faces.');
		expect(afterReturn.history[0].assessment!.criteria[1]).toMatchObject({ result: 'not met', remark: 'Dry fibre at the trailing edge' });

		const second = await send(sam(), 'wet-out', 'point-repair-installer', 'Edges worked in this time.');
		await assessSubmission(second, mira(), signOff('point-repair-installer', 'wet-out'), db);
		const current = await signedOffSkills(sam(), 'point-repair-installer', db);
		expect(current).toEqual([{ skillId: 'wet-out', signedOffAt: expect.any(String), trainerId: mira(), trainerName: 'Mira Calloway' }]);
		const overview = (await practicalOverview(sam(), 'point-repair-installer', db)).find((s) => s.id === 'wet-out')!;
		expect(overview.state).toBe('signed off');
		expect(overview.history.map((h) => h.status)).toEqual(['signed off', 'returned']);
		const actions = (await listAudit({ subjectType: 'practical_submission' }, db)).map((e) => e.action).sort();
		expect(actions).toEqual(['evidence.submit', 'evidence.submit', 'practical.return', 'practical.sign_off']);
		await expect(send(sam())).rejects.toThrow('already signed off');
	});

	it('withdraw only while waiting, only your own; one waiting submission per skill', async () => {
		const id = await send(sam());
		expect((await rejection(send(sam()))).status).toBe(409);
		expect((await rejection(withdrawEvidence(id, ids['priya@brindlewick'], db))).status).toBe(404);
		await withdrawEvidence(id, sam(), db);
		expect((await rejection(withdrawEvidence(id, sam(), db))).status).toBe(409);
		expect((await rejection(assessSubmission(id, mira(), signOff('point-repair-installer', 'wet-out'), db))).status).toBe(409);
		const overview = (await practicalOverview(sam(), 'point-repair-installer', db)).find((s) => s.id === 'wet-out')!;
		expect(overview.state).toBe('not started');
		expect(overview.history[0].status).toBe('withdrawn');
		await send(sam());
	});

	it('sign-off needs every criterion met; a return needs reasons; every criterion graded', async () => {
		const id = await send(sam());
		const mixed = grades('point-repair-installer', 'wet-out');
		mixed[0] = { result: 'not observed', remark: '' };
		const e1 = await rejection(assessSubmission(id, mira(), { ...signOff('point-repair-installer', 'wet-out'), criteria: mixed }, db));
		expect(e1.fields.outcome).toMatch(/every criterion is met/);
		const e2 = await rejection(assessSubmission(id, mira(), { ...signOff('point-repair-installer', 'wet-out'), outcome: 'returned' }, db));
		expect(e2.fields.reasons).toBeTruthy();
		const e3 = await rejection(assessSubmission(id, mira(), { ...signOff('point-repair-installer', 'wet-out'), criteria: grades('point-repair-installer', 'wet-out').slice(1) }, db));
		expect(e3.status).toBe(400);
		const e4 = await rejection(assessSubmission(id, mira(), { ...signOff('point-repair-installer', 'wet-out'), place: 'Rig\u0000', signatureName: '' }, db));
		expect(Object.keys(e4.fields).sort()).toEqual(['place', 'signatureName']);
		const e5 = await rejection(assessSubmission(id, mira(), { ...signOff('point-repair-installer', 'wet-out'), practicalDate: '2026-02-30' }, db));
		expect(e5.fields.practicalDate).toBeTruthy();
		expect((await practicalOverview(sam(), 'point-repair-installer', db)).find((s) => s.id === 'wet-out')!.state).toBe('waiting');
	});

	it('trainers assess only people in their scope and never themselves', async () => {
		const samsEvidence = await send(sam());
		// Dana is Tarnside's own trainer: Sam (Brindlewick) is out of scope, so his evidence is unknown to her.
		expect((await rejection(assessSubmission(samsEvidence, dana(), signOff('point-repair-installer', 'wet-out'), db))).status).toBe(404);
		expect(await assessmentQueue(dana(), {}, db)).toEqual([]);
		const adesEvidence = await send(ade());
		expect((await assessmentQueue(dana(), {}, db)).map((q) => q.submissionId)).toEqual([adesEvidence]);
		// Mira, the provider's trainer, sees both, oldest first.
		expect((await assessmentQueue(mira(), {}, db)).map((q) => q.submissionId)).toEqual([samsEvidence, adesEvidence]);
		expect((await assessmentQueue(mira(), { company: (await loadIdentity(ade(), db))!.companies[0].id }, db)).map((q) => q.submissionId)).toEqual([adesEvidence]);
		expect(await assessmentQueue(mira(), { course: 'transition-patches' }, db)).toEqual([]);
		expect(await assessmentQueue(mira(), { olderThanDays: 3 }, db)).toEqual([]);

		// Dana enrolled as a trainee herself: her own evidence never reaches her queue and she cannot assess it.
		await db.insertInto('enrolment').values({ user_id: dana(), course_slug: 'point-repair-installer', enrolled_at: new Date().toISOString(), source: 'test' }).execute();
		const own = await send(dana());
		expect((await assessmentQueue(dana(), {}, db)).map((q) => q.submissionId)).not.toContain(own);
		expect((await rejection(assessSubmission(own, dana(), signOff('point-repair-installer', 'wet-out'), db))).status).toBe(403);
		expect((await rejection(assessInPerson({ traineeId: dana(), trainerId: dana(), courseSlug: 'point-repair-installer', skillId: 'placement', note: '', readings: {}, files: [] }, signOff('point-repair-installer', 'placement'), db))).status).toBe(403);
	});

	it('in-person assessment without prior evidence signs off at once; a registrar voids with a reason', async () => {
		const result = await assessInPerson(
			{ traineeId: ade(), trainerId: dana(), courseSlug: 'transition-patches', skillId: 'fit-restraints', note: 'Seen on the training day.', readings: {}, files: [] },
			{ ...signOff('transition-patches', 'fit-restraints'), signatureName: 'Dana Whitlow' },
			db
		);
		expect(result.signOffId).toBeTruthy();
		expect((await signedOffSkills(ade(), 'transition-patches', db)).map((s) => s.trainerName)).toEqual(['Dana Whitlow']);
		expect((await rejection(assessInPerson({ traineeId: sam(), trainerId: dana(), courseSlug: 'point-repair-installer', skillId: 'placement', note: '', readings: {}, files: [] }, signOff('point-repair-installer', 'placement'), db))).status).toBe(404);

		expect((await rejection(voidSignOff(result.signOffId!, ids['registrar@fenmoor'], 'no', db))).status).toBe(400);
		await voidSignOff(result.signOffId!, ids['registrar@fenmoor'], 'Assessed on the wrong rig size.', db);
		expect(await signedOffSkills(ade(), 'transition-patches', db)).toEqual([]);
		const skill = (await practicalOverview(ade(), 'transition-patches', db)).find((s) => s.id === 'fit-restraints')!;
		expect(skill.state).toBe('not started');
		expect(skill.voided[0].voidReason).toBe('Assessed on the wrong rig size.');
		expect((await listAudit({ subjectType: 'sign_off' }, db))[0]).toMatchObject({ action: 'practical.void' });
		expect((await rejection(voidSignOff(result.signOffId!, ids['registrar@fenmoor'], 'Second time round.', db))).status).toBe(409);
	});

	it('readings are checked with units and compared with the library key (±5 %)', async () => {
		// Pressure window: 3 m head = 0.294 bar (ρ g h with g = 9.80665 m/s², NIST SP 811), + 0.3 bar margin = 0.594 bar.
		const id = await submitEvidence(
			{
				traineeId: ids['sam@brindlewick'],
				courseSlug: 'packer-pressure-safety',
				skillId: 'pressure-window',
				note: '',
				readings: { groundwaterHeadM: { value: '300', unit: 'mm' }, marginBar: { value: '30', unit: 'kPa' }, ratedMaxBar: { value: '2.5', unit: 'bar' }, minBar: { value: '0.61', unit: 'bar' } },
				files: []
			},
			db
		);
		const overview = (await practicalOverview(sam(), 'packer-pressure-safety', db)).find((s) => s.id === 'pressure-window')!;
		const readings = overview.history.find((h) => h.id === id)!.readings;
		expect(readings.find((r) => r.name === 'groundwaterHeadM')!.value).toBeCloseTo(0.3, 9);
		expect(readings.find((r) => r.name === 'marginBar')!.value).toBeCloseTo(0.3, 9);
		const min = readings.find((r) => r.name === 'minBar')!;
		// 0.3 m head: 0.3 × 1000 × 9.80665 / 1e5 = 0.0294 bar; + 0.3 = 0.3294 bar. 0.61 is far off the key.
		expect(min.key).toBeCloseTo(0.3294, 3);
		expect(min.withinTolerance).toBe(false);

		const bad = await rejection(
			submitEvidence({ traineeId: ids['priya@brindlewick'], courseSlug: 'packer-pressure-safety', skillId: 'pressure-window', note: '', readings: { minBar: { value: 'abc', unit: 'bar' }, marginBar: { value: '1', unit: 'kg' } }, files: [] }, db)
		);
		expect(Object.keys(bad.fields).sort()).toEqual(['readings.marginBar', 'readings.minBar']);
	});

	it('company admins see counts for their crew only; evidence visibility by role', async () => {
		const id = await assessInPerson(
			{ traineeId: sam(), trainerId: mira(), courseSlug: 'point-repair-installer', skillId: 'placement', note: '', readings: {}, files: [] },
			signOff('point-repair-installer', 'placement'),
			db
		);
		expect(id.outcome).toBe('signed off');
		const brindlewick = (await loadIdentity(ids['admin@brindlewick'], db))!;
		const counts = await crewSignOffCounts(brindlewick.companies[0].id, db);
		expect(counts.find((c) => c.userId === sam() && c.courseSlug === 'point-repair-installer')).toEqual({ userId: sam(), courseSlug: 'point-repair-installer', signedOff: 1, total: getCourse('point-repair-installer')!.practicalSkills.length });
		expect(counts.some((c) => c.userId === ade())).toBe(false);

		expect(await mayViewEvidenceOf(brindlewick, sam(), db)).toBe(true);
		expect(await mayViewEvidenceOf((await loadIdentity(dana(), db))!, sam(), db)).toBe(false);
		expect(await mayViewEvidenceOf((await loadIdentity(ids['priya@brindlewick'], db))!, sam(), db)).toBe(false);
		expect(await mayViewEvidenceOf((await loadIdentity(mira(), db))!, sam(), db)).toBe(true);
		expect(await mayViewEvidenceOf((await loadIdentity(ids['registrar@fenmoor'], db))!, sam(), db)).toBe(true);
	});
});
