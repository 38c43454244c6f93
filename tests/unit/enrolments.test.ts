import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { listAudit } from '$lib/server/audit';
import { enrol, enrolmentsByUser, isEnrolled, listEnrolments } from '$lib/server/enrolments';
import { seedDemo } from '$lib/server/demo-seed';
import { findUserByEmail, createUser } from '$lib/server/users';
import { createTestDb } from '../helpers/db';

describe('enrolments', () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	beforeEach(async () => (db = await createTestDb()));
	afterEach(async () => db.destroy());

	it('enrol once, audit once', async () => {
		const u = await createUser({ email: 'e@example.test', name: 'E' }, db);
		expect(await isEnrolled(u.id, 'transition-patches', db)).toBe(false);
		await enrol(null, u.id, 'transition-patches', 'registrar', db);
		await enrol(null, u.id, 'transition-patches', 'registrar', db);
		expect(await isEnrolled(u.id, 'transition-patches', db)).toBe(true);
		expect(await listEnrolments(u.id, db)).toHaveLength(1);
		const other = await createUser({ email: 'o@example.test', name: 'O' }, db);
		const byUser = await enrolmentsByUser([u.id, other.id], db);
		expect(byUser.get(u.id)).toEqual(['transition-patches']);
		expect(byUser.get(other.id)).toEqual([]);
		expect((await listAudit({ subjectId: u.id }, db)).filter((e) => e.action === 'enrolment.create')).toHaveLength(1);
	});

	it('seed the demo scenario once, with trainees enrolled', async () => {
		expect(await seedDemo(db)).toBe(true);
		expect(await seedDemo(db)).toBe(false);
		const sam = await findUserByEmail('sam@brindlewick.test', db);
		expect(await isEnrolled(sam!.id, 'point-repair-installer', db)).toBe(true);
		expect(await isEnrolled(sam!.id, 'transition-patches', db)).toBe(false);
	});
});
