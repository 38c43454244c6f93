import fs from 'node:fs';
import { afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { getCourse } from '$lib/content';
import { listAudit } from '$lib/server/audit';
import { addMonths, checkNumbers, findCertificate, issueIfEarned, listWaitingForOne, reissueWithName, revokeCertificate } from '$lib/server/certificates';
import { recordPassedTest, recordSignOffs, recordWaitingEvidence } from '$lib/server/demo-certificates';
import { enrol } from '$lib/server/enrolments';
import { seedDemo } from '$lib/server/demo-seed';
import { assessSubmission } from '$lib/server/sign-offs';
import { listCertificatesForRegistrar } from '$lib/server/certificates';
import { issuerKeyFile } from '$lib/server/issuer-key';
import { isDatabaseBusy } from '$lib/server/db/errors';
import { createSharedTestDbs, createTestDb, destroyAll } from '../helpers/db';
import { makeTraineeAndTrainer, useTemporaryDataDir } from '../helpers/certificates';

const day = (iso: string) => new Date(`${iso}T10:00:00Z`);
const BASIC = 'point-repair-installer';
const TRANSITION = 'transition-patches';

describe('certificate issuance', () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	let dataDir: string;
	beforeAll(() => {
		dataDir = useTemporaryDataDir();
	});
	beforeEach(async () => (db = await createTestDb()));
	afterEach(async () => db.destroy());

	it('adds calendar months the way a validity period is counted', () => {
		expect(addMonths('2026-01-31', 1)).toBe('2026-02-28');
		expect(addMonths('2024-01-31', 1)).toBe('2024-02-29');
		expect(addMonths('2026-12-02', 36)).toBe('2029-12-02');
	});

	it('issues nothing while a sign-off is missing, then exactly one certificate when the last one lands', async () => {
		const { trainee, trainer } = await makeTraineeAndTrainer(db, BASIC);
		const skills = getCourse(BASIC)!.practicalSkills.map((s) => s.id);
		await recordPassedTest(trainee.id, BASIC, day('2026-10-01'), db);
		await recordSignOffs(trainee.id, BASIC, trainer, day('2026-10-05'), db, skills.slice(0, -1));
		const before = await issueIfEarned(trainee.id, BASIC, { db, now: day('2026-10-06') });
		expect(before).toMatchObject({ issued: false, reason: 'requirements' });
		expect(before.issued === false && before.check?.requirements.find((r) => r.key === 'skills')).toMatchObject({ met: false });

		await recordSignOffs(trainee.id, BASIC, trainer, day('2026-10-07'), db, skills.slice(-1));
		const after = await issueIfEarned(trainee.id, BASIC, { db, now: day('2026-10-07') });
		expect(after.issued).toBe(true);
		if (!after.issued) return;
		const c = after.certificate;
		const course = getCourse(BASIC)!;
		expect(c).toMatchObject({
			holder_name: 'Ada Quillfeather',
			course_code: course.code,
			course_title: course.title,
			scope: course.certificateScope,
			diameter_min_mm: course.diameterRangeMm[0],
			diameter_max_mm: course.diameterRangeMm[1],
			test_on: '2026-10-01',
			practical_on: '2026-10-07',
			issued_on: '2026-10-07',
			expires_on: addMonths('2026-10-07', course.validityMonths)
		});
		expect(JSON.parse(c.trainers)).toEqual([{ id: trainer.id, name: 'Bram Trainer' }]);
		expect(c.number).toMatch(/^[0-9A-Z]{4}(-[0-9A-Z]{4}){3}$/);
		const again = await issueIfEarned(trainee.id, BASIC, { db, now: day('2026-10-08') });
		expect(again).toMatchObject({ issued: false, reason: 'already-held' });
		const audit = await listAudit({ subjectType: 'certificate' }, db);
		expect(audit.filter((a) => a.action === 'certificate.issue')).toHaveLength(1);
	});

	it('issues nothing without a passed test or without enrolment', async () => {
		const { trainee, trainer } = await makeTraineeAndTrainer(db, null);
		await recordSignOffs(trainee.id, BASIC, trainer, day('2026-10-05'), db);
		await recordPassedTest(trainee.id, BASIC, day('2026-10-01'), db);
		await db.updateTable('test_attempt').set({ passed: 0, score_percent: 40 }).execute();
		await enrol(null, trainee.id, BASIC, 'registrar', db);
		expect(await issueIfEarned(trainee.id, BASIC, { db, now: day('2026-10-06') })).toMatchObject({ issued: false });
		await db.deleteFrom('enrolment').execute();
		await db.updateTable('test_attempt').set({ passed: 1 }).execute();
		const notEnrolled = await issueIfEarned(trainee.id, BASIC, { db, now: day('2026-10-06') });
		expect(notEnrolled.issued === false && notEnrolled.check?.requirements.filter((r) => !r.met).map((r) => r.key)).toEqual(['enrolment']);
	});

	it('needs the prerequisite certificate valid on the day, and issues the follow-on course when the prerequisite lands', async () => {
		// the prerequisite, earned years ago and expired by now
		const { trainee, trainer } = await makeTraineeAndTrainer(db, BASIC);
		await recordPassedTest(trainee.id, BASIC, day('2020-01-01'), db);
		await recordSignOffs(trainee.id, BASIC, trainer, day('2020-01-02'), db);
		expect((await issueIfEarned(trainee.id, BASIC, { db, now: day('2020-01-02') })).issued).toBe(true);

		await enrol(null, trainee.id, TRANSITION, 'registrar', db);
		await recordPassedTest(trainee.id, TRANSITION, day('2026-01-10'), db);
		await recordSignOffs(trainee.id, TRANSITION, trainer, day('2026-01-12'), db);
		const blocked = await issueIfEarned(trainee.id, TRANSITION, { db, now: day('2026-01-12') });
		expect(blocked.issued === false && blocked.check?.requirements.filter((r) => !r.met).map((r) => r.key)).toEqual(['prerequisites']);
		expect((await listWaitingForOne({ db, now: day('2026-01-12') })).map((w) => [w.courseSlug, w.missing.key])).toEqual([[TRANSITION, 'prerequisites']]);

		// a fresh database where the prerequisite is issued now: the follow-on course comes with it
		const db2 = await createTestDb();
		const p = await makeTraineeAndTrainer(db2, TRANSITION);
		await enrol(null, p.trainee.id, BASIC, 'registrar', db2);
		await recordPassedTest(p.trainee.id, TRANSITION, day('2026-01-10'), db2);
		await recordSignOffs(p.trainee.id, TRANSITION, p.trainer, day('2026-01-12'), db2);
		await recordPassedTest(p.trainee.id, BASIC, day('2026-01-02'), db2);
		await recordSignOffs(p.trainee.id, BASIC, p.trainer, day('2026-01-03'), db2);
		expect((await issueIfEarned(p.trainee.id, BASIC, { db: db2, now: day('2026-01-13') })).issued).toBe(true);
		expect((await db2.selectFrom('certificate').select('course_slug').execute()).map((r) => r.course_slug).sort()).toEqual([BASIC, TRANSITION]);
		await db2.destroy();
	});

	it('two requests racing over separate connections make exactly one certificate', async () => {
		// two handles with connections of their own on one database, as two processes have
		const [a, b] = await createSharedTestDbs(2);
		const { trainee, trainer } = await makeTraineeAndTrainer(a, BASIC);
		await recordPassedTest(trainee.id, BASIC, day('2026-10-01'), a);
		await recordSignOffs(trainee.id, BASIC, trainer, day('2026-10-02'), a);
		const outcomes = await Promise.all([
			issueIfEarned(trainee.id, BASIC, { db: a, now: day('2026-10-02') }),
			issueIfEarned(trainee.id, BASIC, { db: b, now: day('2026-10-02') }),
			issueIfEarned(trainee.id, BASIC, { db: a, now: day('2026-10-02') }),
			issueIfEarned(trainee.id, BASIC, { db: b, now: day('2026-10-02') })
		]);
		expect(outcomes.filter((o) => o.issued)).toHaveLength(1);
		const rows = await a.selectFrom('certificate').select(['number']).execute();
		expect(rows).toHaveLength(1);
		for (const o of outcomes) expect(o.certificate?.number).toBe(rows[0].number);
		await destroyAll([a, b]);
	});

	it('two registrars racing to re-issue or revoke one certificate change it once', async () => {
		const [a, b] = await createSharedTestDbs(2);
		const { trainee, trainer } = await makeTraineeAndTrainer(a, BASIC);
		await recordPassedTest(trainee.id, BASIC, day('2026-10-01'), a);
		await recordSignOffs(trainee.id, BASIC, trainer, day('2026-10-02'), a);
		const issued = await issueIfEarned(trainee.id, BASIC, { db: a, now: day('2026-10-02') });
		if (!issued.issued) throw new Error('not issued');
		const number = issued.certificate.number;
		// a refusal is a 409, or on SQLite a busy write lock (the request would answer 503)
		const settle = (p: Promise<{ ok: boolean }>) => p.catch((e) => (isDatabaseBusy(e) ? { ok: false } : Promise.reject(e)));
		const reissues = await Promise.all([
			settle(reissueWithName(trainer.id, number, 'Name One', { db: a, now: day('2026-10-03') })),
			settle(reissueWithName(trainer.id, number, 'Name Two', { db: b, now: day('2026-10-03') })),
			settle(reissueWithName(trainer.id, number, 'Name Three', { db: a, now: day('2026-10-03') })),
			settle(reissueWithName(trainer.id, number, 'Name Four', { db: b, now: day('2026-10-03') }))
		]);
		expect(reissues.filter((r) => r.ok)).toHaveLength(1);
		const current = await a.selectFrom('certificate').select(['number', 'holder_name']).where('slot', 'is not', null).execute();
		expect(current).toHaveLength(1);
		expect((await a.selectFrom('certificate').select('id').execute()).length).toBe(2);
		const revokes = await Promise.all(
			[a, b, a, b].map((h) => settle(revokeCertificate(trainer.id, current[0].number, 'misconduct', 'Raced', { db: h, now: day('2026-10-04') })))
		);
		expect(revokes.filter((r) => r.ok)).toHaveLength(1);
		const actions = (await listAudit({ subjectType: 'certificate' }, a)).map((e) => e.action).sort();
		expect(actions).toEqual(['certificate.issue', 'certificate.issue', 'certificate.replace', 'certificate.revoke']);
		await destroyAll([a, b]);
	});

	it('revokes with a reason the public never sees, re-issues after a name correction, audits both', async () => {
		const { trainee, trainer } = await makeTraineeAndTrainer(db, BASIC, 'Ada Quilfeather');
		await recordPassedTest(trainee.id, BASIC, day('2026-10-01'), db);
		await recordSignOffs(trainee.id, BASIC, trainer, day('2026-10-02'), db);
		const issued = await issueIfEarned(trainee.id, BASIC, { db, now: day('2026-10-02') });
		if (!issued.issued) throw new Error('not issued');
		const first = issued.certificate.number;
		const replaced = await reissueWithName(trainer.id, first.toLowerCase(), 'Ada Quillfeather', { db, now: day('2026-10-03') });
		expect(replaced.ok).toBe(true);
		if (!replaced.ok) return;
		expect(replaced.certificate.expires_on).toBe(issued.certificate.expires_on);
		expect(await findCertificate(first, { db, now: day('2026-10-04') })).toMatchObject({ status: 'replaced', replacedBy: replaced.certificate.number, holder: 'Ada Quilfeather' });
		expect(await findCertificate(replaced.certificate.number, { db, now: day('2026-10-04') })).toMatchObject({ status: 'valid', holder: 'Ada Quillfeather' });
		expect((await db.selectFrom('User').select('name').where('id', '=', trainee.id).executeTakeFirstOrThrow()).name).toBe('Ada Quillfeather');

		expect(await revokeCertificate(trainer.id, first, 'misconduct', '', { db })).toMatchObject({ ok: false, status: 409 });
		const revoked = await revokeCertificate(trainer.id, replaced.certificate.number, 'misconduct', 'Left a packer inflated unattended', { db, now: day('2026-10-05') });
		expect(revoked.ok).toBe(true);
		const view = await findCertificate(replaced.certificate.number, { db, now: day('2026-10-06') });
		expect(view).toMatchObject({ status: 'revoked', revokedOn: '2026-10-05' });
		expect(JSON.stringify(view)).not.toMatch(/misconduct|unattended|@/i);
		expect(await issueIfEarned(trainee.id, BASIC, { db, now: day('2026-10-06') })).toMatchObject({ issued: false, reason: 'already-held' });
		const actions = (await listAudit({ subjectType: 'certificate' }, db)).map((a) => a.action).sort();
		expect(actions).toEqual(['certificate.issue', 'certificate.issue', 'certificate.replace', 'certificate.revoke']);
	});

	it('answers expired after the expiry day and checks a crew list in order', async () => {
		const { trainee, trainer } = await makeTraineeAndTrainer(db, BASIC);
		await recordPassedTest(trainee.id, BASIC, day('2026-10-01'), db);
		await recordSignOffs(trainee.id, BASIC, trainer, day('2026-10-02'), db);
		const issued = await issueIfEarned(trainee.id, BASIC, { db, now: day('2026-10-02') });
		if (!issued.issued) throw new Error('not issued');
		const { number, expires_on } = issued.certificate;
		expect((await findCertificate(number, { db, now: day(expires_on) }))?.status).toBe('valid');
		expect((await findCertificate(number, { db, now: day(addMonths(expires_on, 1)) }))?.status).toBe('expired');
		const rows = await checkNumbers([number.toLowerCase(), 'ABCD', number.slice(0, -1) + (number.endsWith('0') ? '1' : '0')], { db, now: day('2026-10-03') });
		expect(rows.map((r) => r.result?.status ?? r.problem)).toEqual(['valid', expect.stringContaining('16 letters'), expect.stringContaining('typing mistake')]);
	});

	it('keeps the issuer key in DATA_DIR with mode 0600', async () => {
		const { trainee, trainer } = await makeTraineeAndTrainer(db, BASIC);
		await recordPassedTest(trainee.id, BASIC, day('2026-10-01'), db);
		await recordSignOffs(trainee.id, BASIC, trainer, day('2026-10-02'), db);
		await issueIfEarned(trainee.id, BASIC, { db, now: day('2026-10-02') });
		expect(fs.statSync(issuerKeyFile(dataDir)).mode & 0o777).toBe(0o600);
	});

	it('seeds the demo with valid, expiring-soon, expired and revoked certificates and three people one requirement short', async () => {
		await seedDemo(db);
		const all = await listCertificatesForRegistrar('', { db });
		const byHolder = new Map(all.map((c) => [`${c.holder}|${c.course.code}`, c]));
		expect(byHolder.get('Nell Garrow|PR-100')?.status).toBe('valid');
		const priya = byHolder.get('Owen Tarrant|PS-150')!;
		expect(priya.status).toBe('valid');
		const daysLeft = (Date.parse(priya.expiresOn) - Date.now()) / 86_400_000;
		expect(daysLeft).toBeGreaterThan(0);
		expect(daysLeft).toBeLessThan(60);
		expect(byHolder.get('Ivo Brack|PR-100')?.status).toBe('expired');
		expect(byHolder.get('Rhea Solley|PR-100')).toMatchObject({ status: 'revoked', revocationReason: expect.stringContaining('Issued in error') });
		const waiting = (await listWaitingForOne({ db })).map((w) => `${w.name}|${w.courseSlug}|${w.missing.key}`).sort();
		expect(waiting).toEqual(['Cole Farrant|point-repair-installer|skills', 'Kit Mendel|transition-patches|test', 'Nell Garrow|packer-pressure-safety|skills']);
	});

	it("issues in the trainer's sign-off transaction when that sign-off is the last requirement", async () => {
		await seedDemo(db);
		const sam = await db.selectFrom('User').select('id').where('email', '=', 'nell@brindlewick.test').executeTakeFirstOrThrow();
		const trainer = await db.selectFrom('User').select('id').where('email', '=', 'trainer@fenmoor.test').executeTakeFirstOrThrow();
		const waiting = { id: await recordWaitingEvidence(sam.id, 'packer-pressure-safety', 'ppe-and-resin', new Date(), db), skill_id: 'ppe-and-resin' };
		const skill = getCourse('packer-pressure-safety')!.practicalSkills.find((s) => s.id === waiting.skill_id)!;
		await assessSubmission(waiting.id, trainer.id, {
			criteria: skill.criteria.map(() => ({ result: 'met', remark: '' })),
			outcome: 'signed off',
			reasons: '',
			place: 'Training yard rig',
			practicalDate: new Date().toISOString().slice(0, 10),
			signatureName: 'Mira Calloway'
		}, db);
		const held = await db.selectFrom('certificate').select(['course_slug', 'holder_name']).where('user_id', '=', sam.id).execute();
		expect(held.map((h) => h.course_slug).sort()).toEqual(['packer-pressure-safety', 'point-repair-installer']);
		const audit = await listAudit({ subjectType: 'certificate' }, db);
		expect(audit[0]).toMatchObject({ action: 'certificate.issue' });
	});
});
