import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { startMailFake } from '../../fakes/mail';
import { issueIfEarned, reissueWithName, revokeCertificate } from '$lib/server/certificates';
import { addMember, createCompany } from '$lib/server/companies';
import { reloadConfig } from '$lib/server/config';
import type { DB } from '$lib/server/db';
import { recordPassedTest, recordSignOffs } from '$lib/server/demo-certificates';
import { enrol } from '$lib/server/enrolments';
import { sendMail, type MailContent } from '$lib/server/mail';
import { CLAIM_LEASE_MS, claimReminder, daysUntil, dueThreshold, listDueReminders, sendDueReminders } from '$lib/server/reminders';
import { createUser } from '$lib/server/users';
import { createTestDb } from '../helpers/db';
import { useTemporaryDataDir } from '../helpers/certificates';

const COURSE = 'packer-pressure-safety'; // 24 months of validity
const at = (iso: string) => new Date(`${iso}T06:00:00Z`);
const ORIGIN = 'https://patchwright.example.test';

interface Stored {
	subject: string;
	text: string;
	to: string[];
}

async function person(db: DB, email: string, name: string) {
	return createUser({ email, name }, db);
}

/** A certificate of COURSE issued on `issuedOn` (so it expires 24 months later). */
async function certify(db: DB, userId: string, issuedOn: string) {
	const trainer = await person(db, `${crypto.randomUUID().slice(0, 8)}@trainers.test`, 'Tamsin Rig');
	await enrol(null, userId, COURSE, 'registrar', db);
	await recordPassedTest(userId, COURSE, at(issuedOn), db);
	await recordSignOffs(userId, COURSE, { id: trainer.id, name: 'Tamsin Rig' }, at(issuedOn), db);
	const outcome = await issueIfEarned(userId, COURSE, { db, now: at(issuedOn) });
	if (!outcome.issued) throw new Error('not issued');
	return outcome.certificate;
}

describe('when a reminder is due', () => {
	it('counts whole days and picks the nearest threshold already reached', () => {
		expect(daysUntil('2027-01-10', '2026-11-11')).toBe(60);
		expect(daysUntil('2027-01-10', '2027-01-10')).toBe(0);
		expect(daysUntil('2024-03-01', '2024-02-28')).toBe(2); // leap year: 29 February counts
		expect([61, 60, 31, 30, 8, 7, 0, -1].map(dueThreshold)).toEqual([null, 60, 60, 30, 30, 7, 7, null]);
	});
});

describe('expiry reminders through SMTP into the local fake', () => {
	let fake: Awaited<ReturnType<typeof startMailFake>>;
	let db: DB;
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-reminders-'));

	beforeAll(async () => {
		useTemporaryDataDir();
		fake = await startMailFake({ smtpPort: 0, httpPort: 0, dir });
		vi.stubEnv('SMTP_URL', fake.smtpUrl);
		reloadConfig();
	});
	afterAll(async () => {
		vi.unstubAllEnvs();
		reloadConfig();
		await fake.close();
	});
	beforeEach(async () => {
		db = await createTestDb();
		for (const f of fs.readdirSync(dir)) fs.rmSync(path.join(dir, f), { recursive: true, force: true });
	});
	afterEach(async () => db.destroy());

	async function inbox(to: string): Promise<Stored[]> {
		return (await fetch(`${fake.inboxUrl}api/messages?to=${encodeURIComponent(to)}`)).json();
	}
	/** Subjects received by `to`, oldest first. */
	async function subjects(to: string): Promise<string[]> {
		return (await inbox(to)).map((m) => m.subject).sort();
	}
	const run = (iso: string, extra: { send?: (m: MailContent) => Promise<void>; offsetMs?: number } = {}) =>
		sendDueReminders({ db, now: new Date(at(iso).getTime() + (extra.offsetMs ?? 0)), origin: ORIGIN, ...(extra.send ? { send: extra.send } : {}) });

	it('sends each threshold once to the holder and the company admins, across repeated runs and a restart mid-run', async () => {
		const company = await createCompany(null, 'Quarrybank Drains', db);
		const admin = await person(db, 'ada@quarrybank.test', 'Ada Lintel');
		const admin2 = await person(db, 'bo@quarrybank.test', 'Bo Sump');
		const holder = await person(db, 'hana@quarrybank.test', 'Hana Ostrow');
		await addMember(null, company.id, admin.id, 'admin', db);
		await addMember(null, company.id, admin2.id, 'admin', db);
		await addMember(null, company.id, holder.id, 'member', db);
		const certificate = await certify(db, holder.id, '2025-01-10'); // expires 2027-01-10
		expect(certificate.expires_on).toBe('2027-01-10');
		const people = ['hana@quarrybank.test', 'ada@quarrybank.test', 'bo@quarrybank.test'];

		// 70 days before: nothing due
		expect(await run('2026-11-01')).toEqual({ sent: 0, skipped: 0, failed: 0 });

		// 60 days before, twice the same day
		expect(await run('2026-11-11')).toEqual({ sent: 3, skipped: 0, failed: 0 });
		expect(await run('2026-11-11', { offsetMs: 3_600_000 })).toEqual({ sent: 0, skipped: 3, failed: 0 });
		// the following days the 60-day reminder stays sent
		expect(await run('2026-11-20')).toEqual({ sent: 0, skipped: 3, failed: 0 });

		// 30 days before: the process dies while handing over the second message (after its claim, before the send)
		let calls = 0;
		const dying = async (m: MailContent) => {
			calls++;
			if (calls === 2) return new Promise<void>(() => {}); // never returns: the process is gone
			await sendMail(m);
		};
		void run('2026-12-11', { send: dying });
		await vi.waitFor(() => expect(calls).toBe(2));
		// the restarted server runs at once: the first is sent, the second still claimed by the dead run, the third is sent now
		expect(await run('2026-12-11', { offsetMs: 60_000 })).toEqual({ sent: 1, skipped: 2, failed: 0 });
		// the next run after the claim's lease takes the orphaned claim over and sends it
		expect(await run('2026-12-11', { offsetMs: CLAIM_LEASE_MS + 120_000 })).toEqual({ sent: 1, skipped: 2, failed: 0 });
		expect(await run('2026-12-12')).toEqual({ sent: 0, skipped: 3, failed: 0 });

		// 7 days before: a crash right after claiming the holder's reminder, before anything is sent
		const due = (await listDueReminders({ db, now: at('2027-01-03') })).filter((d) => d.recipient.role === 'holder');
		expect(due).toHaveLength(1);
		expect(await claimReminder(due[0], at('2027-01-03'), db)).toBeTruthy();
		expect(await run('2027-01-03', { offsetMs: 1000 })).toEqual({ sent: 2, skipped: 1, failed: 0 });
		expect(await run('2027-01-03', { offsetMs: CLAIM_LEASE_MS + 1000 })).toEqual({ sent: 1, skipped: 2, failed: 0 });
		expect(await run('2027-01-09')).toEqual({ sent: 0, skipped: 3, failed: 0 });
		// expired: no more reminders
		expect(await run('2027-01-11')).toEqual({ sent: 0, skipped: 0, failed: 0 });

		expect(await subjects('hana@quarrybank.test')).toEqual([
			'Your PS-150 certificate expires in 30 days',
			'Your PS-150 certificate expires in 60 days',
			'Your PS-150 certificate expires in 7 days'
		]);
		for (const adminEmail of people.slice(1)) {
			expect(await subjects(adminEmail)).toEqual([
				'Hana Ostrow: PS-150 certificate expires in 30 days',
				'Hana Ostrow: PS-150 certificate expires in 60 days',
				'Hana Ostrow: PS-150 certificate expires in 7 days'
			]);
		}
		const [holderMail] = await inbox('hana@quarrybank.test');
		expect(holderMail.text).toContain(`${ORIGIN}/certificates/${certificate.number}/renew`);
		const [adminMail] = await inbox('ada@quarrybank.test');
		expect(adminMail.text).toContain(`${ORIGIN}/company`);
		expect(adminMail.text).not.toContain('/renew');

		const sentRows = await db.selectFrom('certificate_reminder').select(['threshold_days', 'sent_at', 'attempts']).execute();
		expect(sentRows).toHaveLength(9);
		expect(sentRows.every((r) => r.sent_at !== null)).toBe(true);
		expect(sentRows.filter((r) => r.attempts === 2)).toHaveLength(2); // the two claims taken over
		const audit = await db.selectFrom('audit_log').select('id').where('action', '=', 'certificate.reminder').execute();
		expect(audit).toHaveLength(9);
	});

	it('after downtime sends only the nearest threshold, once, never all three at once', async () => {
		const holder = await person(db, 'ivy@quarrybank.test', 'Ivy Weir');
		await certify(db, holder.id, '2025-01-10'); // expires 2027-01-10
		// the server was down from 70 days before until 25 days before
		expect(await run('2026-12-16')).toEqual({ sent: 1, skipped: 0, failed: 0 });
		expect(await run('2026-12-17')).toEqual({ sent: 0, skipped: 1, failed: 0 });
		// and again down until 3 days before
		expect(await run('2027-01-07')).toEqual({ sent: 1, skipped: 0, failed: 0 });
		expect(await subjects('ivy@quarrybank.test')).toEqual(['Your PS-150 certificate expires in 25 days', 'Your PS-150 certificate expires in 3 days']);
	});

	it('sends nothing for revoked or replaced certificates', async () => {
		const registrar = await person(db, 'reg@provider.test', 'Rhoda Ledger');
		const revokedHolder = await person(db, 'rex@quarrybank.test', 'Rex Culvert');
		const renamedHolder = await person(db, 'pia@quarrybank.test', 'Pia Gully');
		const revoked = await certify(db, revokedHolder.id, '2025-01-10');
		await revokeCertificate(registrar.id, revoked.number, 'issued-in-error', '', { db, now: at('2025-02-01') });
		const old = await certify(db, renamedHolder.id, '2025-01-10');
		const fresh = await reissueWithName(registrar.id, old.number, 'Pia Gulley', { db, now: at('2025-03-01') });
		expect(fresh.ok).toBe(true);

		for (const day of ['2026-11-11', '2026-12-11', '2027-01-03']) await run(day);
		expect(await inbox('rex@quarrybank.test')).toEqual([]);
		const pia = await inbox('pia@quarrybank.test');
		// only the replacement certificate (same expiry) is reminded of, never the replaced number
		expect(pia).toHaveLength(3);
		expect(pia.every((m) => !m.text.includes(old.number) && fresh.ok && m.text.includes(fresh.certificate.number))).toBe(true);
	});

	it('releases the claim when the mail server refuses, so the next run sends it', async () => {
		const holder = await person(db, 'jo@quarrybank.test', 'Jo Baffle');
		await certify(db, holder.id, '2025-01-10');
		const refusing = async () => {
			throw new Error('451 try again later');
		};
		vi.spyOn(console, 'error').mockImplementation(() => {});
		expect(await run('2026-11-11', { send: refusing })).toEqual({ sent: 0, skipped: 0, failed: 1 });
		expect(await run('2026-11-11', { offsetMs: 60_000 })).toEqual({ sent: 1, skipped: 0, failed: 0 });
		expect(await subjects('jo@quarrybank.test')).toEqual(['Your PS-150 certificate expires in 60 days']);
	});
});
