import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { isRedirect, isHttpError } from '@sveltejs/kit';
import { hasRole, isCompanyAdmin } from '$lib/roles';
import { navigationFor } from '$lib/navigation';
import { requireCompanyAdmin, requireRole, requireUser } from '$lib/server/authz';
import { addMember, createCompany } from '$lib/server/companies';
import { grantRole, loadIdentity, revokeRole, rolesByUser } from '$lib/server/roles';
import { listAudit } from '$lib/server/audit';
import { checkPassword, createUser, EmailTakenError } from '$lib/server/users';
import { createTestDb } from '../helpers/db';

type TestDb = Awaited<ReturnType<typeof createTestDb>>;

function eventFor(user: Awaited<ReturnType<typeof loadIdentity>>, path = '/somewhere') {
	return { locals: { user }, url: new URL(`http://localhost${path}`) } as never;
}

function thrown(fn: () => unknown): unknown {
	try {
		fn();
	} catch (e) {
		return e;
	}
	return undefined;
}

describe('people, roles and companies', () => {
	let db: TestDb;
	beforeEach(async () => (db = await createTestDb()));
	afterEach(async () => db.destroy());

	it('make everyone a trainee and add granted roles, recording each change once', async () => {
		const u = await createUser({ email: ' Pat@Example.TEST ', name: 'Pat', password: 'long enough password' }, db);
		const actor = (await createUser({ email: 'registrar@example.test', name: 'Reg' }, db)).id;
		expect(u.email).toBe('pat@example.test');
		expect((await loadIdentity(u.id, db))!.roles).toEqual(['trainee']);
		await grantRole(actor, u.id, 'inspector', db);
		await grantRole(actor, u.id, 'inspector', db);
		await grantRole(actor, u.id, 'trainer', db);
		expect((await loadIdentity(u.id, db))!.roles).toEqual(['trainee', 'trainer', 'inspector']);
		await revokeRole(actor, u.id, 'inspector', db);
		expect((await loadIdentity(u.id, db))!.roles).toEqual(['trainee', 'trainer']);
		const actions = (await listAudit({ subjectId: u.id }, db)).map((e) => e.action);
		expect(actions.sort()).toEqual(['role.grant', 'role.grant', 'role.revoke']);
	});

	it('list the roles of many people in one go, in the same order as one identity', async () => {
		const a = await createUser({ email: 'a1@example.test', name: 'A' }, db);
		const b = await createUser({ email: 'b1@example.test', name: 'B' }, db);
		await grantRole(null, a.id, 'registrar', db);
		await grantRole(null, a.id, 'trainer', db);
		const roles = await rolesByUser([a.id, b.id], db);
		expect(roles.get(a.id)).toEqual((await loadIdentity(a.id, db))!.roles);
		expect(roles.get(a.id)).toEqual(['trainee', 'trainer', 'registrar']);
		expect(roles.get(b.id)).toEqual(['trainee']);
		expect((await rolesByUser([], db)).size).toBe(0);
	});

	it('refuse a second account for the same address and check passwords', async () => {
		await createUser({ email: 'a@example.test', name: 'A', password: 'correct horse battery', emailVerified: true }, db);
		await expect(createUser({ email: 'A@example.test', name: 'B' }, db)).rejects.toBeInstanceOf(EmailTakenError);
		expect(await checkPassword('a@example.test', 'correct horse battery', db)).toMatchObject({ outcome: 'ok', user: { email: 'a@example.test' } });
		expect(await checkPassword('a@example.test', 'wrong', db)).toEqual({ outcome: 'wrong' });
		expect(await checkPassword('nobody@example.test', 'wrong', db)).toEqual({ outcome: 'wrong' });
	});

	it('load company memberships into the identity', async () => {
		const admin = await createUser({ email: 'boss@example.test', name: 'Boss' }, db);
		const company = await createCompany(null, 'Example Drainage', db);
		await addMember(null, company.id, admin.id, 'admin', db);
		const identity = await loadIdentity(admin.id, db);
		expect(identity!.companies).toEqual([{ id: company.id, name: 'Example Drainage', role: 'admin' }]);
		expect(isCompanyAdmin(identity, company.id)).toBe(true);
		expect(isCompanyAdmin(identity, 'other')).toBe(false);
	});

	it('guard pages and API routes', async () => {
		const u = await createUser({ email: 't@example.test', name: 'T' }, db);
		const trainee = await loadIdentity(u.id, db);

		const anonymousPage = thrown(() => requireUser(eventFor(null, '/dashboard')));
		expect(isRedirect(anonymousPage) && anonymousPage.location).toBe('/sign-in?next=%2Fdashboard');
		const anonymousApi = thrown(() => requireUser(eventFor(null, '/api/v1/me')));
		expect(isHttpError(anonymousApi) && anonymousApi.status).toBe(401);

		const forbidden = thrown(() => requireRole(eventFor(trainee), 'registrar'));
		expect(isHttpError(forbidden) && forbidden.status).toBe(403);
		expect(requireRole(eventFor(trainee), 'trainee').id).toBe(u.id);
		const notAdmin = thrown(() => requireCompanyAdmin(eventFor(trainee)));
		expect(isHttpError(notAdmin) && notAdmin.status).toBe(403);
		expect(hasRole(trainee, 'trainer')).toBe(false);
	});

	it('build the navigation from the roles held', async () => {
		expect(navigationFor(null).map((l) => l.href)).toEqual(['/courses', '/tools', '/verify']);
		const u = await createUser({ email: 'r@example.test', name: 'R' }, db);
		await grantRole(null, u.id, 'registrar', db);
		const hrefs = navigationFor(await loadIdentity(u.id, db)).map((l) => l.href);
		expect(hrefs).toContain('/registrar');
		expect(hrefs).not.toContain('/trainer');
	});
});
