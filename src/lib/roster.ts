import Papa from 'papaparse';
import { z } from 'zod';

/**
 * A crew roster uploaded as CSV (RFC 4180, parsed with papaparse): one person per row with name,
 * e-mail and course. Separators are detected (comma or semicolon, as spreadsheets in many
 * locales write), a byte-order mark and blank lines are ignored, and every cell is kept as plain
 * text: a cell that looks like a spreadsheet formula is a name like any other, never evaluated.
 * Pure: the server adds the checks that need the database (duplicates, free seats).
 */

export const MAX_ROSTER_ROWS = 5000;
export const MAX_ROSTER_BYTES = 2 * 1024 * 1024;

export interface CourseRef {
	slug: string;
	code: string;
	title: string;
}

export interface RosterRow {
	/** Line in the file where the row starts (1-based, counting the header and blank lines). */
	line: number;
	name: string;
	email: string;
	/** What the row said; `courseSlug` is the course it names, or null when unknown. */
	course: string;
	courseSlug: string | null;
	errors: string[];
}

export interface ParsedRoster {
	rows: RosterRow[];
	/** Problems with the file as a whole; when any, no row is usable. */
	problems: string[];
}

const emailSchema = z.email();
const controlCharacters = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/;

const headerNames: Record<string, 'name' | 'email' | 'course'> = {
	name: 'name',
	'full name': 'name',
	email: 'email',
	'e-mail': 'email',
	'email address': 'email',
	'e-mail address': 'email',
	course: 'course'
};

export function findCourse(text: string, courses: CourseRef[]): CourseRef | undefined {
	const wanted = text.trim().toLowerCase();
	if (!wanted) return undefined;
	return courses.find((c) => c.slug === wanted || c.code.toLowerCase() === wanted || c.title.toLowerCase() === wanted);
}

export function parseRoster(text: string, courses: CourseRef[]): ParsedRoster {
	if (text.length > MAX_ROSTER_BYTES) return { rows: [], problems: [`The file is larger than ${MAX_ROSTER_BYTES / 1024 / 1024} MB.`] };
	const clean = text.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
	const parsed = Papa.parse<string[]>(clean, { skipEmptyLines: false, delimitersToGuess: [',', ';', '\t'] });
	const records = parsed.data;

	// Each record starts on the line after the previous one ends; quoted cells may span lines.
	const lines: number[] = [];
	let line = 1;
	for (const record of records) {
		lines.push(line);
		line += 1 + record.reduce((n, cell) => n + (cell.match(/\n/g)?.length ?? 0), 0);
	}

	const isBlank = (record: string[]) => record.every((cell) => cell.trim() === '');
	let first = records.findIndex((r) => !isBlank(r));
	if (first === -1) return { rows: [], problems: ['The file has no rows.'] };

	let columns = { name: 0, email: 1, course: 2 };
	const header = records[first].map((c) => headerNames[c.trim().toLowerCase()]);
	if (header.includes('email')) {
		const at = (key: 'name' | 'email' | 'course') => header.indexOf(key);
		if (at('name') === -1 || at('course') === -1) return { rows: [], problems: ['The header row needs the columns name, email and course.'] };
		columns = { name: at('name'), email: at('email'), course: at('course') };
		first += 1;
	}

	const rows: RosterRow[] = [];
	for (let i = first; i < records.length; i++) {
		const record = records[i];
		if (isBlank(record)) continue;
		if (rows.length === MAX_ROSTER_ROWS) return { rows: [], problems: [`The file has more than ${MAX_ROSTER_ROWS} rows; split it into smaller files.`] };
		const cell = (k: keyof typeof columns) => (record[columns[k]] ?? '').trim();
		const name = cell('name');
		const email = cell('email').toLowerCase();
		const courseText = cell('course');
		const errors: string[] = [];
		if (!name) errors.push('Name is missing.');
		else if (name.length > 120) errors.push('Name is longer than 120 characters.');
		else if (controlCharacters.test(name)) errors.push('Name contains control characters.');
		if (!email) errors.push('E-mail address is missing.');
		else if (email.length > 254 || !emailSchema.safeParse(email).success) errors.push(`"${email.slice(0, 80)}" is not an e-mail address.`);
		const course = findCourse(courseText, courses);
		if (!courseText) errors.push('Course is missing.');
		else if (!course) errors.push(`No course called "${courseText.slice(0, 80)}".`);
		rows.push({ line: lines[i], name, email, course: courseText, courseSlug: course?.slug ?? null, errors });
	}
	if (rows.length === 0) return { rows: [], problems: ['The file has a header but no people.'] };
	return { rows, problems: [] };
}
