import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Identity } from '$lib/roles';
import { addMember } from '$lib/server/companies';
import { crewRecord, mayOpenCrewRecords, mayViewCrewRecord } from '$lib/server/crew-record';
import { grantRole, setTrainerScope } from '$lib/server/roles';
import { createUser } from '$lib/server/users';
import { createTestDb } from '../helpers/db';
import { useTemporaryDataDir } from '../helpers/certificates';
import { buildFixtureCompany, NOW, PR, type Fixture } from '../helpers/compliance-fixture';

describe("a crew member's record", () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	let fx: Fixture;
	const viewer = (id: string, roles: Identity['roles'], companies: Identity['companies'] = []): Identity => ({ id, email: `${id}@x.test`, name: null, roles, companies });

	beforeAll(async () => {
		useTemporaryDataDir();
		db = await createTestDb();
		fx = await buildFixtureCompany(db);
	});
	afterAll(async () => db.destroy());

	it('opens for an admin of the person’s company and for trainers in scope; for nobody else', async () => {
		const admin = viewer(fx.ids.admin, ['trainee'], [{ id: fx.companyId, name: 'Fixture Drainage', role: 'admin' }]);
		expect(await mayViewCrewRecord(admin, fx.ids.eve, db)).toEqual({ ok: true, asAdmin: true });
		// an admin of the other company: not found
		const otherAdmin = await createUser({ email: 'boss@other.test', name: 'Other Boss' }, db);
		await addMember(null, fx.otherCompanyId, otherAdmin.id, 'admin', db);
		const other = viewer(otherAdmin.id, ['trainee'], [{ id: fx.otherCompanyId, name: 'Other Pipe Co', role: 'admin' }]);
		expect(await mayViewCrewRecord(other, fx.ids.eve, db)).toEqual({ ok: false, asAdmin: false });
		expect(await mayViewCrewRecord(other, fx.ids.zed, db)).toEqual({ ok: true, asAdmin: true });
		// a trainer of the other company only: not found; the provider's trainer: everyone
		const scoped = await createUser({ email: 'scoped@other.test', name: 'Scoped Trainer' }, db);
		await grantRole(null, scoped.id, 'trainer', db);
		await setTrainerScope(null, scoped.id, fx.otherCompanyId, db);
		expect((await mayViewCrewRecord(viewer(scoped.id, ['trainee', 'trainer']), fx.ids.eve, db)).ok).toBe(false);
		expect((await mayViewCrewRecord(viewer(scoped.id, ['trainee', 'trainer']), fx.ids.zed, db)).ok).toBe(true);
		const provider = await createUser({ email: 'provider@fixture.test', name: 'Provider Trainer' }, db);
		await grantRole(null, provider.id, 'trainer', db);
		expect(await mayViewCrewRecord(viewer(provider.id, ['trainee', 'trainer']), fx.ids.eve, db)).toEqual({ ok: true, asAdmin: false });
		// a trainee or an inspector does not reach the question at all
		expect(mayOpenCrewRecords(viewer(fx.ids.ben, ['trainee'], [{ id: fx.companyId, name: 'Fixture Drainage', role: 'member' }]))).toBe(false);
		expect(mayOpenCrewRecords(viewer('i', ['trainee', 'inspector']))).toBe(false);
		expect(mayOpenCrewRecords(admin)).toBe(true);
	});

	it('lists lessons, attempt scores (no answers), sign-offs and every certificate, replaced ones included', async () => {
		const ben = (await crewRecord(fx.ids.ben, { db, now: NOW }))!;
		const pr = ben.courses.find((c) => c.slug === PR)!;
		expect(pr.lessons.filter((l) => l.doneAt).length).toBe(3);
		const dee = (await crewRecord(fx.ids.dee, { db, now: NOW }))!.courses.find((c) => c.slug === PR)!;
		expect(dee.signOffs).toHaveLength(6);
		expect(dee.signOffs.filter((s) => s.voidedAt)).toHaveLength(1);
		const eve = (await crewRecord(fx.ids.eve, { db, now: NOW }))!.courses.find((c) => c.slug === PR)!;
		expect(eve.attempts).toHaveLength(1);
		expect(Object.keys(eve.attempts[0]).sort()).toEqual(['closedBy', 'correctCount', 'id', 'itemCount', 'passMark', 'passed', 'scorePercent', 'startedAt', 'submittedAt']);
		expect(eve.attempts[0]).toMatchObject({ scorePercent: 90, passed: true });
		const kai = (await crewRecord(fx.ids.kai, { db, now: NOW }))!.courses.find((c) => c.slug === PR)!;
		expect(kai.certificates.map((c) => [c.number, c.status]).sort()).toEqual([[fx.numbers.kai, 'valid'], [fx.numbers.kaiOld, 'replaced']].sort());
		expect(await crewRecord('00000000-0000-4000-8000-000000000000', { db })).toBeNull();
	});
});
