import fs from 'node:fs';
import path from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { calculators } from '../../src/lib/calc/index';
import { signInRequest, who } from './support';

/**
 * Every page of every role at 360 px, as a crew member's phone shows it: nothing scrolls
 * sideways, no table hides columns off to the right, every radio button and checkbox keeps its
 * size with a row at least 44 px tall (gloved hands, WCAG 2.5.5), and every label drawn in a
 * diagram or chart is at least 12 px tall as rendered.
 */
const PHONE = { width: 360, height: 780 };
const MIN_LABEL_PX = 12;
const TOUCH_PX = 44;

const courseSlugs = fs.readdirSync('content/courses').filter((d) => fs.existsSync(path.join('content/courses', d, 'course.md')));
const lessons = courseSlugs.flatMap((c) =>
	fs
		.readdirSync(path.join('content/courses', c, 'lessons'))
		.filter((f) => f.endsWith('.md'))
		.map((f) => `/courses/${c}/${f.replace(/\.md$/, '')}`)
);
const tools = Object.keys(calculators).map((id) => `/tools/${id}`);

const pagesByRole: Record<'visitor' | keyof typeof who, string[]> = {
	visitor: ['/', '/about', '/courses', ...courseSlugs.map((c) => `/courses/${c}`), '/tools', ...tools, '/sign-in', '/sign-up', '/reset-password', '/sign-in/check-email', '/api-docs', '/no-such-page'],
	trainee: [
		'/dashboard',
		'/courses',
		...courseSlugs.flatMap((c) => [`/courses/${c}`, `/courses/${c}/practice`, `/courses/${c}/test`, `/courses/${c}/practicals`]),
		'/courses/point-repair-installer/wet-out',
		'/courses/transition-patches/sizing-the-taper'
	],
	trainer: ['/dashboard', '/trainer', '/trainer/attempts', '/trainer/practicals', '/trainer/practicals/in-person', ...courseSlugs.map((c) => `/trainer/attempts/items?course=${c}`)],
	companyTrainer: ['/dashboard', '/trainer', '/trainer/attempts', '/trainer/practicals'],
	companyAdmin: ['/dashboard', '/company', '/company/board', '/company/board?expiring=90&sort=point-repair-installer'],
	inspector: ['/dashboard', '/inspector', '/verify'],
	registrar: ['/dashboard', '/registrar/people', '/registrar/audit', '/registrar/sign-offs', '/registrar/certificates', '/trainer/attempts']
};

/** What is wrong with the page at phone width, as sentences (empty when nothing is). */
async function phoneFaults(page: Page): Promise<string[]> {
	return page.evaluate(
		({ touch }) => {
			const faults: string[] = [];
			const doc = document.documentElement;
			if (doc.scrollWidth > doc.clientWidth) faults.push(`page scrolls sideways by ${doc.scrollWidth - doc.clientWidth} px`);
			const visible = (el: Element) => {
				const r = el.getBoundingClientRect();
				return r.width > 0 && r.height > 0 && getComputedStyle(el).visibility !== 'hidden';
			};
			for (const table of document.querySelectorAll('main table')) {
				// Reference tables of the API page are for developers at a desk.
				if (location.pathname === '/api-docs') continue;
				if (visible(table)) faults.push('a table on a phone (use a card per row)');
			}
			for (const input of document.querySelectorAll<HTMLInputElement>('main input[type=radio], main input[type=checkbox]')) {
				if (!visible(input)) continue;
				const box = input.getBoundingClientRect();
				const row = (input.closest('label') ?? input).getBoundingClientRect();
				if (box.width < 16 || box.height < 16) faults.push(`a ${input.type} shrunk to ${Math.round(box.width)}×${Math.round(box.height)} px`);
				if (row.height < touch - 0.5) faults.push(`a ${input.type} row only ${Math.round(row.height)} px tall`);
			}
			return faults;
		},
		{ touch: TOUCH_PX }
	);
}

/** Labels in every svg on the page smaller than the minimum as rendered, with their text. */
async function smallLabels(page: Page): Promise<string[]> {
	return page.evaluate((min) => {
		const small: string[] = [];
		for (const text of document.querySelectorAll<SVGTextElement>('main svg text')) {
			const ctm = text.getScreenCTM();
			const r = text.getBoundingClientRect();
			if (!ctm || r.width === 0) continue;
			const px = parseFloat(getComputedStyle(text).fontSize) * Math.hypot(ctm.a, ctm.b);
			if (px < min - 0.01) small.push(`“${text.textContent?.trim()}” at ${px.toFixed(1)} px`);
		}
		return small;
	}, MIN_LABEL_PX);
}

async function settle(page: Page) {
	// Lesson islands (calculators with their pictures) mount as they come near the screen: read
	// down the page a screen at a time, as a reader does, so each is measured as it is seen.
	const height = await page.evaluate(() => document.body.scrollHeight);
	for (let y = PHONE.height; y < height; y += PHONE.height) {
		await page.evaluate((top) => window.scrollTo(0, top), y);
		await page.waitForTimeout(20);
	}
	await page.waitForLoadState('networkidle');
	await expect(page.locator('[data-calculator][data-live="false"]')).toHaveCount(0);
	// Pictures fit their labels once the page runs in the browser.
	await page.evaluate(() => new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve))));
}

for (const [role, paths] of Object.entries(pagesByRole)) {
	test(`at 360 px every page of the ${role} fits a phone`, async ({ page }) => {
		test.setTimeout(30_000 + paths.length * 5_000);
		await page.setViewportSize(PHONE);
		if (role !== 'visitor') await signInRequest(page.request, who[role as keyof typeof who]);
		const problems: string[] = [];
		for (const p of paths) {
			const response = await page.goto(p);
			expect(response?.status(), p).toBeLessThan(p === '/no-such-page' || p.includes('sizing-the-taper') ? 500 : 400);
			await settle(page);
			for (const fault of [...(await phoneFaults(page)), ...(await smallLabels(page))]) problems.push(`${p}: ${fault}`);
		}
		expect(problems).toEqual([]);
	});
}

test('at 360 px every diagram label in every lesson is at least 12 px tall', async ({ page }) => {
	test.setTimeout(60_000 + lessons.length * 4_000);
	await page.setViewportSize(PHONE);
	// A trainee enrolled in every course reads every lesson.
	await signInRequest(page.request, 'ade@tarnside.test');
	const problems: string[] = [];
	let labels = 0;
	for (const p of lessons) {
		expect((await page.goto(p))?.status(), p).toBe(200);
		await settle(page);
		labels += await page.locator('main svg text').count();
		for (const small of await smallLabels(page)) problems.push(`${p}: ${small}`);
	}
	expect(labels, 'the lessons have diagrams with labels').toBeGreaterThan(50);
	expect(problems).toEqual([]);
});
