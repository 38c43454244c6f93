import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { calculators } from '$lib/calc';
import { checkContent, type ContentFiles } from '$lib/content/check';
import { plainText } from '$lib/content/text';

const real: ContentFiles = import.meta.glob('/content/courses/**/*.md', { query: '?raw', import: 'default', eager: true });
const calculatorIds = Object.keys(calculators);

const COURSE = `---
title: Test course
code: TC-1
summary: A course for the check.
level: foundation
priceCents: 1000
currency: EUR
validityMonths: 12
passMark: 80
prerequisites: []
certificateScope: Nothing real.
diameterRangeMm: [100, 150]
test:
  fixedItems: 1
  computedItems: 1
  timeLimitMinutes: null
  attemptsAllowed: 1
  waitHours: 0
  generators: [resin-quantity]
renewal:
  priceCents: 500
  opensDaysBefore: 90
  graceDays: 30
practicalSkills:
  - id: one
    title: One skill
    criteria: [Done well]
    renewal: true
---
Body.
`;

function lesson(order: number, body = 'Text.\n\n## Sources\n\n- Common practice\n', extra = ''): string {
	return `---\ntitle: Lesson ${order}\norder: ${order}\nminutes: 5\npreview: false\nobjectives:\n  - Learn${extra}\n---\n\n${body}`;
}

/** A small valid course to break one rule at a time. */
function sample(overrides: ContentFiles = {}): ContentFiles {
	return {
		'/content/courses/tc/course.md': COURSE,
		'/content/courses/tc/lessons/first.md': lesson(1),
		'/content/courses/tc/lessons/second.md': lesson(2, 'See [the first](/courses/tc/first).\n\n## Sources\n\nCommon practice.\n'),
		...overrides
	};
}

const messages = (files: ContentFiles) => checkContent(files, calculatorIds).map((p) => `${p.file}: ${p.message}`);

describe('content check', () => {
	it('passes the real courses', () => {
		expect(Object.keys(real).length).toBeGreaterThan(20);
		expect(messages(real)).toEqual([]);
	});

	it('passes the crafted sample', () => {
		expect(messages(sample())).toEqual([]);
	});

	it('flags a lesson with no front matter', () => {
		expect(messages(sample({ '/content/courses/tc/lessons/second.md': '# No front matter\n\n## Sources\n' }))).toEqual([
			'/content/courses/tc/lessons/second.md: No front matter: the file must start with a --- block.'
		]);
	});

	it('flags missing or invalid front matter fields', () => {
		const noObjectives = '---\ntitle: T\norder: 2\nminutes: 5\n---\n\n## Sources\n';
		expect(messages(sample({ '/content/courses/tc/lessons/second.md': noObjectives })).join('\n')).toMatch(/second\.md: Front matter objectives:/);
		const badOrder = '---\ntitle: T\norder: two\nminutes: 5\nobjectives: [x]\n---\n\n## Sources\n';
		expect(messages(sample({ '/content/courses/tc/lessons/second.md': badOrder })).join('\n')).toMatch(/second\.md: Front matter order:/);
		const badYaml = '---\ntitle: [unclosed\n---\n\n## Sources\n';
		expect(messages(sample({ '/content/courses/tc/lessons/second.md': badYaml })).join('\n')).toMatch(/not valid YAML/);
		const badCourse = COURSE.replace('priceCents: 1000', 'priceCents: 10.5');
		expect(messages(sample({ '/content/courses/tc/course.md': badCourse })).join('\n')).toMatch(/course\.md: Front matter priceCents:/);
	});

	it('flags links to courses, lessons and calculators that do not exist', () => {
		const body = [
			'[a](/courses/tc/first) [b](/courses/tc/missing-lesson) [c](/courses/nope) [d](/courses/tc/practice)',
			'<a href="/courses/tc/gone#part">e</a> [f](/tools/resin-quantity) [g](/tools/no-such-tool) [h](/courses/tc/first/extra)',
			'',
			'## Sources',
			''
		].join('\n');
		const found = checkContent(sample({ '/content/courses/tc/lessons/second.md': lesson(2, body) }), calculatorIds);
		expect(found.map((p) => p.message)).toEqual([
			'Broken link /courses/tc/missing-lesson: no lesson "missing-lesson" in tc.',
			'Broken link /courses/nope: no course "nope".',
			'Broken link /courses/tc/gone#part: no lesson "gone" in tc.',
			'Broken link /tools/no-such-tool: no calculator "no-such-tool".',
			'Broken link /courses/tc/first/extra: no such page.'
		]);
		expect(found[0].line).toBe(10);
	});

	it('flags a calculator with an unknown or missing id', () => {
		const body = [
			'<Calculator id="resin-quantity" inputs={{ diameterMm: 150 }} />',
			'<Calculator id="resin-volume" />',
			'<Calculator inputs={{ a: 1 }} />',
			'',
			'## Sources'
		].join('\n');
		expect(messages(sample({ '/content/courses/tc/lessons/second.md': lesson(2, body) }))).toEqual([
			'/content/courses/tc/lessons/second.md: <Calculator id="resin-volume">: no calculator with that id.',
			'/content/courses/tc/lessons/second.md: <Calculator> needs a literal id="..." attribute.'
		]);
	});

	it('flags a lesson importing a component from outside the lesson and diagram folders', () => {
		const body = [
			'<script>',
			"  import Calculator from '$lib/components/calc/Calculator.svelte';",
			"  import CheckYourself from '$lib/components/lesson/CheckYourself.svelte';",
			"  import MatWrap from '$lib/diagrams/MatWrap.svelte';",
			'</script>',
			'',
			'## Sources'
		].join('\n');
		const found = messages(sample({ '/content/courses/tc/lessons/second.md': lesson(2, body) }));
		expect(found).toHaveLength(1);
		expect(found[0]).toContain('not "$lib/components/calc/Calculator.svelte"');
	});

	it('flags a lesson without a Sources section', () => {
		expect(messages(sample({ '/content/courses/tc/lessons/second.md': lesson(2, 'Text.\n\n### Sources\n\nSources: none.\n') }))).toEqual([
			'/content/courses/tc/lessons/second.md: No "## Sources" section: end the lesson with its sources (or "Common practice").'
		]);
	});

	it('flags two lessons with the same order in one course', () => {
		expect(messages(sample({ '/content/courses/tc/lessons/third.md': lesson(2) }))).toEqual([
			'/content/courses/tc/lessons/: Lessons second, third share order 2.'
		]);
	});

	it('flags lessons without a course, unknown prerequisites and file names that are not slugs', () => {
		expect(
			messages(
				sample({
					'/content/courses/orphan/lessons/one.md': lesson(1),
					'/content/courses/tc/lessons/Third_Lesson.md': lesson(3),
					'/content/courses/tc/course.md': COURSE.replace('prerequisites: []', 'prerequisites: [tc, nowhere]')
				})
			)
		).toEqual([
			'/content/courses/tc/course.md: Prerequisite "tc" is not another course.',
			'/content/courses/tc/course.md: Prerequisite "nowhere" is not another course.',
			'/content/courses/orphan/course.md: Course "orphan" has lessons but no course.md.',
			'/content/courses/tc/lessons/Third_Lesson.md: Lesson file name "Third_Lesson" must be lower-case words joined by hyphens.'
		]);
	});
});

describe('plain text for search', () => {
	it('drops front matter, scripts, components and math but keeps prose and caution text', () => {
		const raw = lesson(
			1,
			[
				"<script>\n  import Caution from 'x';\n</script>",
				'',
				'## Mixing **part A**',
				'',
				'Use $V = \\pi t (D - t) L$ for the [volume](/courses/tc/first).',
				'',
				'$$',
				'm = \\rho V',
				'$$',
				'',
				'<Caution level="danger" title="Hot">Keep clear of the ends.</Caution>',
				'<CheckYourself question="Is 2 > 1?" options={[\'yes > no\', "no"]} answer={0} />',
				'',
				'| Size | Plies |',
				'| --- | --- |',
				'| DN150 | 3 |'
			].join('\n')
		);
		expect(plainText(raw)).toBe('Mixing part A Use for the volume. Keep clear of the ends. Size Plies DN150 3');
	});
});

describe('scripts/check-content.ts', () => {
	const run = (dir?: string) => {
		try {
			const out = execFileSync('node', ['--import', 'jiti/register', 'scripts/check-content.ts', ...(dir ? [dir] : [])], { encoding: 'utf8', stdio: 'pipe' });
			return { code: 0, out };
		} catch (e) {
			const err = e as { status: number; stderr: string };
			return { code: err.status, out: err.stderr };
		}
	};

	it('exits 0 on the real content and 1 with the problems on a bad lesson', () => {
		expect(run()).toMatchObject({ code: 0 });
		const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'content-check-'));
		try {
			for (const [file, raw] of Object.entries(sample({ '/content/courses/tc/lessons/second.md': lesson(2, '<Calculator id="nope" />\n') }))) {
				const target = path.join(dir, file.replace('/content/', ''));
				fs.mkdirSync(path.dirname(target), { recursive: true });
				fs.writeFileSync(target, raw);
			}
			const result = run(dir);
			expect(result.code).toBe(1);
			expect(result.out).toContain('courses/tc/lessons/second.md:10: <Calculator id="nope">: no calculator with that id.');
			expect(result.out).toContain('No "## Sources" section');
		} finally {
			fs.rmSync(dir, { recursive: true, force: true });
		}
	});
});
