/**
 * Fails the build on a bad course or lesson file: run before `vite build` as
 * `node --import jiti/register scripts/check-content.ts [content-dir]` (default `content/`).
 * Exits 1 listing every problem.
 * Outside Vite there is no `import.meta.glob` or `$lib`, so files are read from disk and
 * the check and the calculators are imported by relative path.
 */
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { checkContent, formatProblems, type ContentFiles } from '../src/lib/content/check.ts';
import { calculators } from '../src/lib/calc/index.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const coursesDir = path.join(path.resolve(root, process.argv[2] ?? 'content'), 'courses');

function readContent(): ContentFiles {
	const files: ContentFiles = {};
	for (const course of fs.readdirSync(coursesDir, { withFileTypes: true })) {
		if (!course.isDirectory()) continue;
		const courseFile = path.join(coursesDir, course.name, 'course.md');
		if (fs.existsSync(courseFile)) files[`/content/courses/${course.name}/course.md`] = fs.readFileSync(courseFile, 'utf8');
		const lessonsDir = path.join(coursesDir, course.name, 'lessons');
		if (!fs.existsSync(lessonsDir)) continue;
		for (const lesson of fs.readdirSync(lessonsDir)) {
			if (lesson.endsWith('.md')) {
				files[`/content/courses/${course.name}/lessons/${lesson}`] = fs.readFileSync(path.join(lessonsDir, lesson), 'utf8');
			}
		}
	}
	return files;
}

const files = readContent();
const problems = checkContent(files, Object.keys(calculators));
if (problems.length) {
	console.error(`Content check: ${problems.length} problem${problems.length === 1 ? '' : 's'}\n${formatProblems(problems)}`);
	process.exit(1);
}
console.log(`Content check: ${Object.keys(files).length} files, no problems.`);
