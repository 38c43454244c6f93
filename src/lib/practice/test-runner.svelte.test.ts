import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { formatClock, TestRunner, type RunnerData } from './test-runner.svelte';
import { PracticeSession } from './practice-session.svelte';

type Call = { url: string; method: string; body?: string };

function fakeFetch(reply: (call: Call) => { status: number; body?: unknown }) {
	const calls: Call[] = [];
	const fn = vi.fn(async (url: string | URL | Request, init?: RequestInit) => {
		const call = { url: String(url), method: init?.method ?? 'GET', body: init?.body as string | undefined };
		calls.push(call);
		const { status, body } = reply(call);
		return new Response(JSON.stringify(body ?? {}), { status, headers: { 'content-type': 'application/json' } });
	});
	return { fn: fn as unknown as typeof fetch, calls };
}

const data = (deadlineInMs: number | null): RunnerData => ({
	id: 'a1',
	course: { slug: 'packer-pressure-safety', title: 'Packer pressure' },
	startedAt: new Date().toISOString(),
	deadlineAt: deadlineInMs === null ? null : new Date(Date.now() + deadlineInMs).toISOString(),
	serverNow: new Date().toISOString(),
	items: [
		{ position: 0, kind: 'single', prompt: 'Pick', options: ['a', 'b'], lesson: null },
		{ position: 1, kind: 'numeric', prompt: 'How much?', unit: 'kg', units: ['kg', 'g'], lesson: null }
	],
	answers: { '0': { choice: 1 } }
});

describe('the test runner (client state)', () => {
	beforeEach(() => vi.useFakeTimers());
	afterEach(() => vi.useRealTimers());

	it('resumes with saved answers at the first unanswered item', () => {
		const runner = new TestRunner(data(60_000), fakeFetch(() => ({ status: 200 })).fn);
		expect(runner.answeredCount).toBe(1);
		expect(runner.current).toBe(1);
		expect(runner.unanswered).toEqual([1]);
	});

	it('saves a choice at once and typing after a pause, with the answer as the body', async () => {
		const { fn, calls } = fakeFetch(() => ({ status: 200, body: { savedAt: 'now' } }));
		const runner = new TestRunner(data(60_000), fn);
		runner.setAnswer(0, { choice: 0 });
		await vi.advanceTimersByTimeAsync(0);
		expect(calls).toEqual([{ url: '/api/v1/attempts/a1/answers/0', method: 'PUT', body: '{"choice":0}' }]);
		expect(runner.saves[0]).toEqual({ state: 'saved' });

		runner.setAnswer(1, { value: '1', unit: 'kg' }, true);
		runner.setAnswer(1, { value: '1.2', unit: 'kg' }, true);
		await vi.advanceTimersByTimeAsync(300);
		expect(calls).toHaveLength(1);
		await vi.advanceTimersByTimeAsync(700);
		expect(calls).toHaveLength(2);
		expect(calls[1].body).toBe('{"value":"1.2","unit":"kg"}');
	});

	it('shows a refused save and goes to the result when the attempt is closed', async () => {
		const { fn } = fakeFetch((c) => (c.url.endsWith('/0') ? { status: 400, body: { error: { code: 'bad_request', message: 'The answer does not fit this item.' } } } : { status: 409, body: { error: { code: 'conflict', message: 'Time is up.', reason: 'time-up' } } }));
		const runner = new TestRunner(data(60_000), fn);
		runner.setAnswer(0, { choice: 5 });
		await vi.advanceTimersByTimeAsync(0);
		expect(runner.saves[0]).toEqual({ state: 'error', message: 'The answer does not fit this item.' });
		runner.setAnswer(1, { value: '2', unit: 'kg' });
		await vi.advanceTimersByTimeAsync(0);
		expect(runner.finishedAt).toBe('/courses/packer-pressure-safety/test/a1');
		expect(runner.notice).toBe('Time is up.');
	});

	it('saves what is pending before submitting, and submits by itself when time is up', async () => {
		const { fn, calls } = fakeFetch(() => ({ status: 200, body: {} }));
		const runner = new TestRunner(data(2_000), fn);
		runner.setAnswer(1, { value: '3', unit: 'kg' }, true);
		expect(formatClock(runner.remainingMs!)).toBe('0:02');
		vi.advanceTimersByTime(2_500);
		runner.tick();
		expect(runner.remainingMs).toBe(0);
		await vi.advanceTimersByTimeAsync(0);
		expect(calls.map((c) => `${c.method} ${c.url}`)).toEqual(['PUT /api/v1/attempts/a1/answers/1', 'POST /api/v1/attempts/a1/submit']);
		expect(runner.finishedAt).toBe('/courses/packer-pressure-safety/test/a1');
	});

	it('keeps the answers when the connection drops, and retries', async () => {
		let online = false;
		const calls: string[] = [];
		const fn = (async (url: string) => {
			calls.push(url);
			if (!online) throw new TypeError('offline');
			return new Response('{}', { status: 200 });
		}) as unknown as typeof fetch;
		const runner = new TestRunner(data(null), fn);
		runner.setAnswer(0, { choice: 0 });
		await vi.advanceTimersByTimeAsync(0);
		expect(runner.saves[0].state).toBe('error');
		online = true;
		await vi.advanceTimersByTimeAsync(3_000);
		expect(runner.saves[0].state).toBe('saved');
		expect(calls).toHaveLength(2);
		expect(runner.remainingMs).toBeNull();
	});

	it('prints the clock in minutes and seconds, and hours from an hour up', () => {
		expect(formatClock(59_001)).toBe('1:00');
		expect(formatClock(40 * 60_000)).toBe('40:00');
		expect(formatClock(3_600_000 + 5_000)).toBe('1:00:05');
		expect(formatClock(0)).toBe('0:00');
	});
});

describe('the practice session (client state)', () => {
	it('counts a checked answer toward the streak and the topic, but not a slip', async () => {
		const replies = [
			{ status: 200, body: { generator: 'end-thrust', seed: 1, kind: 'numeric', unit: 'kN', topic: 'End thrust', prompt: 'p' } },
			{ status: 200, body: { correct: true, outcome: 'correct', message: 'Right', expected: { value: 1, unit: 'kN' }, steps: [] } },
			{ status: 200, body: { correct: false, outcome: 'missing-unit', message: 'Give the unit', expected: { value: 1, unit: 'kN' }, steps: [] } },
			{ status: 200, body: { correct: false, outcome: 'wrong', message: 'No', expected: { value: 1, unit: 'kN' }, steps: [] } }
		];
		const { fn, calls } = fakeFetch(() => replies.shift()!);
		const session = new PracticeSession('packer-pressure-safety', [{ id: 'end-thrust', title: 'End thrust', topic: 'End thrust', extra: false }], fn);
		await session.next();
		expect(calls[0].url).toMatch(/^\/api\/v1\/practice\/end-thrust\?seed=\d+$/);
		expect(session.unit).toBe('kN');
		session.value = '1';
		await session.check();
		expect(session.record.streak).toBe(1);
		session.retry();
		await session.check();
		expect(session.record.streak).toBe(1);
		expect(session.topicRecord('End thrust')).toEqual({ answered: 1, right: 1 });
		session.retry();
		await session.check();
		expect(session.record).toMatchObject({ streak: 0, best: 1 });
		expect(session.accuracy).toEqual({ answered: 2, right: 1, percent: 50 });
		expect(JSON.parse(calls[1].body!)).toMatchObject({ seed: 1, answer: { value: '1', unit: 'kN' } });
	});
});
