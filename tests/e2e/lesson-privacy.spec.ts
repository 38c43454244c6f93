/**
 * Enrolled-only lesson text never sits in a public file: every file the build serves to
 * anyone (the client build and the prerendered files) is fetched from the running app and
 * searched for distinctive sentences of each non-preview lesson. Each sentence is first found
 * in the lesson page as a registrar reads it, so the search looks for text the app really shows.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { expect, test } from '@playwright/test';
import { splitFrontMatter } from '../../src/lib/content/text';
import { signInRequest, who } from './support';

const buildDir = process.env.BUILD_DIR || 'build';
const lessonsRoot = 'content/courses';

function filesUnder(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
		const full = path.join(dir, entry.name);
		return entry.isDirectory() ? filesUnder(full) : [full];
	});
}

/**
 * Up to four long sentences of plain prose from a lesson's Markdown (no markup, quotes or
 * math in them, so they read the same in the rendered page and in any compiled file).
 */
function distinctiveSentences(raw: string): string[] {
	const body = splitFrontMatter(raw).body.replace(/<script[\s\S]*?<\/script>/g, '').replace(/<[A-Z][\s\S]*?\/>/g, '');
	const prose = body.split('\n').filter((line) => /^[A-Z]/.test(line));
	const sentences = prose.flatMap((line) => line.split(/(?<=\.)\s+/)).filter((s) => /^[A-Za-z0-9 ,;:()%.-]+$/.test(s) && s.split(' ').length >= 9);
	return sentences.sort((a, b) => b.length - a.length).slice(0, 4);
}

const nonPreview = readdirSync(lessonsRoot).flatMap((course) =>
	readdirSync(path.join(lessonsRoot, course, 'lessons'))
		.map((file) => ({ course, slug: file.replace(/\.md$/, ''), raw: readFileSync(path.join(lessonsRoot, course, 'lessons', file), 'utf8') }))
		.filter((l) => /^preview:\s*false\s*$/m.test(l.raw))
		.map((l) => ({ href: `/courses/${l.course}/${l.slug}`, sentences: distinctiveSentences(l.raw) }))
);

test('no public file of the build holds the text of an enrolled-only lesson', async ({ request }) => {
	test.setTimeout(120_000);
	expect(nonPreview.length).toBeGreaterThan(15);
	await signInRequest(request, who.registrar);
	for (const lesson of nonPreview) {
		expect(lesson.sentences.length, `${lesson.href}: sentences to look for`).toBeGreaterThan(0);
		const page = await (await request.get(lesson.href)).text();
		for (const sentence of lesson.sentences) expect(page, `${lesson.href} shows "${sentence}"`).toContain(sentence);
	}

	const publicFiles = [
		...filesUnder(path.join(buildDir, 'client')).map((f) => path.relative(path.join(buildDir, 'client'), f)),
		...filesUnder(path.join(buildDir, 'prerendered')).map((f) => path.relative(path.join(buildDir, 'prerendered'), f))
	].filter((f) => !/\.(br|gz)$/.test(f));
	expect(publicFiles.some((f) => f.endsWith('.js'))).toBe(true);

	const leaks: string[] = [];
	for (const file of publicFiles) {
		const url = '/' + file.split(path.sep).join('/');
		const response = await request.get(url);
		expect(response.status(), url).toBe(200);
		const text = (await response.body()).toString('utf8');
		for (const lesson of nonPreview) {
			for (const sentence of lesson.sentences) if (text.includes(sentence)) leaks.push(`${url}: ${lesson.href}: "${sentence}"`);
		}
	}
	expect(leaks).toEqual([]);
});
