import { expect, request as newRequest, test, type APIResponse } from '@playwright/test';
import { baseURL, signInRequest, who, type Identity } from './support';

/**
 * Who may open what. `ok` is 200; `in` is a redirect to sign-in; a number is that status.
 * Every page and API route that exists so far is listed; later features add rows.
 */
type Expect = 'ok' | 'in' | 'dash' | 401 | 403 | 404 | 405;
const NO_ID = '00000000-0000-4000-8000-000000000000';
const identities: Identity[] = ['anonymous', 'trainee', 'trainer', 'companyTrainer', 'companyAdmin', 'inspector', 'registrar'];

const table: [string, Expect | Partial<Record<Identity, Expect>> & { other: Expect }][] = [
	['/', 'ok'],
	['/about', 'ok'],
	['/sign-in', { anonymous: 'ok', other: 'dash' }],
	['/sign-up', { anonymous: 'ok', other: 'dash' }],
	['/reset-password', 'ok'],
	['/sign-up/check-email', 'ok'],
	['/sign-up/confirm/not-a-real-token', 'ok'],
	['/dashboard', { anonymous: 'in', other: 'ok' }],
	['/trainer', { anonymous: 'in', trainer: 'ok', other: 403 }],
	['/inspector', { anonymous: 'in', inspector: 'ok', other: 403 }],
	['/company', { anonymous: 'in', companyAdmin: 'ok', companyTrainer: 'ok', other: 403 }],
	['/registrar/people', { anonymous: 'in', registrar: 'ok', other: 403 }],
	// the compliance board and its exports: company admins only (a company's own trainer here is also Tarnside's admin)
	['/company/board', { anonymous: 'in', companyAdmin: 'ok', companyTrainer: 'ok', other: 403 }],
	['/company/board?course=__proto__&state=constructor&expiring=45&q=%00%1F&sort=toString&dir=sideways', { anonymous: 'in', companyAdmin: 'ok', companyTrainer: 'ok', other: 403 }],
	[`/company/board?c=${NO_ID}`, { anonymous: 'in', companyAdmin: 404, companyTrainer: 404, other: 403 }],
	['/company/board/board.csv', { anonymous: 'in', companyAdmin: 'ok', companyTrainer: 'ok', other: 403 }],
	[`/company/board/board.csv?c=${NO_ID}`, { anonymous: 'in', companyAdmin: 404, companyTrainer: 404, other: 403 }],
	['/company/board/crew-list.pdf', { anonymous: 'in', companyAdmin: 'ok', companyTrainer: 'ok', other: 403 }],
	[`/company/board/crew-list.pdf?c=${NO_ID}`, { anonymous: 'in', companyAdmin: 404, companyTrainer: 404, other: 403 }],
	// a crew member's record: company admins and trainers (in scope); nobody else
	[`/company/people/${NO_ID}`, { anonymous: 'in', trainee: 403, inspector: 403, other: 404 }],
	['/company/people/__proto__', { anonymous: 'in', trainee: 403, inspector: 403, other: 404 }],
	['/registrar/audit', { anonymous: 'in', registrar: 'ok', other: 403 }],
	['/registrar/audit?person=%25&action=__proto__&from=2026-99-99&before=-1', { anonymous: 'in', registrar: 'ok', other: 403 }],
	['/registrar/audit/audit.csv', { anonymous: 'in', registrar: 'ok', other: 403 }],
	['/api/v1/health', 'ok'],
	['/api/v1/me', { anonymous: 401, other: 'ok' }],
	['/no-such-page', 404],
	['/api/v1/no-such-route', 404],
	['/courses', 'ok'],
	['/courses/search-index.json', 'ok'],
	['/courses/point-repair-installer', 'ok'],
	['/courses/no-such-course', 404],
	['/courses/point-repair-installer/the-job-and-defects', 'ok'],
	['/courses/point-repair-installer/wet-out', { anonymous: 'in', trainee: 'ok', trainer: 'ok', registrar: 'ok', other: 403 }],
	['/courses/transition-patches/sizing-the-taper', { anonymous: 'in', trainer: 'ok', registrar: 'ok', other: 403 }],
	['/courses/point-repair-installer/no-such-lesson', 404],
	['/api/v1/progress', { anonymous: 401, other: 'ok' }],
	['/api/v1/progress/point-repair-installer', { anonymous: 401, trainee: 'ok', other: 403 }],
	['/api/v1/progress/no-such-course', { anonymous: 401, other: 404 }],
	['/courses/point-repair-installer/practice', 'ok'],
	['/courses/no-such-course/practice', 404],
	['/courses/point-repair-installer/test', { anonymous: 'in', other: 'ok' }],
	['/courses/no-such-course/test', 404],
	['/courses/point-repair-installer/test/no-such-attempt', { anonymous: 'in', other: 404 }],
	['/api/v1/practice', 'ok'],
	['/api/v1/practice/resin-quantity?seed=1', 'ok'],
	['/api/v1/practice/no-such-generator?seed=1', 404],
	['/api/v1/courses/point-repair-installer/attempts', { anonymous: 401, other: 'ok' }],
	['/api/v1/courses/no-such-course/attempts', { anonymous: 401, other: 404 }],
	['/api/v1/attempts/no-such-attempt', { anonymous: 401, other: 404 }],
	['/api/v1/attempts/no-such-attempt/result', { anonymous: 401, other: 404 }],
	['/trainer/attempts', { anonymous: 'in', trainer: 'ok', registrar: 'ok', other: 403 }],
	['/trainer/attempts/items?course=point-repair-installer', { anonymous: 'in', trainer: 'ok', registrar: 'ok', other: 403 }],
	['/trainer/attempts/no-such-attempt', { anonymous: 'in', trainer: 404, registrar: 404, other: 403 }],
	['/courses/point-repair-installer/practicals', { anonymous: 'in', other: 'ok' }],
	['/courses/no-such-course/practicals', { anonymous: 'in', other: 404 }],
	['/courses/point-repair-installer/practicals/wet-out', { anonymous: 'in', trainee: 'ok', other: 403 }],
	['/courses/point-repair-installer/practicals/no-such-skill', { anonymous: 'in', other: 404 }],
	['/trainer/practicals', { anonymous: 'in', trainer: 'ok', other: 403 }],
	['/trainer/practicals?course=__proto__&company=constructor&olderThanDays=-1', { anonymous: 'in', trainer: 'ok', other: 403 }],
	['/trainer/practicals/in-person', { anonymous: 'in', trainer: 'ok', other: 403 }],
	['/trainer/practicals/no-such-evidence', { anonymous: 'in', trainer: 404, other: 403 }],
	['/registrar/sign-offs', { anonymous: 'in', registrar: 'ok', other: 403 }],
	['/evidence-files/no-such-file', { anonymous: 'in', other: 404 }],
	['/api/v1/courses/point-repair-installer/practicals', { anonymous: 401, trainee: 'ok', other: 403 }],
	['/api/v1/courses/no-such-course/practicals', { anonymous: 401, other: 404 }],
	['/api/v1/practicals/queue', { anonymous: 401, trainer: 'ok', other: 403 }],
	['/verify', 'ok'],
	['/verify?number=abc', 'ok'],
	['/verify/0000-0000-0000-0000', 'ok'],
	['/registrar/certificates', { anonymous: 'in', registrar: 'ok', other: 403 }],
	['/inspector/checks/no-such-check', { anonymous: 'in', inspector: 404, other: 403 }],
	['/api/v1/certificates/0000-0000-0000-0000', 404],
	['/api/v1/certificates/__proto__', 404],
	['/.well-known/jwks.json', 'ok'],
	['/issuer', 'ok'],
	['/contexts/ob/v3p0/context-3.0.3.json', 'ok'],
	['/contexts/ob/v3p0/no-such.json', 404],
	['/certificates/0000-0000-0000-0000/a4.pdf', { anonymous: 'in', other: 404 }],
	['/courses/point-repair-installer/buy', { anonymous: 'in', other: 'ok' }],
	['/courses/no-such-course/buy', { anonymous: 'in', other: 404 }],
	['/orders', { anonymous: 'in', other: 'ok' }],
	[`/orders/${NO_ID}`, { anonymous: 'in', other: 404 }],
	['/orders/not-an-id', { anonymous: 'in', other: 404 }],
	[`/orders/${NO_ID}/cancel`, { anonymous: 'in', other: 404 }],
	[`/orders/${NO_ID}/receipt`, { anonymous: 'in', other: 404 }],
	[`/orders/${NO_ID}/receipt.pdf`, { anonymous: 'in', other: 404 }],
	['/company/seats', { anonymous: 'in', companyAdmin: 'ok', companyTrainer: 'ok', other: 403 }],
	['/registrar/orders', { anonymous: 'in', registrar: 'ok', other: 403 }],
	[`/registrar/orders/${NO_ID}`, { anonymous: 'in', registrar: 404, other: 403 }],
	['/invitations/no-such-invitation-token-000000', 404],
	['/invitations/short', 404],
	[`/api/v1/orders/${NO_ID}`, { anonymous: 401, other: 404 }],
	[`/api/v1/companies/${NO_ID}/seats`, { anonymous: 401, other: 403 }],
	['/api/v1/payments/webhook', 405]
];

const codes: Record<number, string> = { 400: 'bad_request', 401: 'unauthorized', 403: 'forbidden', 404: 'not_found', 405: 'method_not_allowed', 409: 'conflict', 413: 'payload_too_large', 415: 'unsupported_media_type' };

/** Every API refusal is JSON in the one shape: {error: {code, message}}, never HTML, never cached. */
async function expectApiError(response: APIResponse, status: number, label: string) {
	expect(response.headers()['content-type'], label).toMatch(/^application\/json/);
	expect(response.headers()['cache-control'], label).toBe('no-store');
	const body = await response.json();
	expect(body.error, label).toMatchObject({ code: codes[status], message: expect.any(String) });
}

function expected(rule: (typeof table)[number][1], identity: Identity): Expect {
	if (typeof rule !== 'object') return rule;
	// A company's own trainer opens the trainer pages as any trainer does; what they show is scoped (tested below).
	return rule[identity] ?? (identity === 'companyTrainer' ? rule.trainer : undefined) ?? rule.other;
}

for (const identity of identities) {
	test(`access as ${identity}`, async () => {
		const request = await newRequest.newContext({ baseURL });
		if (identity !== 'anonymous') await signInRequest(request, who[identity]);
		for (const [path, rule] of table) {
			const want = expected(rule, identity);
			const response = await request.get(path, { maxRedirects: 0 });
			const label = `${identity} GET ${path}`;
			if (want === 'ok') expect(response.status(), label).toBe(200);
			else if (want === 'in') {
				expect(response.status(), label).toBe(303);
				expect(response.headers().location, label).toMatch(/^\/sign-in\?next=/);
			} else if (want === 'dash') {
				expect(response.status(), label).toBe(303);
				expect(response.headers().location, label).toBe('/dashboard');
			} else expect(response.status(), label).toBe(want);
			if (typeof want === 'number' && path.startsWith('/api/')) await expectApiError(response, want, label);
			if (want === 403) {
				// A refusal leaks nothing of the page behind it, such as other people's addresses.
				const body = await response.text();
				for (const other of [...Object.values(who), 'priya@brindlewick.test']) {
					if (identity === 'anonymous' || other !== who[identity]) expect(body, label).not.toContain(other);
				}
			}
		}
		await request.dispose();
	});
}

test('the registrar grants a role, the person gains the page, and the audit log shows it', async ({ page, browser }) => {
	test.slow(); // three people and four pages; slow on a loaded machine
	const person = 'priya@brindlewick.test';
	const registrar = await newRequest.newContext({ baseURL });
	await signInRequest(registrar, who.registrar);
	const priya = await newRequest.newContext({ baseURL });
	await signInRequest(priya, person);
	expect((await priya.get('/trainer', { maxRedirects: 0 })).status()).toBe(403);

	await page.context().addCookies((await registrar.storageState()).cookies);
	await page.goto(`/registrar/people?q=priya`);
	await page.getByRole('button', { name: `Grant Trainer for ${person}` }).click();
	await expect(page.getByRole('status')).toContainText('Granted the trainer role to Priya Venn (priya@brindlewick.test).');
	expect((await priya.get('/trainer', { maxRedirects: 0 })).status()).toBe(200);

	await page.goto('/registrar/audit');
	await expect(page.locator('[data-action="role.grant"]').first()).toContainText('Rowan Ashdown (registrar@fenmoor.test) granted the trainer role to Priya Venn (priya@brindlewick.test).');

	await page.goto(`/registrar/people?q=priya`);
	await page.getByRole('button', { name: `Remove Trainer for ${person}` }).click();
	await expect(page.getByRole('status')).toContainText('Removed the trainer role from Priya Venn');
	// Removing a role ends the person's sessions: whatever was open with it is closed.
	const after = await priya.get('/trainer', { maxRedirects: 0 });
	expect(after.status()).toBe(303);
	expect(after.headers().location).toMatch(/^\/sign-in\?next=/);
	await signInRequest(priya, person);
	expect((await priya.get('/trainer', { maxRedirects: 0 })).status()).toBe(403);
	await registrar.dispose();
	await priya.dispose();
	void browser;
});

test('the registrar is not offered to remove their own registrar role, and sees who they are', async ({ page }) => {
	await signInRequest(page.request, who.registrar);
	await page.goto(`/registrar/people?q=${encodeURIComponent(who.registrar)}`);
	const me = page.getByTestId('person').filter({ hasText: who.registrar });
	await expect(me).toContainText('(you)');
	await expect(me).toContainText('Registrar (yours)');
	await expect(me.getByRole('button', { name: `Remove Registrar for ${who.registrar}` })).toHaveCount(0);
	// The inspector works as an inspector only: not listed as a trainee without a course.
	await page.goto(`/registrar/people?q=${encodeURIComponent(who.inspector)}`);
	await expect(page.getByTestId('works-as')).toHaveText('Works as: Inspector');
});

test('the audit log filters by person, action and date, pages, and exports CSV', async ({ page }) => {
	test.slow();
	await signInRequest(page.request, who.registrar);
	await page.goto('/registrar/audit');
	await page.getByLabel('Person (name or e-mail)').fill('sam@brindlewick.test');
	await page.getByLabel('Action').selectOption('enrolment.create');
	await page.getByRole('button', { name: 'Show' }).click();
	const entries = page.getByTestId('audit-entry');
	await expect(entries.first()).toBeVisible();
	for (const text of await entries.allTextContents()) expect(text).toMatch(/enrolled Sam Okafor \(sam@brindlewick.test\) in /);
	// Times are in the reader's zone; the UTC value stays in the datetime attribute.
	await expect(entries.first().locator('time')).toHaveAttribute('datetime', /^\d{4}-\d{2}-\d{2}T.*Z$/);
	const today = new Date().toISOString().slice(0, 10);
	await page.getByLabel('To (date, UTC)').fill('2000-01-01');
	await page.getByRole('button', { name: 'Show' }).click();
	await expect(page.getByText('No entry matches these filters.')).toBeVisible();

	const csv = await page.request.get(`/registrar/audit/audit.csv?person=sam%40brindlewick.test&action=enrolment.create&from=${today}`);
	expect(csv.headers()['content-type']).toContain('text/csv');
	const lines = (await csv.text()).trim().split(/\r?\n/);
	expect(lines[0]).toContain('what happened');
	expect(lines.length).toBeGreaterThan(1);
	expect(lines[1]).toContain('enrolled Sam Okafor');

	// Paging goes by entry: the page after the newest one starts with the one before it.
	await page.goto('/registrar/audit');
	const newest = Number(await entries.first().getAttribute('data-id'));
	await page.goto(`/registrar/audit?before=${newest}`);
	await expect(entries.first()).toHaveAttribute('data-id', String(newest - 1));
	await expect(page.getByRole('link', { name: 'Newest entries' })).toBeVisible();

	// Lifting a wait needs a reason and a confirmation, even from a script.
	const refused = await page.request.post('/trainer/attempts?/allowRetake', {
		form: { attemptId: 'any' },
		headers: { origin: baseURL, accept: 'application/json' }
	});
	const body = await refused.json();
	expect(body).toMatchObject({ type: 'failure', status: 400 });
	expect(JSON.stringify(body.data)).toContain('it goes into the audit log');
	expect(JSON.stringify(body.data)).toContain('Tick the box to confirm');

	// Only a registrar may export.
	const trainee = await newRequest.newContext({ baseURL });
	await signInRequest(trainee, who.trainee);
	expect((await trainee.get('/registrar/audit/audit.csv', { maxRedirects: 0 })).status()).toBe(403);
	await trainee.dispose();
});

test('a role change with a forged person id is refused with a clear message', async () => {
	const registrar = await newRequest.newContext({ baseURL });
	await signInRequest(registrar, who.registrar);
	const response = await registrar.post('/registrar/people?/grant', {
		form: { userId: 'not-a-uuid', role: 'emperor' },
		headers: { origin: baseURL, accept: 'application/json' }
	});
	const body = await response.json();
	expect(body.type).toBe('failure');
	expect(body.status).toBe(400);
	await registrar.dispose();
});

test('only a registrar can sign someone out everywhere', async () => {
	for (const identity of ['trainer', 'companyAdmin', 'inspector'] as const) {
		const client = await newRequest.newContext({ baseURL });
		await signInRequest(client, who[identity]);
		const response = await client.post('/registrar/people?/signOutEverywhere', {
			form: { userId: crypto.randomUUID() },
			headers: { origin: baseURL, accept: 'application/json' }
		});
		expect(response.status(), identity).toBe(403);
		expect((await client.get('/api/v1/me')).status(), `${identity} still signed in`).toBe(200);
		await client.dispose();
	}
	const registrar = await newRequest.newContext({ baseURL });
	await signInRequest(registrar, who.registrar);
	const forged = await registrar.post('/registrar/people?/signOutEverywhere', {
		form: { userId: '__proto__' },
		headers: { origin: baseURL, accept: 'application/json' }
	});
	expect((await forged.json()).status).toBe(400);
	await registrar.dispose();
});

test('the registrar enrols a person in a course, recorded in the audit log', async ({ page }) => {
	test.slow();
	await page.context().addCookies(await (async () => {
		const registrar = await newRequest.newContext({ baseURL });
		await signInRequest(registrar, who.registrar);
		const cookies = (await registrar.storageState()).cookies;
		await registrar.dispose();
		return cookies;
	})());
	// A newcomer who signed up on their own is enrolled by the registrar.
	const email = `enrol-${Date.now()}@example.test`;
	const newcomer = await newRequest.newContext({ baseURL });
	const signUp = await newcomer.post('/sign-up', {
		form: { name: 'Enrol Me', email, password: 'a long enough password' },
		headers: { origin: baseURL, accept: 'text/html' },
		maxRedirects: 0
	});
	// A password account waits for its address to be confirmed.
	expect(signUp.status()).toBe(303);
	expect(signUp.headers().location).toBe('/sign-up/check-email');
	await newcomer.dispose();

	await page.goto(`/registrar/people?q=${encodeURIComponent(email)}`);
	const person = page.getByRole('listitem').filter({ hasText: email });
	await expect(person).toContainText('Enrolled: no course');
	await person.getByLabel(`Course to enrol ${email} in`).selectOption('transition-patches');
	await person.getByRole('button', { name: `Enrol ${email}` }).click();
	await expect(page.getByRole('status')).toContainText('Enrolled Enrol Me in');
	await expect(person).toContainText('Enrolled: TP-200');
	await page.goto('/registrar/audit');
	await expect(page.locator('[data-action="enrolment.create"]').first()).toContainText(`enrolled Enrol Me (${email}) in Transition patches`);
});

test("a company's own trainer works with that company's crew only; the provider's trainer with everyone", async () => {
	const crew = async (email: string) => {
		const person = await newRequest.newContext({ baseURL, extraHTTPHeaders: { origin: baseURL } });
		await signInRequest(person, email);
		const started = await person.post('/api/v1/courses/packer-pressure-safety/attempts', { data: {} });
		expect(started.status(), email).toBe(201);
		const id: string = (await started.json()).attempt.id;
		expect((await person.post(`/api/v1/attempts/${id}/submit`, { data: {} })).status(), email).toBe(200);
		await person.dispose();
		return id;
	};
	const otherCompany = await crew('luca@brindlewick.test');
	const ownCrew = await crew('finn@tarnside.test');

	const companyTrainer = await newRequest.newContext({ baseURL });
	await signInRequest(companyTrainer, who.companyTrainer);
	const list = await companyTrainer.get('/trainer/attempts?course=packer-pressure-safety');
	expect(list.status()).toBe(200);
	const listed = await list.text();
	expect(listed).toContain('finn@tarnside.test');
	expect(listed).not.toContain('luca@brindlewick.test');
	expect((await companyTrainer.get(`/trainer/attempts/${ownCrew}`)).status()).toBe(200);
	const hidden = await companyTrainer.get(`/trainer/attempts/${otherCompany}`);
	expect(hidden.status()).toBe(404);
	expect(await hidden.text()).not.toContain('luca@brindlewick.test');
	const retake = (attemptId: string) =>
		companyTrainer.post('/trainer/attempts?/allowRetake', { form: { attemptId, reason: 'Retake agreed at the training day', confirm: 'yes' }, headers: { origin: baseURL, accept: 'application/json' } });
	expect(await (await retake(otherCompany)).json()).toMatchObject({ type: 'failure', status: 404 });
	expect(await (await retake(ownCrew)).json()).toMatchObject({ type: 'success' });
	await companyTrainer.dispose();

	const provider = await newRequest.newContext({ baseURL });
	await signInRequest(provider, who.trainer);
	expect((await provider.get(`/trainer/attempts/${otherCompany}`)).status()).toBe(200);
	expect(await (await provider.get('/trainer/attempts?course=packer-pressure-safety')).text()).toContain('luca@brindlewick.test');
	await provider.dispose();
});

test('the registrar limits a trainer to one company and back', async ({ page }) => {
	const registrar = await newRequest.newContext({ baseURL });
	await signInRequest(registrar, who.registrar);
	await page.context().addCookies((await registrar.storageState()).cookies);
	await registrar.dispose();
	await page.setViewportSize({ width: 360, height: 800 });
	await page.goto('/registrar/people?q=trainer%40fenmoor');
	const person = page.getByRole('listitem').filter({ hasText: who.trainer });
	await expect(person.getByTestId('trainer-scope')).toContainText('everyone');
	await person.getByLabel(`Trainer ${who.trainer} works with`).selectOption({ label: 'Brindlewick Drainage crew only' });
	await person.getByRole('button', { name: `Set whose crew ${who.trainer} trains` }).click();
	await expect(page.getByRole('status')).toContainText('that company’s crew only');
	await expect(person.getByTestId('trainer-scope')).toContainText('Brindlewick Drainage crew only');
	await person.getByLabel(`Trainer ${who.trainer} works with`).selectOption({ label: 'Everyone (training provider’s trainer)' });
	await person.getByRole('button', { name: `Set whose crew ${who.trainer} trains` }).click();
	await expect(person.getByTestId('trainer-scope')).toContainText('everyone');
	await page.goto('/registrar/audit');
	await expect(page.locator('[data-action="role.trainer-scope"]').first()).toContainText('train everyone');
});

test("a company admin sees their own crew's records and exports, and another company's as not found", async () => {
	const me = async (email: string) => {
		const person = await newRequest.newContext({ baseURL });
		await signInRequest(person, email);
		const identity = await (await person.get('/api/v1/me')).json();
		return { person, identity: identity as { id: string; companies: { id: string; name: string; role: string }[] } };
	};
	const brindlewick = await me(who.companyAdmin);
	const tarnside = await me(who.companyTrainer);
	const provider = await me(who.trainer);
	const sam = await me(who.trainee);
	const inspector = await me(who.inspector);
	const samId = sam.identity.id;
	const brindlewickId = brindlewick.identity.companies.find((c) => c.role === 'admin')!.id;

	// Brindlewick's admin opens Sam's record; it shows scores, never answers
	const record = await brindlewick.person.get(`/company/people/${samId}?c=${brindlewickId}`);
	expect(record.status()).toBe(200);
	const html = await record.text();
	expect(html).toContain('Sam Okafor');
	expect(html).toContain('Practical sign-offs');
	// Tarnside's admin (also Tarnside's own trainer): Sam and Brindlewick's board are "not found"
	for (const path of [`/company/people/${samId}`, `/company/board?c=${brindlewickId}`, `/company/board/board.csv?c=${brindlewickId}`, `/company/board/crew-list.pdf?c=${brindlewickId}`]) {
		const refused = await tarnside.person.get(path, { maxRedirects: 0 });
		expect(refused.status(), path).toBe(404);
		expect(await refused.text(), path).not.toContain('Sam Okafor');
	}
	// the provider's trainer works with everyone: the record opens; the board does not (not a company admin)
	expect((await provider.person.get(`/company/people/${samId}`)).status()).toBe(200);
	expect((await provider.person.get(`/company/board?c=${brindlewickId}`, { maxRedirects: 0 })).status()).toBe(403);
	// trainees (even about themselves) and inspectors get no access
	expect((await sam.person.get(`/company/people/${samId}`, { maxRedirects: 0 })).status()).toBe(403);
	expect((await inspector.person.get(`/company/people/${samId}`, { maxRedirects: 0 })).status()).toBe(403);
	expect((await sam.person.get(`/company/board/board.csv?c=${brindlewickId}`, { maxRedirects: 0 })).status()).toBe(403);
	for (const p of [brindlewick, tarnside, provider, sam, inspector]) await p.person.dispose();
});
