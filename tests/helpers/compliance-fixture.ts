import { getCourse } from '$lib/content';
import { addMonths, issueIfEarned, reissueWithName, revokeCertificate } from '$lib/server/certificates';
import { addMember, createCompany } from '$lib/server/companies';
import type { DB } from '$lib/server/db';
import { recordPassedTest, recordSignOffs } from '$lib/server/demo-certificates';
import { enrol } from '$lib/server/enrolments';
import { setLessonDone } from '$lib/server/progress';
import { createUser } from '$lib/server/users';

/**
 * A hand-built company with every board state, as of TODAY (2026-12-02 UTC), for the board,
 * CSV and crew-list tests. Each person's expected cell for PR-100 (and PS-150 where set) is
 * written beside them, worked out by hand from the rules in `$lib/compliance/board`.
 */
export const TODAY = '2026-12-02';
export const NOW = new Date(`${TODAY}T12:00:00Z`);
export const PR = 'point-repair-installer';
export const PS = 'packer-pressure-safety';

const at = (iso: string) => new Date(`${iso}T09:00:00Z`);
const plusDays = (iso: string, days: number) => new Date(Date.parse(`${iso}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);

export interface Fixture {
	companyId: string;
	otherCompanyId: string;
	ids: Record<string, string>;
	numbers: Record<string, string>;
}

export async function buildFixtureCompany(db: DB): Promise<Fixture> {
	const company = await createCompany(null, 'Fixture Drainage', db);
	const other = await createCompany(null, 'Other Pipe Co', db);
	const trainerUser = await createUser({ email: 'trainer@fixture.test', name: 'Tess Trainer' }, db);
	const registrar = await createUser({ email: 'registrar@fixture.test', name: 'Rory Registrar' }, db);
	const trainer = { id: trainerUser.id, name: 'Tess Trainer' };
	const ids: Record<string, string> = {};
	const numbers: Record<string, string> = {};
	const person = async (key: string, name: string, companyId = company.id, role: 'admin' | 'member' = 'member') => {
		const user = await createUser({ email: `${key}@fixture.test`, name }, db);
		await addMember(null, companyId, user.id, role, db);
		ids[key] = user.id;
		return user.id;
	};
	const certify = async (userId: string, course: string, issuedOn: string) => {
		await recordPassedTest(userId, course, at(plusDays(issuedOn, -10)), db);
		await recordSignOffs(userId, course, trainer, at(issuedOn), db);
		const outcome = await issueIfEarned(userId, course, { db, now: at(issuedOn) });
		if (!outcome.issued) throw new Error(`fixture certificate not issued for ${userId} in ${course}`);
		return outcome.certificate;
	};
	const pr = getCourse(PR)!;
	const ps = getCourse(PS)!;

	// the admin: in no course -> "Not enrolled" everywhere
	await person('admin', 'Abe Admin', company.id, 'admin');
	// learning: 3 of PR's lessons marked done, plus a row for a lesson no longer in the course (ignored)
	const ben = await person('ben', 'Ben Learner');
	await enrol(null, ben, PR, 'registrar', db);
	for (const lesson of pr.lessons.slice(0, 3)) await setLessonDone(ben, PR, lesson.slug, true, db);
	await db.insertInto('lesson_progress').values({ user_id: ben, course_slug: PR, lesson_slug: 'a-lesson-since-removed', completed_at: at('2026-01-01').toISOString() }).execute();
	// test passed, no sign-off yet
	const cai = await person('cai', 'Cai Tested');
	await enrol(null, cai, PR, 'registrar', db);
	await recordPassedTest(cai, PR, at('2026-11-20'), db);
	// 5 skills signed off, test not passed; a sixth sign-off voided (not counted)
	const dee = await person('dee', 'Dee Skilled');
	await enrol(null, dee, PR, 'registrar', db);
	await recordSignOffs(dee, PR, trainer, at('2026-11-01'), db, pr.practicalSkills.slice(0, 6).map((s) => s.id));
	await db.updateTable('sign_off').set({ voided_at: at('2026-11-02').toISOString(), voided_by: registrar.id, void_reason: 'Recorded against the wrong skill.' }).where('user_id', '=', dee).where('skill_id', '=', pr.practicalSkills[5].id).execute();
	// certified: PR issued 2026-06-01, 36 months -> until 2029-06-01
	const eve = await person('eve', 'Eve Certified');
	await enrol(null, eve, PR, 'registrar', db);
	numbers.eve = (await certify(eve, PR, '2026-06-01')).number;
	// expiring: PS (24 months) expires TODAY + 20 days; also learning PR with nothing done
	const fay = await person('fay', 'Fay Expiring');
	await enrol(null, fay, PS, 'registrar', db);
	await enrol(null, fay, PR, 'registrar', db);
	numbers.fay = (await certify(fay, PS, addMonths(plusDays(TODAY, 20), -ps.validityMonths))).number;
	// expiring on the window's edge: PR expires TODAY + 60 days (still "expires in 60 days")
	const gil = await person('gil', 'Gil Edge');
	await enrol(null, gil, PR, 'registrar', db);
	numbers.gil = (await certify(gil, PR, addMonths(plusDays(TODAY, 60), -pr.validityMonths))).number;
	// one day past the window: PR expires TODAY + 61 days -> "Certified until"
	const hana = await person('hana', 'Hana Later');
	await enrol(null, hana, PR, 'registrar', db);
	numbers.hana = (await certify(hana, PR, addMonths(plusDays(TODAY, 61), -pr.validityMonths))).number;
	// expired yesterday
	const ivo = await person('ivo', 'Ivo Expired');
	await enrol(null, ivo, PR, 'registrar', db);
	numbers.ivo = (await certify(ivo, PR, addMonths(plusDays(TODAY, -1), -pr.validityMonths))).number;
	// revoked
	const jen = await person('jen', 'Jen Revoked');
	await enrol(null, jen, PR, 'registrar', db);
	const revoked = await certify(jen, PR, '2026-03-01');
	numbers.jen = revoked.number;
	await revokeCertificate(registrar.id, revoked.number, 'issued-in-error', 'fixture', { db, now: at('2026-04-01') });
	// replaced after a name correction: the replacement is the current certificate
	const kai = await person('kai', 'Kai Renamed');
	await enrol(null, kai, PR, 'registrar', db);
	const first = await certify(kai, PR, '2026-02-01');
	numbers.kaiOld = first.number;
	const fresh = await reissueWithName(registrar.id, first.number, 'Kai Corrected', { db, now: at('2026-02-10') });
	if (!fresh.ok) throw new Error('fixture reissue failed');
	numbers.kai = fresh.certificate.number;
	// a certificate another process leaves beside an older one (as a renewal may): the latest issued wins
	const lou = await person('lou', 'Lou Renewed');
	await enrol(null, lou, PR, 'registrar', db);
	const older = await certify(lou, PR, addMonths(plusDays(TODAY, -5), -pr.validityMonths));
	numbers.louOld = older.number;
	const newer = { ...older, id: crypto.randomUUID(), number: 'ZZZZ-ZZZZ-ZZZZ-ZZZ1', slot: null, issued_at: at('2026-11-25').toISOString(), issued_on: '2026-11-25', expires_on: '2029-11-25', replaces_id: older.id };
	await db.insertInto('certificate').values(newer).execute();
	numbers.lou = newer.number;
	// a formula-looking name (CSV neutralising)
	await person('eq', '=HYPERLINK("http://x.test")');

	// someone of another company: never on this board
	const zed = await person('zed', 'Zed Elsewhere', other.id);
	await enrol(null, zed, PR, 'registrar', db);
	numbers.zed = (await certify(zed, PR, '2026-05-01')).number;

	return { companyId: company.id, otherCompanyId: other.id, ids, numbers };
}
