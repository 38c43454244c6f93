import { expect, type APIRequestContext, type Page } from '@playwright/test';
import { baseURL, inboxURL } from '../../playwright.config';

export { baseURL, inboxURL };
export const DEMO_PASSWORD = 'patchwright-demo';

/** Demo identities by role (see src/lib/server/demo-people.ts). */
export const who = {
	trainee: 'sam@brindlewick.test',
	trainer: 'trainer@fenmoor.test',
	companyAdmin: 'admin@brindlewick.test',
	/** Company admin and the company's own trainer: works with Tarnside's crew only. */
	companyTrainer: 'admin@tarnside.test',
	inspector: 'inspector@waterboard.test',
	registrar: 'registrar@fenmoor.test'
} as const;
export type Identity = 'anonymous' | keyof typeof who;

export async function signInWithPassword(page: Page, email: string, password = DEMO_PASSWORD) {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail address').first().fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in', exact: true }).click();
	await expect(page).toHaveURL(/\/dashboard$/);
}

/** Signs an API client in the way a browser form would (form actions need an Origin header). */
export async function signInRequest(request: APIRequestContext, email: string, password = DEMO_PASSWORD) {
	const response = await request.post('/sign-in?/password', {
		form: { intent: 'password', email, password },
		headers: { origin: baseURL, accept: 'text/html' },
		maxRedirects: 0
	});
	expect(response.status(), `sign-in as ${email}`).toBe(302);
}

interface StoredMessage {
	subject: string;
	text: string;
	to: string[];
}

/** Waits for the newest e-mail to `to` whose subject matches, and returns it. */
export async function latestMail(request: APIRequestContext, to: string, subject: RegExp): Promise<StoredMessage> {
	let found: StoredMessage | undefined;
	await expect
		.poll(async () => {
			const messages: StoredMessage[] = await (await request.get(`${inboxURL}api/messages?to=${encodeURIComponent(to)}`)).json();
			found = messages.find((m) => subject.test(m.subject));
			return !!found;
		}, { timeout: 10_000 })
		.toBe(true);
	return found!;
}

export function firstLink(text: string, containing: string): string {
	const link = text.match(/https?:\/\/\S+/g)?.find((l) => l.includes(containing));
	if (!link) throw new Error(`No link containing ${containing} in:\n${text}`);
	return link;
}
