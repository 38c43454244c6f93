import { afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { getCourse } from '$lib/content';
import { listAudit } from '$lib/server/audit';
import { addMonths, findCertificate, issueIfEarned, listCertificatesOf, renewalWindow, revokeCertificate } from '$lib/server/certificates';
import { addMember, createCompany } from '$lib/server/companies';
import type { DB } from '$lib/server/db';
import { recordPassedTest, recordSignOffs } from '$lib/server/demo-certificates';
import { testStatus } from '$lib/server/attempts';
import { crewExpiringSoon, expiringCertificatesOf, renewalView, startRenewal } from '$lib/server/renewals';
import { createSeats, renewalSeatLedger } from '$lib/server/seats';
import { signedOffSkills } from '$lib/server/sign-offs';
import { createTestDb } from '../helpers/db';
import { makeTraineeAndTrainer, useTemporaryDataDir } from '../helpers/certificates';

const COURSE = 'packer-pressure-safety'; // 24 months of validity; renewal opens 90 days before expiry, 30 days of grace
const course = getCourse(COURSE)!;
const at = (iso: string, time = '08:00:00') => new Date(`${iso}T${time}Z`);
const renewalSkills = course.practicalSkills.filter((s) => s.renewal).map((s) => s.id);
const otherSkills = course.practicalSkills.filter((s) => !s.renewal).map((s) => s.id);

describe('renewal', () => {
	let db: DB;
	beforeAll(() => useTemporaryDataDir());
	beforeEach(async () => (db = await createTestDb()));
	afterEach(async () => db.destroy());

	/** A holder in a company, certified on 2025-01-10 (expires 2027-01-10), with their trainer. */
	async function holderWithCertificate(issuedOn = '2025-01-10') {
		const { trainee, trainer } = await makeTraineeAndTrainer(db, COURSE, 'Hana Ostrow');
		const company = await createCompany(null, 'Quarrybank Drains', db);
		await addMember(null, company.id, trainee.id, 'member', db);
		await recordPassedTest(trainee.id, COURSE, at(issuedOn), db);
		await recordSignOffs(trainee.id, COURSE, trainer, at(issuedOn), db);
		const outcome = await issueIfEarned(trainee.id, COURSE, { db, now: at(issuedOn) });
		if (!outcome.issued) throw new Error('not issued');
		return { trainee, trainer, company, certificate: outcome.certificate };
	}

	/** Paid renewal seats for the company, as the payment webhook leaves them. */
	async function renewalSeats(companyId: string, buyerId: string, quantity: number) {
		const id = crypto.randomUUID();
		const now = new Date().toISOString();
		await db
			.insertInto('course_order')
			.values({ id, number: `PW-T-${id.slice(0, 6)}`, buyer_id: buyerId, company_id: companyId, course_slug: COURSE, product: 'renewal', quantity, unit_amount: course.renewal.priceCents, total_amount: quantity * course.renewal.priceCents, currency: 'EUR', state: 'paid', checkout_session_id: null, checkout_url: null, payment_intent_id: null, refunded_quantity: 0, refunded_amount: 0, created_at: now, paid_at: now, updated_at: now })
			.execute();
		await createSeats({ id, company_id: companyId, course_slug: COURSE, quantity, buyer_id: buyerId, product: 'renewal' }, db);
	}

	it('states its window in the course definition and marks safety skills, not every skill, for renewal', () => {
		expect(course.renewal).toEqual({ priceCents: 14500, opensDaysBefore: 90, graceDays: 30 });
		expect(renewalSkills).toEqual(['pre-use-check', 'staged-inflation', 'gas-and-confined-space', 'emergency-drill']);
		expect(otherSkills.length).toBeGreaterThan(0);
		expect(renewalWindow('2027-01-10', course)).toEqual({ opensOn: '2026-10-12', closesOn: '2027-02-09' });
	});

	it('issues a new certificate continuing from the old expiry date, with the old one replaced and linked', async () => {
		const { trainee, trainer, company, certificate: old } = await holderWithCertificate();
		await renewalSeats(company.id, trainee.id, 1);

		// 2026-12-01: 40 days before expiry
		expect(await startRenewal(trainee.id, old.number, { db, now: at('2026-12-01') })).toEqual({ ok: true, started: true });
		expect(await startRenewal(trainee.id, old.number, { db, now: at('2026-12-01', '08:01:00') })).toEqual({ ok: true, started: false });
		expect(await renewalSeatLedger(company.id, db)).toMatchObject([{ bought: 1, used: 1, free: 0 }]);

		// the renewal skills are due again; the others stand
		const standing = (await signedOffSkills(trainee.id, COURSE, db)).map((s) => s.skillId).sort();
		expect(standing).toEqual([...otherSkills].sort());
		// the course test is open again: attempts before the renewal do not count
		const status = await testStatus(trainee.id, COURSE, { db, now: at('2026-12-01', '09:00:00') });
		expect(status).toMatchObject({ passed: false, attemptsUsed: 0, blocked: null });

		// test passed, but the renewal skills not yet shown: nothing issued
		await recordPassedTest(trainee.id, COURSE, at('2026-12-03'), db);
		expect(await issueIfEarned(trainee.id, COURSE, { db, now: at('2026-12-03') })).toMatchObject({ issued: false, reason: 'requirements' });
		const view = await renewalView(trainee.id, old.number, { db, now: at('2026-12-03') });
		expect(view?.stage).toBe('started');
		expect(view?.progress?.testOn).toBe('2026-12-03');
		expect(view?.progress?.skills.map((s) => [s.id, s.met])).toEqual(renewalSkills.map((id) => [id, false]));

		// only the flagged skills are signed off again; the non-flagged ones are never asked for
		await recordSignOffs(trainee.id, COURSE, trainer, at('2026-12-05'), db, renewalSkills);
		const outcome = await issueIfEarned(trainee.id, COURSE, { db, now: at('2026-12-05') });
		expect(outcome.issued).toBe(true);
		if (!outcome.issued) return;
		const fresh = outcome.certificate;
		expect(fresh.expires_on).toBe('2029-01-10');
		expect(fresh.expires_on).toBe(addMonths(old.expires_on, course.validityMonths));
		expect(fresh).toMatchObject({ issued_on: '2026-12-05', test_on: '2026-12-03', practical_on: '2026-12-05', replaces_id: old.id });

		const oldPublic = await findCertificate(old.number, { db, now: at('2026-12-06') });
		expect(oldPublic).toMatchObject({ status: 'replaced', replacedBy: fresh.number, expiresOn: '2027-01-10' });
		expect(await findCertificate(fresh.number, { db, now: at('2026-12-06') })).toMatchObject({ status: 'valid', expiresOn: '2029-01-10' });
		expect((await listCertificatesOf(trainee.id, { db, now: at('2026-12-06') })).map((c) => c.status).sort()).toEqual(['replaced', 'valid']);
		expect((await renewalView(trainee.id, old.number, { db, now: at('2026-12-06') }))?.stage).toBe('completed');

		const actions = (await listAudit({ subjectType: 'certificate' }, db)).map((a) => a.action);
		expect(actions).toEqual(expect.arrayContaining(['renewal.start', 'renewal.complete']));
		expect(actions.filter((a) => a === 'certificate.issue')).toHaveLength(2);
		// the renewed certificate is not offered for renewal again
		expect(await startRenewal(trainee.id, old.number, { db, now: at('2026-12-07') })).toEqual({ ok: true, started: false });
		expect(await expiringCertificatesOf(trainee.id, { db, now: at('2026-12-07') })).toEqual([]);
	});

	it('starts only inside the window, with a renewal seat, for a current certificate of the holder', async () => {
		const { trainee, company, certificate } = await holderWithCertificate();
		const { trainee: stranger } = await makeTraineeAndTrainer(db, COURSE, 'Other Person');
		await renewalSeats(company.id, trainee.id, 1);
		expect(await startRenewal(stranger.id, certificate.number, { db, now: at('2026-12-01') })).toMatchObject({ ok: false, status: 404 });
		// 2026-10-11 is 91 days before expiry; the window opens on 2026-10-12
		expect(await startRenewal(trainee.id, certificate.number, { db, now: at('2026-10-11') })).toMatchObject({ ok: false, status: 409, message: expect.stringContaining('2026-10-12') });
		// 31 days after expiry: the grace period is over
		expect(await startRenewal(trainee.id, certificate.number, { db, now: at('2027-02-10') })).toMatchObject({ ok: false, status: 409, message: expect.stringContaining('closed') });
		expect((await renewalView(trainee.id, certificate.number, { db, now: at('2027-02-10') }))?.stage).toBe('closed');
		expect(await renewalSeatLedger(company.id, db)).toMatchObject([{ free: 1 }]);
	});

	it('within the grace period after expiry still continues from the old expiry date', async () => {
		const { trainee, trainer, certificate } = await holderWithCertificate();
		const { trainee: other } = await makeTraineeAndTrainer(db, null, 'Nobody');
		// no seat: refused, and nothing changed
		expect(await startRenewal(trainee.id, certificate.number, { db, now: at('2027-01-20') })).toMatchObject({ ok: false, message: expect.stringContaining('renewal seat') });
		expect((await signedOffSkills(trainee.id, COURSE, db)).length).toBe(course.practicalSkills.length);
		// a renewal seat the holder bought for themselves
		const id = crypto.randomUUID();
		const now = new Date().toISOString();
		await db.insertInto('course_order').values({ id, number: 'PW-T-OWN', buyer_id: trainee.id, company_id: null, course_slug: COURSE, product: 'renewal', quantity: 1, unit_amount: 14500, total_amount: 14500, currency: 'EUR', state: 'paid', checkout_session_id: null, checkout_url: null, payment_intent_id: null, refunded_quantity: 0, refunded_amount: 0, created_at: now, paid_at: now, updated_at: now }).execute();
		await createSeats({ id, company_id: null, course_slug: COURSE, quantity: 1, buyer_id: trainee.id, product: 'renewal' }, db);
		expect(await startRenewal(trainee.id, certificate.number, { db, now: at('2027-01-20') })).toEqual({ ok: true, started: true });
		expect(await findCertificate(certificate.number, { db, now: at('2027-01-20') })).toMatchObject({ status: 'expired' });
		await recordPassedTest(trainee.id, COURSE, at('2027-01-25'), db);
		await recordSignOffs(trainee.id, COURSE, trainer, at('2027-01-26'), db, renewalSkills);
		const outcome = await issueIfEarned(trainee.id, COURSE, { db, now: at('2027-01-26') });
		expect(outcome.issued && outcome.certificate.expires_on).toBe('2029-01-10');
		expect(other.id).not.toBe(trainee.id);
	});

	it('does not complete after the window has closed, and refuses revoked certificates', async () => {
		const { trainee, trainer, company, certificate } = await holderWithCertificate();
		await renewalSeats(company.id, trainee.id, 2);
		expect(await startRenewal(trainee.id, certificate.number, { db, now: at('2027-01-05') })).toMatchObject({ ok: true });
		await recordPassedTest(trainee.id, COURSE, at('2027-02-20'), db);
		await recordSignOffs(trainee.id, COURSE, trainer, at('2027-02-20'), db, renewalSkills);
		expect(await issueIfEarned(trainee.id, COURSE, { db, now: at('2027-02-20') })).toMatchObject({ issued: false, reason: 'already-held' });

		const second = await holderWithCertificate('2025-02-01');
		await addMember(null, company.id, second.trainee.id, 'member', db);
		const registrar = second.trainer.id;
		await revokeCertificate(registrar, second.certificate.number, 'issued-in-error', '', { db, now: at('2026-12-01') });
		expect(await startRenewal(second.trainee.id, second.certificate.number, { db, now: at('2026-12-02') })).toMatchObject({ ok: false, message: expect.stringContaining('revoked') });
		expect(await renewalSeatLedger(company.id, db)).toMatchObject([{ bought: 2, used: 1, free: 1 }]);
	});

	it('lists what expires soon for the holder and for the company admin', async () => {
		const { trainee, company, certificate } = await holderWithCertificate();
		expect(await expiringCertificatesOf(trainee.id, { db, now: at('2026-11-01') })).toEqual([]);
		expect(await expiringCertificatesOf(trainee.id, { db, now: at('2026-11-12') })).toEqual([
			{ number: certificate.number, courseSlug: COURSE, courseCode: 'PS-150', courseTitle: course.title, expiresOn: '2027-01-10', daysLeft: 59, renewalStarted: false }
		]);
		expect(await crewExpiringSoon(company.id, { db, now: at('2026-12-11') })).toMatchObject([{ userId: trainee.id, name: 'Hana Ostrow', number: certificate.number, daysLeft: 30 }]);
		expect(await crewExpiringSoon(company.id, { db, now: at('2027-01-11') })).toEqual([]);
	});
});
