import { z } from 'zod';
import { longDate } from '../certificates/status';

/**
 * The compliance board: crew member x course, each cell saying where the person stands.
 * Pure: the rows the server reads go in, cells, filters, sorting and counts come out, so the
 * same rules serve the page, the CSV and the crew-list PDF, and can be tested without a database.
 * Dates are UTC calendar days (YYYY-MM-DD); `today` is passed in.
 */

/** What the board needs of a course (built from the content catalogue). */
export interface BoardCourse {
	slug: string;
	code: string;
	title: string;
	lessons: string[];
	skills: string[];
}

/** A course as the content catalogue has it (only the parts the board reads). */
interface CatalogueCourse {
	slug: string;
	code: string;
	title: string;
	lessons: { slug: string }[];
	practicalSkills: { id: string }[];
}

export function boardCatalogue(courses: readonly CatalogueCourse[]): BoardCourse[] {
	return courses.map((c) => ({ slug: c.slug, code: c.code, title: c.title, lessons: c.lessons.map((l) => l.slug), skills: c.practicalSkills.map((s) => s.id) }));
}

/** The rows read for one company, a handful of queries' worth (see `$lib/server/compliance`). */
export interface BoardFacts {
	people: { id: string; name: string | null; email: string; role: 'admin' | 'member' }[];
	enrolments: { userId: string; courseSlug: string }[];
	/** Lessons of the course marked done (only lessons still in the course). */
	lessonsDone: { userId: string; courseSlug: string; done: number }[];
	/** The latest passed attempt per person and course. */
	testsPassed: { userId: string; courseSlug: string; passedAt: string }[];
	/** Current (not voided) sign-offs of skills still in the course. */
	signOffs: { userId: string; courseSlug: string; signedOff: number }[];
	/** Certificates that were not replaced; a person may still have more than one per course. */
	certificates: { id: string; number: string; userId: string; courseSlug: string; issuedAt: string; expiresOn: string; revokedAt: string | null }[];
}

export const cellStates = ['not-enrolled', 'learning', 'test-passed', 'skills', 'certified', 'expiring', 'expired', 'revoked'] as const;
export type CellState = (typeof cellStates)[number];

export const stateLabels: Record<CellState, string> = {
	'not-enrolled': 'Not enrolled',
	learning: 'Learning',
	'test-passed': 'Test passed',
	skills: 'Skills signed off',
	certified: 'Certified',
	expiring: 'Expiring',
	expired: 'Expired',
	revoked: 'Revoked'
};

/** A valid certificate this close to its expiry (days, inclusive) is shown as "expires in N days". */
export const EXPIRING_DAYS = 60;
export const expiryWindows = [30, 60, 90] as const;

export interface Cell {
	courseSlug: string;
	state: CellState;
	lessonsDone: number;
	lessonsTotal: number;
	testPassed: boolean;
	skillsDone: number;
	skillsTotal: number;
	/** The current certificate (the latest issued that was not replaced), whatever its state. */
	certificate: { number: string; expiresOn: string; daysLeft: number; revoked: boolean } | null;
}

export interface BoardRow {
	id: string;
	name: string;
	email: string;
	role: 'admin' | 'member';
	/** One per course, in catalogue order. */
	cells: Cell[];
}

const dayMs = 86_400_000;
/** Whole days from `from` to `to` (both YYYY-MM-DD, UTC); negative when `to` is earlier. */
export function daysBetween(from: string, to: string): number {
	return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / dayMs);
}

/** Where one person stands in one course. */
export function cellState(input: Omit<Cell, 'state'> & { enrolled: boolean }): CellState {
	const cert = input.certificate;
	if (cert) {
		if (cert.revoked) return 'revoked';
		if (cert.daysLeft < 0) return 'expired';
		return cert.daysLeft <= EXPIRING_DAYS ? 'expiring' : 'certified';
	}
	if (!input.enrolled) return 'not-enrolled';
	if (input.skillsDone > 0) return 'skills';
	if (input.testPassed) return 'test-passed';
	return 'learning';
}

/**
 * Turns the rows read for a company into the board: a row per person, a cell per course.
 * Facts are placed in flat arrays by (person, course) position instead of being looked up by
 * string keys, which keeps a 1,000-person board well inside its time budget.
 */
export function buildBoard(facts: BoardFacts, catalogue: readonly BoardCourse[], today: string): BoardRow[] {
	const width = catalogue.length;
	const personAt = new Map(facts.people.map((p, i) => [p.id, i]));
	const courseAt = new Map(catalogue.map((c, j) => [c.slug, j]));
	const size = facts.people.length * width;
	const slot = (userId: string, courseSlug: string) => {
		const i = personAt.get(userId);
		const j = courseAt.get(courseSlug);
		return i === undefined || j === undefined ? -1 : i * width + j;
	};
	const enrolled = new Uint8Array(size);
	const passed = new Uint8Array(size);
	const lessons = new Uint16Array(size);
	const skills = new Uint16Array(size);
	const certificates: (BoardFacts['certificates'][number] | undefined)[] = new Array(size);
	for (const e of facts.enrolments) {
		const at = slot(e.userId, e.courseSlug);
		if (at >= 0) enrolled[at] = 1;
	}
	for (const t of facts.testsPassed) {
		const at = slot(t.userId, t.courseSlug);
		if (at >= 0) passed[at] = 1;
	}
	for (const l of facts.lessonsDone) {
		const at = slot(l.userId, l.courseSlug);
		if (at >= 0) lessons[at] = Math.min(l.done, 65_535);
	}
	for (const k of facts.signOffs) {
		const at = slot(k.userId, k.courseSlug);
		if (at >= 0) skills[at] = Math.min(k.signedOff, 65_535);
	}
	for (const c of facts.certificates) {
		const at = slot(c.userId, c.courseSlug);
		if (at < 0) continue;
		const held = certificates[at];
		if (!held || c.issuedAt > held.issuedAt) certificates[at] = c;
	}
	const todayMs = Date.parse(`${today}T00:00:00Z`);
	return facts.people.map((p, i) => ({
		id: p.id,
		name: p.name?.trim() || p.email,
		email: p.email,
		role: p.role,
		cells: catalogue.map((course, j) => {
			const at = i * width + j;
			const cert = certificates[at];
			const cell: Cell = {
				courseSlug: course.slug,
				state: 'learning',
				lessonsDone: Math.min(course.lessons.length, lessons[at]),
				lessonsTotal: course.lessons.length,
				testPassed: passed[at] === 1,
				skillsDone: Math.min(course.skills.length, skills[at]),
				skillsTotal: course.skills.length,
				certificate: cert
					? { number: cert.number, expiresOn: cert.expiresOn, daysLeft: Math.round((Date.parse(`${cert.expiresOn}T00:00:00Z`) - todayMs) / dayMs), revoked: !!cert.revokedAt }
					: null
			};
			cell.state = cellState({ ...cell, enrolled: enrolled[at] === 1 });
			return cell;
		})
	}));
}

/** A cell in words: a short label and, where there is one, the detail beside it. */
export function cellText(cell: Cell): { label: string; detail: string | null } {
	const cert = cell.certificate;
	switch (cell.state) {
		case 'not-enrolled':
			return { label: 'Not enrolled', detail: null };
		case 'learning':
			return { label: 'Learning', detail: `${cell.lessonsDone} of ${cell.lessonsTotal} lessons done` };
		case 'test-passed':
			return { label: 'Test passed', detail: `skills signed off 0 of ${cell.skillsTotal}` };
		case 'skills':
			return { label: `Skills signed off ${cell.skillsDone} of ${cell.skillsTotal}`, detail: cell.testPassed ? 'test passed' : 'test not passed yet' };
		case 'certified':
			return { label: `Certified until ${longDate(cert!.expiresOn)}`, detail: cert!.number };
		case 'expiring':
			return {
				label: cert!.daysLeft === 0 ? 'Expires today' : `Expires in ${cert!.daysLeft} ${cert!.daysLeft === 1 ? 'day' : 'days'}`,
				detail: `${longDate(cert!.expiresOn)} · ${cert!.number}`
			};
		case 'expired':
			return { label: `Expired ${longDate(cert!.expiresOn)}`, detail: cert!.number };
		case 'revoked':
			return { label: 'Revoked', detail: cert!.number };
	}
}

/** The cell as one line of text (the CSV writes exactly this). */
export function cellSummary(cell: Cell): string {
	const { label, detail } = cellText(cell);
	return detail ? `${label} (${detail})` : label;
}

/** A valid certificate that expires within `days` days from today (today counted). */
export function expiresWithin(cell: Cell, days: number): boolean {
	const cert = cell.certificate;
	return !!cert && !cert.revoked && cert.daysLeft >= 0 && cert.daysLeft <= days;
}

export const isValidCell = (cell: Cell) => cell.state === 'certified' || cell.state === 'expiring';

// ---------------------------------------------------------------- filters from the address bar

export interface BoardFilter {
	course: string | null;
	state: CellState | null;
	expiring: (typeof expiryWindows)[number] | null;
	/** Names or e-mail fragments, any of which matches (commas separate several). */
	q: string;
	sort: string;
	dir: 'asc' | 'desc';
}

export const boardKeys = ['course', 'state', 'expiring', 'q', 'sort', 'dir'] as const;

const fieldSchemas = (catalogue: readonly BoardCourse[]) => ({
	course: z.string().refine((s) => catalogue.some((c) => c.slug === s), 'There is no such course; all courses are shown.'),
	state: z.enum(cellStates, { error: 'There is no such state; every state is shown.' }),
	expiring: z.enum(['30', '60', '90'], { error: 'Choose 30, 60 or 90 days; no expiry filter is applied.' }).transform((s) => Number(s) as 30 | 60 | 90),
	q: z.string().trim().max(200, 'The search is longer than 200 characters; it is ignored.'),
	sort: z.string().refine((s) => s === 'name' || catalogue.some((c) => c.slug === s), 'The board cannot be sorted that way; it is sorted by name.'),
	dir: z.enum(['asc', 'desc'], { error: 'Sort up or down only; it is sorted A to Z.' })
});

/** Reads the board's filters from a URL. A bad value is named in `notices` and falls back; never throws. */
export function readBoardQuery(params: URLSearchParams, catalogue: readonly BoardCourse[]): { filter: BoardFilter; notices: string[] } {
	const filter: BoardFilter = { course: null, state: null, expiring: null, q: '', sort: 'name', dir: 'asc' };
	const notices: string[] = [];
	const schemas = fieldSchemas(catalogue);
	for (const name of boardKeys) {
		const raw = params.get(name);
		if (raw === null || raw.trim() === '' || raw === 'all') continue;
		const parsed = schemas[name].safeParse(raw.slice(0, 1000));
		if (parsed.success) (filter as unknown as Record<string, unknown>)[name] = parsed.data;
		else notices.push(parsed.error.issues[0].message);
	}
	return { filter, notices };
}

/** The filter as query parameters (defaults left out), for links and the exports. */
export function boardQuery(filter: BoardFilter, change: Partial<BoardFilter> = {}): URLSearchParams {
	const f = { ...filter, ...change };
	const params = new URLSearchParams();
	if (f.course) params.set('course', f.course);
	if (f.state) params.set('state', f.state);
	if (f.expiring) params.set('expiring', String(f.expiring));
	if (f.q) params.set('q', f.q);
	if (f.sort !== 'name') params.set('sort', f.sort);
	if (f.dir !== 'asc') params.set('dir', f.dir);
	return params;
}

export interface BoardCounts {
	certified: number;
	expiring: number;
	expiringWindow: number;
	expired: number;
	revoked: number;
	inTraining: number;
	notEnrolled: number;
}

export interface BoardView {
	columns: BoardCourse[];
	/** The rows shown, each with only the shown columns' cells. */
	rows: BoardRow[];
	total: number;
	counts: BoardCounts;
}

/** Ascending order of a course column: what needs attention first, then by expiry or progress. */
const sortRank: Record<CellState, number> = { expired: 0, revoked: 1, expiring: 2, certified: 3, skills: 4, 'test-passed': 5, learning: 6, 'not-enrolled': 7 };

function compareCells(a: Cell, b: Cell): number {
	if (a.state !== b.state) return sortRank[a.state] - sortRank[b.state];
	if (a.certificate && b.certificate) return a.certificate.expiresOn.localeCompare(b.certificate.expiresOn);
	if (a.state === 'skills') return b.skillsDone - a.skillsDone;
	if (a.state === 'learning') return b.lessonsDone - a.lessonsDone;
	return 0;
}

// one collator: localeCompare with options builds a new one on every call (slow on a 1,000-row board)
const collator = new Intl.Collator('en', { sensitivity: 'base' });
const byName = (a: BoardRow, b: BoardRow) => collator.compare(a.name, b.name) || (a.email < b.email ? -1 : a.email > b.email ? 1 : 0);

/** The board as shown: columns, filtered and sorted rows, and the counts over the shown columns. */
export function viewBoard(rows: readonly BoardRow[], catalogue: readonly BoardCourse[], filter: BoardFilter): BoardView {
	const shown = catalogue.map((c, i) => ({ course: c, i })).filter(({ course }) => !filter.course || course.slug === filter.course);
	const narrowed = rows.map((r) => ({ ...r, cells: shown.map(({ i }) => r.cells[i]) }));
	const window = filter.expiring ?? EXPIRING_DAYS;
	const counts: BoardCounts = { certified: 0, expiring: 0, expiringWindow: window, expired: 0, revoked: 0, inTraining: 0, notEnrolled: 0 };
	for (const row of narrowed) {
		for (const cell of row.cells) {
			if (isValidCell(cell)) counts.certified++;
			if (expiresWithin(cell, window)) counts.expiring++;
			if (cell.state === 'expired') counts.expired++;
			else if (cell.state === 'revoked') counts.revoked++;
			else if (cell.state === 'not-enrolled') counts.notEnrolled++;
			else if (!isValidCell(cell)) counts.inTraining++;
		}
	}
	const terms = filter.q
		.toLowerCase()
		.split(',')
		.map((t) => t.trim())
		.filter(Boolean)
		.slice(0, 50);
	const kept = narrowed.filter(
		(row) =>
			(terms.length === 0 || terms.some((t) => row.name.toLowerCase().includes(t) || row.email.toLowerCase().includes(t))) &&
			(!filter.state || row.cells.some((c) => c.state === filter.state)) &&
			(!filter.expiring || row.cells.some((c) => expiresWithin(c, filter.expiring!)))
	);
	const column = shown.findIndex(({ course }) => course.slug === filter.sort);
	const sign = filter.dir === 'desc' ? -1 : 1;
	kept.sort((a, b) => sign * (column >= 0 ? compareCells(a.cells[column], b.cells[column]) || byName(a, b) : byName(a, b)));
	return { columns: shown.map(({ course }) => course), rows: kept, total: rows.length, counts };
}

/** The valid certificates on a board view, in row order: what a crew list shows. */
export function validCertificates(view: BoardView) {
	return view.rows.flatMap((row) =>
		row.cells.flatMap((cell, i) => (isValidCell(cell) && cell.certificate ? [{ name: row.name, course: view.columns[i], number: cell.certificate.number, expiresOn: cell.certificate.expiresOn }] : []))
	);
}
