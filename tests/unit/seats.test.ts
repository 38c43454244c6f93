import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { listAudit } from '$lib/server/audit';
import { addMember, createCompany } from '$lib/server/companies';
import type { DB } from '$lib/server/db';
import { isEnrolled } from '$lib/server/enrolments';
import { acceptInvitation, checkInvitations, courseRefs, inviteCrew, rowsFromInput } from '$lib/server/invitations';
import { getOrder, requestRefund, startOrder } from '$lib/server/orders';
import { loadIdentity } from '$lib/server/roles';
import { markSeatInUse, seatLedger, takeBackSeat } from '$lib/server/seats';
import { createUser } from '$lib/server/users';
import { parseRoster } from '$lib/roster';
import { createTestDb } from '../helpers/db';
import { startPaymentsHarness } from '../helpers/payments';

/** Seats after payment: invitations, concurrent acceptance, taking back, refunds of unused seats. */
const COURSE = 'point-repair-installer';
let db: DB;
let harness: Awaited<ReturnType<typeof startPaymentsHarness>>;
let companyId: string;
let adminId: string;

beforeAll(async () => {
	harness = await startPaymentsHarness(() => db);
});
afterAll(async () => harness.close());

beforeEach(async () => {
	db = await createTestDb();
	harness.fake.setDelivery('normal');
	await fetch(`${harness.mail.inboxUrl}api/messages`, { method: 'DELETE' });
	adminId = (await createUser({ email: 'boss@crew.test', name: 'Boss' }, db)).id;
	companyId = (await createCompany(null, 'Crew Test Ltd', db)).id;
	await addMember(null, companyId, adminId, 'admin', db);
});

const ledger = async () => (await seatLedger(companyId, db)).find((l) => l.courseSlug === COURSE) ?? { bought: 0, assigned: 0, inUse: 0, invited: 0, free: 0 };

async function buy(quantity: number) {
	const order = await startOrder((await loadIdentity(adminId, db))!, { courseSlug: COURSE, quantity, companyId }, 'http://app.test', db);
	await harness.pay(order.checkout_session_id!, '4242424242424242');
	await harness.settled();
	return order;
}

/** Invites people and returns their tokens from the e-mails the mail fake received. */
async function invite(people: { name: string; email: string }[]) {
	const result = await inviteCrew(adminId, companyId, rowsFromInput(people.map((p) => ({ ...p, course: 'PR-100' }))), 'http://app.test', db);
	expect(result.ok).toBe(true);
	const tokenFor = new Map<string, string>();
	for (let i = 0; i < 200 && tokenFor.size < people.length; i++) {
		const messages = (await (await fetch(`${harness.mail.inboxUrl}api/messages`)).json()) as { text: string; to: string[] }[];
		for (const m of messages) {
			const token = m.text.match(/\/invitations\/([\w-]+)/)?.[1];
			if (token && !tokenFor.has(m.to[0])) tokenFor.set(m.to[0], token);
		}
		if (tokenFor.size < people.length) await new Promise((r) => setTimeout(r, 50));
	}
	return people.map((p) => tokenFor.get(p.email)!);
}

describe('seats', () => {
	it('50 simultaneous acceptances for 10 free seats grant exactly 10', async () => {
		await buy(50);
		const people = await Promise.all(Array.from({ length: 50 }, (_, i) => createUser({ email: `crew${i}@crew.test`, name: `Crew ${i}` }, db)));
		const tokens = await invite(people.map((p) => ({ name: p.name, email: p.email })));
		// 40 unused seats are refunded while the 50 invitations are still open.
		const order = (await db.selectFrom('course_order').select('id').executeTakeFirstOrThrow()).id;
		await requestRefund(adminId, order, 40, db);
		await harness.settled();
		expect(await ledger()).toMatchObject({ bought: 10, assigned: 0 });

		const results = await Promise.all(people.map((p, i) => acceptInvitation(tokens[i], p.id, db)));
		expect(results.filter((r) => r.ok)).toHaveLength(10);
		expect(results.filter((r) => !r.ok).every((r) => !r.ok && /taken/.test(r.message))).toBe(true);
		expect(await ledger()).toMatchObject({ bought: 10, assigned: 10 });
		const enrolled = await db.selectFrom('enrolment').select('user_id').where('course_slug', '=', COURSE).where('source', '=', 'seat').execute();
		expect(enrolled).toHaveLength(10);
		const members = await db.selectFrom('membership').select('user_id').where('company_id', '=', companyId).where('role', '=', 'member').execute();
		expect(members).toHaveLength(10);
	}, 90_000);

	it('an invitation works once, only for its address, and confirms the address', async () => {
		await buy(2);
		const ana = await createUser({ email: 'ana@crew.test', name: 'Ana' }, db);
		const other = await createUser({ email: 'other@crew.test', name: 'Other' }, db);
		const [token] = await invite([{ name: 'Ana', email: 'ana@crew.test' }]);
		expect(await acceptInvitation(token, other.id, db)).toMatchObject({ ok: false });
		expect(await acceptInvitation(token, ana.id, db)).toMatchObject({ ok: true, courseSlug: COURSE });
		expect(await acceptInvitation(token, ana.id, db)).toMatchObject({ ok: false, message: /already been accepted/ });
		expect(await acceptInvitation('x'.repeat(43), ana.id, db)).toMatchObject({ ok: false });
		const row = await db.selectFrom('User').select('emailVerified').where('id', '=', ana.id).executeTakeFirstOrThrow();
		expect(row.emailVerified).not.toBeNull();
		expect(await ledger()).toMatchObject({ bought: 2, assigned: 1, invited: 0, free: 1 });
	});

	it('an expired invitation cannot be accepted', async () => {
		await buy(1);
		const ana = await createUser({ email: 'ana@crew.test', name: 'Ana' }, db);
		const [token] = await invite([{ name: 'Ana', email: 'ana@crew.test' }]);
		await db.updateTable('invitation').set({ expires_at: new Date(Date.now() - 1000).toISOString() }).execute();
		expect(await acceptInvitation(token, ana.id, db)).toMatchObject({ ok: false, message: /expired/ });
	});

	it('invitations beyond the free seats, duplicates and unknown courses are refused row by row, and nothing is sent', async () => {
		await buy(2);
		const rows = rowsFromInput([
			{ name: 'A', email: 'a@crew.test', course: 'PR-100' },
			{ name: 'A again', email: 'A@crew.test', course: 'point-repair-installer' },
			{ name: 'B', email: 'b@crew.test', course: 'Nope' },
			{ name: 'C', email: 'c@crew.test', course: 'PR-100' },
			{ name: 'D', email: 'd@crew.test', course: 'PR-100' }
		]);
		const checked = await checkInvitations(companyId, rows, db);
		expect(checked.map((r) => r.errors[0] ?? null)).toEqual([null, 'Same person and course as line 1.', 'No course called "Nope".', null, expect.stringMatching(/Not enough free seats/)]);
		expect(await inviteCrew(adminId, companyId, rows, 'http://app.test', db)).toMatchObject({ ok: false });
		expect(await db.selectFrom('invitation').select('id').execute()).toHaveLength(0);
	});

	it('a seat is in use from the first paid lesson; an unused seat can be taken back and given again', async () => {
		await buy(1);
		const ana = await createUser({ email: 'ana@crew.test', name: 'Ana' }, db);
		const [token] = await invite([{ name: 'Ana', email: 'ana@crew.test' }]);
		await acceptInvitation(token, ana.id, db);
		const seat = (await db.selectFrom('seat').select('id').executeTakeFirstOrThrow()).id;
		expect(await takeBackSeat(adminId, companyId, seat, db)).toEqual({ ok: true });
		expect(await isEnrolled(ana.id, COURSE, db)).toBe(false);
		expect(await ledger()).toMatchObject({ assigned: 0, free: 1 });

		const ben = await createUser({ email: 'ben@crew.test', name: 'Ben' }, db);
		const [again] = await invite([{ name: 'Ben', email: 'ben@crew.test' }]);
		expect((await acceptInvitation(again, ben.id, db)).ok).toBe(true);
		expect(await markSeatInUse(ben.id, COURSE, db)).toBe(true);
		expect(await markSeatInUse(ben.id, COURSE, db)).toBe(false);
		expect(await ledger()).toMatchObject({ bought: 1, assigned: 1, inUse: 1, free: 0 });
		expect(await takeBackSeat(adminId, companyId, seat, db)).toMatchObject({ ok: false, message: /in use/ });
		expect((await listAudit({ subjectType: 'seat', subjectId: seat }, db)).map((a) => a.action)).toEqual(expect.arrayContaining(['seat.take-back', 'seat.assign', 'seat.in-use']));
	});
});

describe('refunds', () => {
	it('used seats cannot be refunded; a partial refund frees only unused seats; the webhook settles the ledger', async () => {
		const order = await buy(3);
		const [ana, ben] = await Promise.all([createUser({ email: 'ana@crew.test', name: 'Ana' }, db), createUser({ email: 'ben@crew.test', name: 'Ben' }, db)]);
		const tokens = await invite([{ name: 'Ana', email: 'ana@crew.test' }, { name: 'Ben', email: 'ben@crew.test' }]);
		await acceptInvitation(tokens[0], ana.id, db);
		await acceptInvitation(tokens[1], ben.id, db);
		await markSeatInUse(ana.id, COURSE, db);

		await expect(requestRefund(adminId, order.id, 'all', db)).rejects.toThrow(/in use/);
		await expect(requestRefund(adminId, order.id, 3, db)).rejects.toThrow(/Only 2 unused/);
		// Asking changes nothing until the service's charge.refunded event arrives.
		await requestRefund(adminId, order.id, 1, db);
		await harness.settled();
		let stored = await getOrder(order.id, db);
		expect(stored).toMatchObject({ state: 'partly refunded', refunded_quantity: 1, refunded_amount: 39000 });
		// The unassigned seat went first: both holders keep theirs.
		expect(await ledger()).toMatchObject({ bought: 2, assigned: 2, inUse: 1, free: 0 });
		expect(await isEnrolled(ben.id, COURSE, db)).toBe(true);

		await requestRefund(adminId, order.id, 1, db);
		await harness.settled();
		stored = await getOrder(order.id, db);
		expect(stored).toMatchObject({ state: 'partly refunded', refunded_quantity: 2, refunded_amount: 78000 });
		expect(await ledger()).toMatchObject({ bought: 1, assigned: 1, inUse: 1 });
		expect(await isEnrolled(ben.id, COURSE, db)).toBe(false);
		expect(await isEnrolled(ana.id, COURSE, db)).toBe(true);
		await expect(requestRefund(adminId, order.id, 1, db)).rejects.toThrow(/Only 0 unused/);
	});

	it('refund events delivered out of order and twice end in the same ledger', async () => {
		const order = await buy(4);
		harness.fake.setDelivery('reverse');
		await requestRefund(adminId, order.id, 1, db);
		await requestRefund(adminId, order.id, 1, db).catch(() => null);
		await harness.settled(8000);
		harness.fake.setDelivery('twice');
		await requestRefund(adminId, order.id, 'all', db).catch(() => null);
		await harness.settled();
		const stored = await getOrder(order.id, db);
		const amount = harness.fake.state.charges.find((c) => c.payment_intent === stored!.payment_intent_id)!.amount_refunded;
		expect(stored!.refunded_amount).toBe(amount);
		expect(stored!.refunded_quantity).toBe(amount / 39000);
		expect(await ledger()).toMatchObject({ bought: 4 - amount / 39000 });
	});

	it('a full refund of an order with no used seat refunds everything', async () => {
		const order = await buy(2);
		await requestRefund(adminId, order.id, 'all', db);
		await harness.settled();
		expect(await getOrder(order.id, db)).toMatchObject({ state: 'refunded', refunded_quantity: 2, refunded_amount: 78000 });
		expect(await ledger()).toMatchObject({ bought: 0, free: 0 });
		await expect(requestRefund(adminId, order.id, 1, db)).rejects.toThrow(/cannot be refunded/);
	});
});

describe('CSV roster', () => {
	const rows = (text: string) => parseRoster(text, courseRefs);

	it('reads a byte-order mark, semicolons, quoted commas and blank lines, with line numbers', () => {
		const text = '\uFEFFName;E-mail;Course\r\n\r\n"Okafor, Sam";sam@crew.test;PR-100\r\n\r\n"Venn; Priya";PRIYA@crew.test;point-repair-installer\r\n';
		const parsed = rows(text);
		expect(parsed.problems).toEqual([]);
		expect(parsed.rows.map((r) => [r.line, r.name, r.email, r.courseSlug, r.errors])).toEqual([
			[3, 'Okafor, Sam', 'sam@crew.test', COURSE, []],
			[5, 'Venn; Priya', 'priya@crew.test', COURSE, []]
		]);
	});

	it('reads commas, a quoted cell across lines, and reports each bad row with its line', () => {
		const text = 'name,email,course\n"Ade ""Big"" Kowal",ade@crew.test,PR-100\n"Two\nLines",two@crew.test,PR-100\nNo Mail,,PR-100\nBad,not-an-address,PR-100\nLost,lost@crew.test,Underwater welding\n';
		const parsed = rows(text);
		expect(parsed.rows.map((r) => [r.line, r.errors])).toEqual([
			[2, []],
			[3, ['Name contains control characters.']],
			[5, ['E-mail address is missing.']],
			[6, ['"not-an-address" is not an e-mail address.']],
			[7, ['No course called "Underwater welding".']]
		]);
		expect(parsed.rows[0].name).toBe('Ade "Big" Kowal');
	});

	it('keeps a formula-looking cell as text', () => {
		const formula = '=HYPERLINK("http://evil.test","Click")';
		const parsed = rows(`name,email,course\n"${formula.replace(/"/g, '""')}",f@crew.test,PR-100\n`);
		expect(parsed.rows[0].name).toBe(formula);
		expect(parsed.rows[0].errors).toEqual([]);
	});

	it('takes 5,000 rows and refuses 5,001', () => {
		const body = (n: number) => Array.from({ length: n }, (_, i) => `Person ${i},p${i}@crew.test,PR-100`).join('\n');
		const started = performance.now();
		const ok = rows(`name,email,course\n${body(5000)}\n`);
		expect(ok.problems).toEqual([]);
		expect(ok.rows).toHaveLength(5000);
		expect(ok.rows[4999].line).toBe(5001);
		expect(performance.now() - started).toBeLessThan(5000);
		expect(rows(`name,email,course\n${body(5001)}`).problems[0]).toMatch(/more than 5000/);
	});

	it('a file without a header is read as name, email, course; an empty file is refused', () => {
		expect(rows('Sam,sam@crew.test,PR-100').rows[0]).toMatchObject({ line: 1, name: 'Sam', courseSlug: COURSE });
		expect(rows('\n\n').problems).toEqual(['The file has no rows.']);
		expect(rows('email,course\nx@crew.test,PR-100').problems[0]).toMatch(/header/);
	});
});
