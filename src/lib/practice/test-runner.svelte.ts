/**
 * Client state of the course test runner. Talks only to the /api/v1/attempts routes: every
 * answer autosaves (typing is debounced), a failed save retries, the place in the test is kept
 * per attempt in localStorage so a reload resumes there, and the timer follows the server's
 * clock. When time runs out the attempt is submitted; the server grades it either way.
 */
import { errorMessage } from '$lib/api-error';
import { isAnswered, type ItemAnswer, type RunnerItem, type RunnerView } from './test-items';

export type RunnerData = Omit<RunnerView, 'status'>;

export type SaveState = { state: 'pending' | 'saving' | 'saved' | 'error'; message?: string };

const TYPING_DELAY_MS = 700;
const RETRY_DELAY_MS = 3000;

type Fetch = typeof fetch;

export class TestRunner {
	readonly id: string;
	readonly course: { slug: string; title: string };
	readonly items: RunnerItem[];
	answers = $state<Record<number, ItemAnswer>>({});
	saves = $state<Record<number, SaveState>>({});
	current = $state(0);
	/** The screen before submitting: what is unanswered, and the submit button. */
	reviewing = $state(false);
	submitting = $state(false);
	/** Where to go once the attempt is closed. */
	finishedAt = $state<string | null>(null);
	notice = $state<string | null>(null);
	private now = $state(Date.now());
	private readonly deadlineMs: number | null;
	/** Server clock minus this browser's clock. */
	private readonly offsetMs: number;
	private readonly timers = new Map<number, ReturnType<typeof setTimeout>>();
	private readonly inflight = new Map<number, Promise<void>>();

	readonly remainingMs = $derived.by(() => (this.deadlineMs === null ? null : Math.max(0, this.deadlineMs - (this.now + this.offsetMs))));
	readonly answeredCount = $derived.by(() => this.items.filter((i) => isAnswered(this.answers[i.position])).length);
	readonly unanswered = $derived.by(() => this.items.filter((i) => !isAnswered(this.answers[i.position])).map((i) => i.position));
	readonly allSaved = $derived.by(() => Object.values(this.saves).every((s) => s.state === 'saved'));
	readonly item = $derived.by(() => this.items[this.current]);

	constructor(
		data: RunnerData,
		private readonly fetcher: Fetch = (...args) => fetch(...args)
	) {
		this.id = data.id;
		this.course = data.course;
		this.items = data.items;
		this.answers = Object.fromEntries(Object.entries(data.answers).map(([k, v]) => [Number(k), v]));
		this.deadlineMs = data.deadlineAt ? Date.parse(data.deadlineAt) : null;
		this.offsetMs = Date.parse(data.serverNow) - Date.now();
		this.current = this.restorePlace();
	}

	private get placeKey() {
		return `patchwright:test:${this.id}:at`;
	}

	private restorePlace(): number {
		try {
			const at = Number(localStorage.getItem(this.placeKey));
			if (Number.isInteger(at) && at >= 0 && at < this.items.length) return at;
		} catch {
			// No storage: start at the first unanswered item.
		}
		const first = this.items.find((i) => !isAnswered(this.answers[i.position]));
		return first ? first.position : 0;
	}

	goTo(position: number) {
		if (position < 0 || position >= this.items.length) return;
		this.current = position;
		this.reviewing = false;
		try {
			localStorage.setItem(this.placeKey, String(position));
		} catch {
			// The place is a convenience; losing it loses nothing.
		}
	}

	next() {
		if (this.current === this.items.length - 1) this.reviewing = true;
		else this.goTo(this.current + 1);
	}

	previous() {
		if (this.reviewing) this.reviewing = false;
		else this.goTo(this.current - 1);
	}

	/** Records an answer and saves it, at once or after a pause in typing. */
	setAnswer(position: number, answer: ItemAnswer, typing = false) {
		this.answers[position] = answer;
		this.saves[position] = { state: 'pending' };
		clearTimeout(this.timers.get(position));
		this.timers.set(
			position,
			setTimeout(() => this.save(position), typing ? TYPING_DELAY_MS : 0)
		);
	}

	private save(position: number, keepalive = false): Promise<void> {
		const sending = this.send(position, keepalive).finally(() => {
			if (this.inflight.get(position) === sending) this.inflight.delete(position);
		});
		this.inflight.set(position, sending);
		return sending;
	}

	private async send(position: number, keepalive: boolean): Promise<void> {
		this.timers.delete(position);
		const answer = this.answers[position];
		if (!answer || this.finishedAt) return;
		this.saves[position] = { state: 'saving' };
		try {
			const response = await this.fetcher(`/api/v1/attempts/${this.id}/answers/${position}`, {
				method: 'PUT',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify(answer),
				keepalive
			});
			if (this.answers[position] !== answer) return; // A newer answer is on its way.
			if (response.ok) {
				this.saves[position] = { state: 'saved' };
				return;
			}
			const body = await response.json().catch(() => ({}));
			if (response.status === 409) {
				this.close(errorMessage(body, 'This attempt is closed.'));
				return;
			}
			this.saves[position] = { state: 'error', message: errorMessage(body, `Not saved (${response.status}).`) };
		} catch {
			this.saves[position] = { state: 'error', message: 'Not saved yet: no connection. Retrying…' };
			this.timers.set(
				position,
				setTimeout(() => this.save(position), RETRY_DELAY_MS)
			);
		}
	}

	/**
	 * Saves everything still waiting, now, and waits for saves already on their way.
	 * `keepalive` lets the requests outlive a closing tab.
	 */
	async flush(keepalive = false): Promise<void> {
		const waiting = Object.entries(this.saves)
			.filter(([k, s]) => s.state === 'pending' || s.state === 'error' || (s.state === 'saving' && !this.inflight.has(Number(k))))
			.map(([k]) => Number(k));
		for (const position of waiting) clearTimeout(this.timers.get(position));
		await Promise.all([...waiting.map((position) => this.save(position, keepalive)), ...this.inflight.values()]);
	}

	private close(message: string) {
		this.notice = message;
		this.finishedAt = `/courses/${this.course.slug}/test/${this.id}`;
	}

	/** Called every second by the page: moves the clock and submits when time is up. */
	tick() {
		this.now = Date.now();
		if (this.remainingMs === 0 && !this.submitting && !this.finishedAt) this.submit();
	}

	async submit(): Promise<void> {
		if (this.submitting || this.finishedAt) return;
		this.submitting = true;
		try {
			await this.flush();
			const response = await this.fetcher(`/api/v1/attempts/${this.id}/submit`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: '{}' });
			const body = await response.json().catch(() => ({}));
			if (response.ok || response.status === 409) this.close(response.ok ? 'Submitted.' : errorMessage(body, 'This attempt is closed.'));
			else this.notice = errorMessage(body, `The test could not be submitted (${response.status}). Try again.`);
		} catch {
			this.notice = 'No connection: the test is not submitted yet. Your saved answers are safe; try again.';
		} finally {
			this.submitting = false;
		}
	}
}

/** "39:58", or "1:05:00" from an hour up. */
export function formatClock(ms: number): string {
	const total = Math.ceil(ms / 1000);
	const h = Math.floor(total / 3600);
	const m = Math.floor((total % 3600) / 60);
	const s = total % 60;
	const mm = h > 0 ? String(m).padStart(2, '0') : String(m);
	return `${h > 0 ? `${h}:` : ''}${mm}:${String(s).padStart(2, '0')}`;
}
