/**
 * The content check run before every build (scripts/check-content.ts) and in the unit
 * tests. Pure: it takes the raw files and the calculator ids and returns the problems.
 * Imports only relative modules and packages (no `$lib`), so it also runs outside Vite.
 */
import { parse as parseYaml } from 'yaml';
import { courseSchema, lessonSchema } from './schema';
import { findComponentTags, splitFrontMatter, stringAttribute } from './text';

/** Raw sources keyed by path from the project root, as `import.meta.glob` names them. */
export type ContentFiles = Record<string, string>;

export interface ContentProblem {
	file: string;
	/** 1-based line, when the problem has one place. */
	line?: number;
	message: string;
}

/** Pages beside a course's lessons that internal links may name. */
const COURSE_SUBPAGES = new Set(['practice', 'test']);
/**
 * Where lessons may import components from: the lesson components (static ones and the
 * interactive islands) and the static diagrams.
 */
const LESSON_IMPORTS = ['$lib/components/lesson/', '$lib/diagrams/'];
const SLUG = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;
const COURSE_FILE = /^\/content\/courses\/([^/]+)\/course\.md$/;
const LESSON_FILE = /^\/content\/courses\/([^/]+)\/lessons\/([^/]+)\.md$/;

interface Parsed {
	file: string;
	raw: string;
	data: unknown;
	body: string;
	bodyOffset: number;
}

const lineAt = (raw: string, index: number) => raw.slice(0, index).split('\n').length;

function readFrontMatter(file: string, raw: string, problems: ContentProblem[]): Parsed | null {
	const split = splitFrontMatter(raw);
	if (split.frontMatter === null) {
		problems.push({ file, line: 1, message: 'No front matter: the file must start with a --- block.' });
		return null;
	}
	try {
		const data = parseYaml(split.frontMatter);
		return { file, raw, data, body: split.body, bodyOffset: raw.length - split.body.length };
	} catch (e) {
		problems.push({ file, line: 1, message: `Front matter is not valid YAML: ${e instanceof Error ? e.message.split('\n')[0] : String(e)}` });
		return null;
	}
}

function schemaProblems(file: string, result: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }): ContentProblem[] {
	if (result.success) return [];
	return (result.error?.issues ?? []).map((issue) => ({
		file,
		line: 1,
		message: `Front matter ${issue.path.map(String).join('.') || '(root)'}: ${issue.message}`
	}));
}

/** Link targets in Markdown links and `href` attributes, with their offsets in `text`. */
function linkTargets(text: string): { target: string; index: number }[] {
	const found: { target: string; index: number }[] = [];
	for (const m of text.matchAll(/\]\(\s*<?([^)\s>]+)>?(?:\s+"[^"]*")?\s*\)/g)) found.push({ target: m[1], index: m.index! });
	for (const m of text.matchAll(/\bhref\s*=\s*["']([^"']+)["']/g)) found.push({ target: m[1], index: m.index! });
	return found.sort((a, b) => a.index - b.index);
}

/**
 * Checks every course and lesson file. Rules: front matter present and valid (course and
 * lesson schemas), lesson slugs in kebab-case, unique lesson `order` per course, internal
 * links to existing courses, lessons and calculators, `<Calculator id="...">` naming a known
 * calculator, components imported only from the lesson and diagram folders, a `## Sources`
 * section in every lesson, and prerequisites naming real courses.
 */
export function checkContent(files: ContentFiles, calculatorIds: Iterable<string>): ContentProblem[] {
	const problems: ContentProblem[] = [];
	const calcIds = new Set(calculatorIds);
	const courseFiles = new Map<string, string>();
	const lessonFiles = new Map<string, Map<string, string>>();

	for (const file of Object.keys(files).sort()) {
		const course = COURSE_FILE.exec(file);
		const lesson = LESSON_FILE.exec(file);
		if (course) courseFiles.set(course[1], file);
		else if (lesson) {
			if (!lessonFiles.has(lesson[1])) lessonFiles.set(lesson[1], new Map());
			lessonFiles.get(lesson[1])!.set(lesson[2], file);
		}
	}

	const courseSlugs = new Set(courseFiles.keys());
	const lessonExists = (course: string, lesson: string) => lessonFiles.get(course)?.has(lesson) ?? false;

	function checkLinks(parsed: Parsed) {
		for (const { target, index } of linkTargets(parsed.body)) {
			const path = target.split(/[?#]/)[0].replace(/\/$/, '');
			const line = lineAt(parsed.raw, parsed.bodyOffset + index);
			const courseLink = /^\/courses(?:\/([^/]+)(?:\/([^/]+))?)?$/.exec(path);
			const toolLink = /^\/tools\/([^/]+)$/.exec(path);
			if (path.startsWith('/courses/') && !courseLink) {
				problems.push({ file: parsed.file, line, message: `Broken link ${target}: no such page.` });
			} else if (courseLink?.[1] && !courseSlugs.has(courseLink[1])) {
				problems.push({ file: parsed.file, line, message: `Broken link ${target}: no course "${courseLink[1]}".` });
			} else if (courseLink?.[2] && !COURSE_SUBPAGES.has(courseLink[2]) && !lessonExists(courseLink[1], courseLink[2])) {
				problems.push({ file: parsed.file, line, message: `Broken link ${target}: no lesson "${courseLink[2]}" in ${courseLink[1]}.` });
			} else if (toolLink && !calcIds.has(toolLink[1])) {
				problems.push({ file: parsed.file, line, message: `Broken link ${target}: no calculator "${toolLink[1]}".` });
			}
		}
	}

	for (const [slug, file] of courseFiles) {
		const parsed = readFrontMatter(file, files[file], problems);
		if (!parsed) continue;
		const result = courseSchema.safeParse(parsed.data);
		problems.push(...schemaProblems(file, result));
		for (const prerequisite of result.success ? result.data.prerequisites : []) {
			if (prerequisite === slug || !courseSlugs.has(prerequisite)) {
				problems.push({ file, line: 1, message: `Prerequisite "${prerequisite}" is not another course.` });
			}
		}
		checkLinks(parsed);
	}

	for (const [course, lessons] of lessonFiles) {
		if (!courseFiles.has(course)) {
			problems.push({ file: `/content/courses/${course}/course.md`, message: `Course "${course}" has lessons but no course.md.` });
		}
		const byOrder = new Map<number, string[]>();
		for (const [slug, file] of lessons) {
			if (!SLUG.test(slug)) problems.push({ file, message: `Lesson file name "${slug}" must be lower-case words joined by hyphens.` });
			const parsed = readFrontMatter(file, files[file], problems);
			if (!parsed) continue;
			const result = lessonSchema.safeParse(parsed.data);
			problems.push(...schemaProblems(file, result));
			if (result.success) byOrder.set(result.data.order, [...(byOrder.get(result.data.order) ?? []), slug]);

			for (const tag of findComponentTags(parsed.body)) {
				if (tag.name !== 'Calculator') continue;
				const id = stringAttribute(tag, 'id');
				const line = lineAt(parsed.raw, parsed.bodyOffset + tag.start);
				if (id === undefined) problems.push({ file, line, message: '<Calculator> needs a literal id="..." attribute.' });
				else if (!calcIds.has(id)) problems.push({ file, line, message: `<Calculator id="${id}">: no calculator with that id.` });
			}
			for (const m of parsed.body.matchAll(/\bimport\s+[\w{}\s,]+\s+from\s+['"]([^'"]+)['"]/g)) {
				if (LESSON_IMPORTS.some((prefix) => m[1].startsWith(prefix))) continue;
				problems.push({
					file,
					line: lineAt(parsed.raw, parsed.bodyOffset + m.index!),
					message: `Lessons import components from ${LESSON_IMPORTS.join(' or ')} only, not "${m[1]}": lesson bodies are rendered on the server, and only the islands there (Calculator, CheckYourself) come alive in the browser.`
				});
			}
			if (!/^##[ \t]+Sources[ \t]*$/m.test(parsed.body)) {
				problems.push({ file, message: 'No "## Sources" section: end the lesson with its sources (or "Common practice").' });
			}
			checkLinks(parsed);
		}
		for (const [order, slugs] of byOrder) {
			if (slugs.length > 1) {
				problems.push({ file: `/content/courses/${course}/lessons/`, message: `Lessons ${slugs.join(', ')} share order ${order}.` });
			}
		}
	}
	return problems;
}

export function formatProblems(problems: ContentProblem[]): string {
	return problems.map((p) => `${p.file.replace(/^\//, '')}${p.line ? `:${p.line}` : ''}: ${p.message}`).join('\n');
}
