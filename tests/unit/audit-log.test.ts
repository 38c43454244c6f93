import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { csvSafe, describeAudit, type AuditView } from '$lib/audit-words';
import { recordAudit, searchAudit } from '$lib/server/audit';
import { readAuditQuery } from '$lib/server/audit-filter';
import { enrol } from '$lib/server/enrolments';
import { grantRole } from '$lib/server/roles';
import { createUser } from '$lib/server/users';
import { createTestDb } from '../helpers/db';

type TestDb = Awaited<ReturnType<typeof createTestDb>>;

describe('the audit log in words', () => {
	let db: TestDb;
	beforeEach(async () => (db = await createTestDb()));
	afterEach(async () => db.destroy());

	it('says who did what to whom, by name, and filters by person, action and date', async () => {
		const reg = await createUser({ email: 'reg@example.test', name: 'Rene Registrar' }, db);
		const pat = await createUser({ email: 'pat@example.test', name: 'Pat Pipefitter' }, db);
		const kim = await createUser({ email: 'kim@example.test', name: 'Kim' }, db);
		await grantRole(reg.id, pat.id, 'inspector', db);
		await enrol(reg.id, kim.id, 'transition-patches', 'registrar', db);

		const all = await searchAudit({}, db);
		const words = all.entries.map((e) => describeAudit(e, { 'transition-patches': 'Transition patches' }));
		expect(words).toEqual([
			'Rene Registrar (reg@example.test) enrolled Kim (kim@example.test) in Transition patches.',
			'Rene Registrar (reg@example.test) granted the inspector role to Pat Pipefitter (pat@example.test).'
		]);
		expect((await searchAudit({ person: 'pipefitter' }, db)).entries.map((e) => e.action)).toEqual(['role.grant']);
		// The registrar did both: a person filter matches the one who acted too.
		expect((await searchAudit({ person: 'reg@' }, db)).entries).toHaveLength(2);
		expect((await searchAudit({ action: 'enrolment.create' }, db)).entries.map((e) => e.subject)).toEqual(['Kim (kim@example.test)']);
		expect((await searchAudit({ person: '%' }, db)).entries).toHaveLength(0);
		const today = new Date().toISOString().slice(0, 10);
		expect((await searchAudit({ from: today, to: today }, db)).entries).toHaveLength(2);
		expect((await searchAudit({ to: '2000-01-01' }, db)).entries).toHaveLength(0);
	});

	it('pages beyond the newest entries by id', async () => {
		for (let i = 0; i < 7; i++) await recordAudit({ actorId: null, action: 'company.create', subjectType: 'company', subjectId: `c${i}`, detail: { name: `Co ${i}` } }, db);
		const first = await searchAudit({ limit: 3 }, db);
		expect(first.entries.map((e) => e.detail.name)).toEqual(['Co 6', 'Co 5', 'Co 4']);
		const second = await searchAudit({ limit: 3, before: first.older! }, db);
		expect(second.entries.map((e) => e.detail.name)).toEqual(['Co 3', 'Co 2', 'Co 1']);
		const third = await searchAudit({ limit: 3, before: second.older! }, db);
		expect(third).toMatchObject({ older: null });
		expect(third.entries.map((e) => describeAudit(e))).toEqual(['The system created the company Co 0.']);
	});

	it('reads unknown actions and missing people as sentences, never raw JSON', () => {
		const base: AuditView = { id: 1, at: '2026-01-01T00:00:00Z', action: 'seat.move', subjectType: 'seat', subjectId: 's1', detail: { x: 1 }, actor: 'Jo (jo@x.test)', subject: null };
		expect(describeAudit(base)).toBe('Jo (jo@x.test): seat move (a seat).');
		expect(describeAudit({ ...base, action: 'test.wait-waived', detail: { courseSlug: 'c', reason: 'Ill on the day' }, subject: 'Sam' }, { c: 'Course C' })).toBe(
			'Jo (jo@x.test) let Sam retake the Course C course test before the wait ended. Reason: Ill on the day.'
		);
	});

	it('reads filters from the address without a 500 for nonsense', () => {
		const q = readAuditQuery(new URL('http://x/registrar/audit?person=pat&action=role.grant&from=2026-13-45&before=abc&to=2026-02-01'));
		expect(q.filter).toEqual({ person: 'pat', action: 'role.grant', to: '2026-02-01' });
		expect(Object.keys(q.errors).sort()).toEqual(['before', 'from']);
	});

	it('keeps a spreadsheet from running a cell as a formula (OWASP CSV injection advice)', () => {
		expect(csvSafe('=HYPERLINK("x")')).toBe(`'=HYPERLINK("x")`);
		expect(csvSafe('-5')).toBe(`'-5`);
		expect(csvSafe('Pat')).toBe('Pat');
		// Round trip through papaparse: commas and quotes survive.
		const csv = Papa.unparse([['a, "b"', csvSafe('@c')]]);
		expect(Papa.parse<string[]>(csv).data[0]).toEqual(['a, "b"', "'@c"]);
	});
});
