/**
 * The compliance board in `npm run bench` (`npm run bench -- board` alone): one company of
 * 1,000 crew across the 3 courses, in a database also holding other companies' people, so that
 * it has 50,000 course test attempts and 10,000 certificates in all. Times the board as the page
 * computes it (the six queries of `$lib/server/compliance` plus the cells, filters, sorting and
 * counts), in process on a file database migrated with the real migrations.
 * Target: median under 50 ms.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { Migrator, type Migration } from 'kysely';
import { parse as parseYaml } from 'yaml';
import { boardCatalogue, readBoardQuery, viewBoard, type BoardCourse } from '../src/lib/compliance/board.ts';
import { companyBoard } from '../src/lib/server/compliance.ts';
import { openDatabase } from '../src/lib/server/db/engine.ts';

const root = path.resolve(import.meta.dirname, '..');
const CREW = 1_000;
const ATTEMPTS = 50_000;
const CERTIFICATES = 10_000;
const OTHERS = 9_000;
const TARGET_MS = 50;

/** The real courses, read from `content/` (outside Vite there is no import.meta.glob). */
function readCatalogue(): BoardCourse[] {
	const dir = path.join(root, 'content/courses');
	const courses = fs
		.readdirSync(dir)
		.filter((slug) => fs.existsSync(path.join(dir, slug, 'course.md')))
		.map((slug) => {
			const meta = parseYaml(fs.readFileSync(path.join(dir, slug, 'course.md'), 'utf8').split(/^---$/m)[1]);
			const lessons = fs.readdirSync(path.join(dir, slug, 'lessons')).filter((f) => f.endsWith('.md')).map((f) => ({ slug: f.replace(/\.md$/, '') }));
			return { slug, code: meta.code, title: meta.title, lessons, practicalSkills: meta.practicalSkills };
		});
	return boardCatalogue(courses);
}

async function migrate(file: string) {
	const db = openDatabase(file, 10_000);
	const migrations: Record<string, Migration> = {};
	for (const name of fs.readdirSync(path.join(root, 'migrations')).filter((f) => f.endsWith('.ts')).sort()) {
		migrations[name.replace(/\.ts$/, '')] = await import(path.join(root, 'migrations', name));
	}
	const { error } = await new Migrator({ db, provider: { getMigrations: async () => migrations }, allowUnorderedMigrations: true }).migrateToLatest();
	if (error) throw error;
	return db;
}

/** Fills the database with raw inserts (a bench fixture, not app code): returns the company's id. */
function fill(file: string, catalogue: BoardCourse[]): string {
	const sqlite = new Database(file);
	sqlite.pragma('journal_mode = WAL');
	const iso = (d: number) => new Date(Date.UTC(2024, 0, 1) + d * 86_400_000).toISOString();
	const company = crypto.randomUUID();
	let seq = 0;
	const rand = () => {
		// a fixed sequence, so every run measures the same data
		seq = (seq * 1103515245 + 12345) % 2147483648;
		return seq / 2147483648;
	};
	const user = sqlite.prepare('insert into "User" (id, name, email, emailVerified, image, passwordHash, createdAt) values (?, ?, ?, null, null, null, ?)');
	const member = sqlite.prepare(`insert into membership (company_id, user_id, role, created_at) values (?, ?, 'member', ?)`);
	const companyRow = sqlite.prepare('insert into company (id, name, created_at) values (?, ?, ?)');
	const enrol = sqlite.prepare(`insert into enrolment (user_id, course_slug, enrolled_at, source) values (?, ?, ?, 'bench')`);
	const lesson = sqlite.prepare('insert into lesson_progress (user_id, course_slug, lesson_slug, completed_at) values (?, ?, ?, ?)');
	const attempt = sqlite.prepare(
		`insert into test_attempt (id, user_id, course_slug, started_at, deadline_at, submitted_at, closed_by, draw_seed, items, answers, item_count, pass_mark, correct_count, score_percent, passed, results)
		 values (?, ?, ?, ?, null, ?, 'person', 1, '[]', '{}', 20, 80, ?, ?, ?, '[]')`
	);
	const submission = sqlite.prepare(`insert into practical_submission (id, trainee_id, course_slug, skill_id, submitted_by, in_person, note, readings, status, submitted_at, closed_at) values (?, ?, ?, ?, ?, 1, '', '{}', 'signed off', ?, ?)`);
	const assessment = sqlite.prepare(`insert into practical_assessment (id, submission_id, trainer_id, outcome, criteria, reasons, place, practical_date, signature_name, assessed_at) values (?, ?, ?, 'signed off', '[]', '[]', 'Rig', ?, 'Bench Trainer', ?)`);
	const signOff = sqlite.prepare(`insert into sign_off (id, user_id, course_slug, skill_id, assessment_id, trainer_id, signed_off_at) values (?, ?, ?, ?, ?, ?, ?)`);
	const certificate = sqlite.prepare(
		`insert into certificate (id, number, slot, user_id, course_slug, holder_name, course_code, course_title, scope, diameter_min_mm, diameter_max_mm,
		  practical_on, test_on, issued_at, issued_on, expires_on, trainers, issuer_name, credential_jwt, revoked_at)
		 values (?, ?, ?, ?, ?, ?, ?, ?, 'Bench scope.', 100, 300, '2024-01-01', '2024-01-01', ?, ?, ?, '[]', 'Bench Provider', 'x', ?)`
	);
	sqlite.transaction(() => {
		companyRow.run(company, 'Bench Drainage', iso(0));
		const trainer = crypto.randomUUID();
		user.run(trainer, 'Bench Trainer', 'trainer@bench.test', iso(0));
		const people: string[] = [];
		for (let i = 0; i < CREW + OTHERS; i++) {
			const id = crypto.randomUUID();
			people.push(id);
			user.run(id, `Crew Member ${String(i).padStart(5, '0')}`, `crew${i}@bench.test`, iso(0));
			if (i < CREW) member.run(company, id, iso(0));
			else if (i % 500 === 0) companyRow.run(`other-${i}`, `Other ${i}`, iso(0));
			if (i >= CREW) member.run(`other-${i - (i % 500)}`, id, iso(0));
		}
		let attempts = 0;
		let certificates = 0;
		for (const [i, id] of people.entries()) {
			for (const course of catalogue) {
				if (rand() < 0.25) continue;
				enrol.run(id, course.slug, iso(1));
				const read = Math.floor(rand() * (course.lessons.length + 1));
				for (const l of course.lessons.slice(0, read)) lesson.run(id, course.slug, l, iso(2));
				const tries = 1 + Math.floor(rand() * 3);
				for (let t = 0; t < tries && attempts < ATTEMPTS; t++, attempts++) {
					const score = 50 + Math.floor(rand() * 50);
					attempt.run(crypto.randomUUID(), id, course.slug, iso(3 + t), iso(3 + t), Math.round(score / 5), score, score >= 80 ? 1 : 0);
				}
				const skills = Math.floor(rand() * (course.skills.length + 1));
				if (i % 4 === 0) {
					for (const skill of course.skills.slice(0, skills)) {
						const sub = crypto.randomUUID();
						const as = crypto.randomUUID();
						submission.run(sub, id, course.slug, skill, trainer, iso(5), iso(5));
						assessment.run(as, sub, trainer, iso(5).slice(0, 10), iso(5));
						signOff.run(crypto.randomUUID(), id, course.slug, skill, as, trainer, iso(5));
					}
				}
				if (certificates < CERTIFICATES && rand() < 0.4) {
					const issued = Math.floor(rand() * 1000);
					const expires = new Date(Date.UTC(2024, 0, 1) + (issued + 730) * 86_400_000).toISOString().slice(0, 10);
					const number = `B${String(certificates).padStart(15, '0')}`.replace(/(.{4})(?=.)/g, '$1-');
					certificate.run(crypto.randomUUID(), number, `${id}|${course.slug}`, id, course.slug, `Crew Member ${i}`, course.code, course.title, iso(issued), iso(issued).slice(0, 10), expires, rand() < 0.02 ? iso(issued + 5) : null);
					certificates++;
				}
			}
		}
		// the rest of the attempts and certificates: older ones of other people
		for (let i = 0; attempts < ATTEMPTS; i++, attempts++) attempt.run(crypto.randomUUID(), people[CREW + (i % OTHERS)], catalogue[i % 3].slug, iso(10 + (i % 300)), iso(10 + (i % 300)), 10, 50, 0);
		for (let i = 0; certificates < CERTIFICATES; i++, certificates++) {
			const id = people[CREW + (i % OTHERS)];
			const number = `C${String(certificates).padStart(15, '0')}`.replace(/(.{4})(?=.)/g, '$1-');
			certificate.run(crypto.randomUUID(), number, null, id, catalogue[i % 3].slug, 'Old Holder', catalogue[i % 3].code, catalogue[i % 3].title, iso(0), iso(0).slice(0, 10), '2025-01-01', null);
		}
	})();
	sqlite.pragma('optimize');
	sqlite.close();
	return company;
}

const quantile = (sorted: number[], q: number) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];

export async function boardBench(runs = 30): Promise<void> {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-bench-board-'));
	const file = path.join(dir, 'board.sqlite');
	try {
		const catalogue = readCatalogue();
		const db = await migrate(file);
		await db.destroy();
		const company = fill(file, catalogue);
		const app = openDatabase(file, 10_000);
		const counts = (t: string) => Number((new Database(file, { readonly: true }).prepare(`select count(*) as n from ${t}`).get() as { n: number }).n);
		const [attempts, certificates, crew] = [counts('test_attempt'), counts('certificate'), CREW];
		const filter = readBoardQuery(new URLSearchParams(), catalogue).filter;
		const once = async () => viewBoard(await companyBoard(company, catalogue, { db: app }), catalogue, filter);
		for (let i = 0; i < 3; i++) await once();
		const wall: number[] = [];
		const cpu: number[] = [];
		let shown = 0;
		for (let i = 0; i < runs; i++) {
			const started = performance.now();
			const used = process.cpuUsage();
			shown = (await once()).rows.length;
			const spent = process.cpuUsage(used);
			wall.push(performance.now() - started);
			cpu.push((spent.user + spent.system) / 1000);
		}
		await app.destroy();
		wall.sort((a, b) => a - b);
		cpu.sort((a, b) => a - b);
		const median = quantile(wall, 0.5);
		const cpuMedian = quantile(cpu, 0.5);
		console.log(`\nCompliance board: ${crew.toLocaleString('en-US')} crew x ${catalogue.length} courses over ${attempts.toLocaleString('en-US')} attempts and ${certificates.toLocaleString('en-US')} certificates, ${runs} runs (target: median under ${TARGET_MS} ms)`);
		// The machine is shared: wall time grows with other processes' load, CPU time is this work's own cost.
		const load = os.loadavg()[0];
		console.log(`rows ${shown}  wall median ${median.toFixed(1)} ms  p90 ${quantile(wall, 0.9).toFixed(1)} ms  CPU median ${cpuMedian.toFixed(1)} ms  (load average ${load.toFixed(1)} on ${os.cpus().length} cores)`);
		console.log(`target ${median < TARGET_MS ? 'met' : 'MISSED'} on wall time${median >= TARGET_MS && cpuMedian < TARGET_MS ? ` (the work itself takes ${cpuMedian.toFixed(1)} ms of CPU: the machine was busy)` : ''}`);
	} finally {
		fs.rmSync(dir, { recursive: true, force: true });
	}
}

if (import.meta.filename === process.argv[1]) await boardBench();
