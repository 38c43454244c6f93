import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { courses } from '$lib/content';
import { boardCatalogue, boardQuery, cellState, cellSummary, cellText, daysBetween, readBoardQuery, viewBoard, validCertificates, type BoardRow, type BoardFilter } from '$lib/compliance/board';
import { companyBoard } from '$lib/server/compliance';
import { seedDemo } from '$lib/server/demo-seed';
import { createTestDb } from '../helpers/db';
import { useTemporaryDataDir } from '../helpers/certificates';
import { buildFixtureCompany, NOW, PR, PS, TODAY, type Fixture } from '../helpers/compliance-fixture';

const catalogue = boardCatalogue(courses);
const column = (slug: string) => catalogue.findIndex((c) => c.slug === slug);
const all: BoardFilter = { course: null, state: null, expiring: null, q: '', sort: 'name', dir: 'asc' };

describe('compliance board', () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	let fx: Fixture;
	let rows: BoardRow[];
	const row = (key: string) => rows.find((r) => r.id === fx.ids[key])!;
	const cell = (key: string, slug: string) => row(key).cells[column(slug)];

	beforeAll(async () => {
		useTemporaryDataDir();
		db = await createTestDb();
		fx = await buildFixtureCompany(db);
		rows = await companyBoard(fx.companyId, catalogue, { db, now: NOW });
	});
	afterAll(async () => db.destroy());

	it('lists every member of the company and nobody else, with a cell per course', () => {
		expect(rows.map((r) => r.id).sort()).toEqual(Object.entries(fx.ids).filter(([k]) => k !== 'zed').map(([, id]) => id).sort());
		for (const r of rows) expect(r.cells.map((c) => c.courseSlug)).toEqual(catalogue.map((c) => c.slug));
	});

	it('puts each person of the fixture in the state worked out by hand', () => {
		const pr = courses.find((c) => c.slug === PR)!;
		// expected words, worked out by hand from the fixture's dates (TODAY = 2026-12-02)
		expect(cellText(cell('admin', PR))).toEqual({ label: 'Not enrolled', detail: null });
		expect(cellText(cell('ben', PR))).toEqual({ label: 'Learning', detail: `3 of ${pr.lessons.length} lessons done` });
		expect(cellText(cell('cai', PR))).toEqual({ label: 'Test passed', detail: `skills signed off 0 of ${pr.practicalSkills.length}` });
		expect(cellText(cell('dee', PR))).toEqual({ label: `Skills signed off 5 of ${pr.practicalSkills.length}`, detail: 'test not passed yet' });
		expect(cellText(cell('eve', PR))).toEqual({ label: 'Certified until 1 June 2029', detail: fx.numbers.eve });
		expect(cellText(cell('fay', PS))).toEqual({ label: 'Expires in 20 days', detail: `22 December 2026 · ${fx.numbers.fay}` });
		expect(cellText(cell('fay', PR))).toEqual({ label: 'Learning', detail: `0 of ${pr.lessons.length} lessons done` });
		expect(cellText(cell('gil', PR))).toEqual({ label: 'Expires in 60 days', detail: `31 January 2027 · ${fx.numbers.gil}` });
		expect(cellText(cell('hana', PR))).toEqual({ label: 'Certified until 1 February 2027', detail: fx.numbers.hana });
		expect(cellText(cell('ivo', PR))).toEqual({ label: 'Expired 1 December 2026', detail: fx.numbers.ivo });
		expect(cellText(cell('jen', PR))).toEqual({ label: 'Revoked', detail: fx.numbers.jen });
		// replaced certificates never count: the replacement (or the latest issued) is the current one
		expect(cellText(cell('kai', PR)).detail).toBe(fx.numbers.kai);
		expect(cellText(cell('lou', PR))).toEqual({ label: 'Certified until 25 November 2029', detail: fx.numbers.lou });
		expect(cell('eve', PS).state).toBe('not-enrolled');
		const states = new Set(rows.flatMap((r) => r.cells.map((c) => c.state)));
		expect([...states].sort()).toEqual(['certified', 'expired', 'expiring', 'learning', 'not-enrolled', 'revoked', 'skills', 'test-passed']);
	});

	it('counts the cells of the shown courses', () => {
		const view = viewBoard(rows, catalogue, all);
		// certified: eve, fay (PS), gil, hana, kai, lou = 6; expiring within 60: fay, gil; expired: ivo; revoked: jen
		// in training: ben, cai, dee, fay (PR) = 4; not enrolled: 13 people x 3 courses = 39 cells - 12 enrolments
		expect(view.counts).toEqual({ certified: 6, expiring: 2, expiringWindow: 60, expired: 1, revoked: 1, inTraining: 4, notEnrolled: 39 - 12 });
		expect(viewBoard(rows, catalogue, { ...all, expiring: 90 }).counts).toMatchObject({ expiring: 3, expiringWindow: 90 });
		expect(viewBoard(rows, catalogue, { ...all, course: PS }).counts).toMatchObject({ certified: 1, expiring: 1, expired: 0, notEnrolled: 12 });
	});

	it('filters by course, state, expiry window and names', () => {
		const names = (f: Partial<BoardFilter>) => viewBoard(rows, catalogue, { ...all, ...f }).rows.map((r) => r.name);
		expect(names({ expiring: 30 })).toEqual(['Fay Expiring']);
		expect(names({ expiring: 60 })).toEqual(['Fay Expiring', 'Gil Edge']);
		expect(names({ expiring: 90 })).toEqual(['Fay Expiring', 'Gil Edge', 'Hana Later']);
		expect(names({ state: 'revoked' })).toEqual(['Jen Revoked']);
		expect(names({ state: 'learning' })).toEqual(['Ben Learner', 'Fay Expiring']);
		expect(names({ state: 'learning', course: PS })).toEqual([]);
		expect(names({ q: 'ivo, JEN' })).toEqual(['Ivo Expired', 'Jen Revoked']);
		expect(names({ q: 'eve@fixture' })).toEqual(['Eve Certified']);
		const ps = viewBoard(rows, catalogue, { ...all, course: PS });
		expect(ps.columns.map((c) => c.slug)).toEqual([PS]);
		expect(ps.rows.every((r) => r.cells.length === 1)).toBe(true);
	});

	it('sorts by name or by a course column, both ways', () => {
		const byName = viewBoard(rows, catalogue, all).rows.map((r) => r.name);
		expect(byName).toEqual([...byName].sort((a, b) => a.localeCompare(b, 'en', { sensitivity: 'base' })));
		expect(viewBoard(rows, catalogue, { ...all, dir: 'desc' }).rows.map((r) => r.name)).toEqual([...byName].reverse());
		const byPr = viewBoard(rows, catalogue, { ...all, sort: PR }).rows.map((r) => r.name);
		// expired, revoked, expiring (soonest first), certified (soonest expiry first: Kai 2029-02-01, Eve 2029-06-01, Lou 2029-11-25), skills, test passed, learning, not enrolled
		expect(byPr.slice(0, 9)).toEqual(['Ivo Expired', 'Jen Revoked', 'Gil Edge', 'Hana Later', 'Kai Corrected', 'Eve Certified', 'Lou Renewed', 'Dee Skilled', 'Cai Tested']);
		expect(viewBoard(rows, catalogue, { ...all, sort: PR, dir: 'desc' }).rows.at(-1)!.name).toBe('Ivo Expired');
	});

	it('lists the valid certificates of the shown rows for the crew list', () => {
		const view = viewBoard(rows, catalogue, { ...all, expiring: 60 });
		expect(validCertificates(view).map((c) => [c.name, c.number])).toEqual([
			['Fay Expiring', fx.numbers.fay],
			['Gil Edge', fx.numbers.gil]
		]);
	});
});

describe('board rules without a database', () => {
	it('counts days between UTC calendar days across a month and a leap day', () => {
		expect(daysBetween('2026-12-02', '2026-12-22')).toBe(20);
		expect(daysBetween('2028-02-28', '2028-03-01')).toBe(2);
		expect(daysBetween('2026-12-02', '2026-12-01')).toBe(-1);
	});

	it('takes the certificate first, then enrolment, sign-offs and the test', () => {
		const base = { courseSlug: PR, lessonsDone: 0, lessonsTotal: 14, testPassed: false, skillsDone: 0, skillsTotal: 17, certificate: null, enrolled: true };
		const cert = (daysLeft: number, revoked = false) => ({ number: 'X', expiresOn: TODAY, daysLeft, revoked });
		expect(cellState({ ...base, certificate: cert(0) })).toBe('expiring');
		expect(cellState({ ...base, certificate: cert(60) })).toBe('expiring');
		expect(cellState({ ...base, certificate: cert(61) })).toBe('certified');
		expect(cellState({ ...base, certificate: cert(-1) })).toBe('expired');
		expect(cellState({ ...base, certificate: cert(300, true) })).toBe('revoked');
		expect(cellState({ ...base, enrolled: false, certificate: cert(300) })).toBe('certified');
		expect(cellState({ ...base, enrolled: false, testPassed: true })).toBe('not-enrolled');
		expect(cellState({ ...base, testPassed: true, skillsDone: 1 })).toBe('skills');
		expect(cellState({ ...base, testPassed: true })).toBe('test-passed');
		expect(cellState(base)).toBe('learning');
		expect(cellSummary({ ...base, state: 'expiring', certificate: cert(1) })).toBe('Expires in 1 day (2 December 2026 · X)');
		expect(cellSummary({ ...base, state: 'expiring', certificate: cert(0) })).toBe('Expires today (2 December 2026 · X)');
	});

	it('reads filters from the address bar; a bad value falls back with a notice and never throws', () => {
		const catalogue = boardCatalogue(courses);
		const good = readBoardQuery(new URLSearchParams({ course: PS, state: 'expired', expiring: '60', q: ' nell ', sort: PR, dir: 'desc' }), catalogue);
		expect(good).toEqual({ filter: { course: PS, state: 'expired', expiring: 60, q: 'nell', sort: PR, dir: 'desc' }, notices: [] });
		const bad = readBoardQuery(new URLSearchParams({ course: '__proto__', state: 'constructor', expiring: '45', q: 'x'.repeat(300), sort: 'toString', dir: 'sideways' }), catalogue);
		expect(bad.filter).toEqual(all);
		expect(bad.notices).toHaveLength(6);
		expect(readBoardQuery(new URLSearchParams('course=all&state=&expiring=all'), catalogue)).toEqual({ filter: all, notices: [] });
		// and back: defaults left out, the rest round-trips
		expect(boardQuery(good.filter).toString()).toBe(`course=${PS}&state=expired&expiring=60&q=nell&sort=${PR}&dir=desc`);
		expect(readBoardQuery(boardQuery(good.filter), catalogue).filter).toEqual(good.filter);
		expect(boardQuery(all).toString()).toBe('');
	});
});

describe('the demo company', () => {
	it('shows every state on Brindlewick Drainage\'s board, two certificates expiring within 60 days and a third within 90', async () => {
		useTemporaryDataDir();
		const db = await createTestDb();
		try {
			await seedDemo(db);
			const company = await db.selectFrom('company').select('id').where('name', '=', 'Brindlewick Drainage').executeTakeFirstOrThrow();
			const rows = await companyBoard(company.id, catalogue, { db });
			const states = new Set(rows.flatMap((r) => r.cells.map((c) => c.state)));
			expect([...states].sort()).toEqual(['certified', 'expired', 'expiring', 'learning', 'not-enrolled', 'revoked', 'skills', 'test-passed']);
			const names = (expiring: 30 | 60 | 90) => viewBoard(rows, catalogue, { ...all, expiring }).rows.map((r) => r.name);
			expect(names(60)).toEqual(['Mae Ridley', 'Owen Tarrant']);
			expect(names(90)).toEqual(['Mae Ridley', 'Owen Tarrant', 'Tom Quarrie']);
		} finally {
			await db.destroy();
		}
	});
});
