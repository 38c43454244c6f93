/**
 * Client state of a course's practice page: the current problem from the practice API, the
 * answer being typed, the feedback, a streak and accuracy per topic. The record is kept in the
 * browser's localStorage only: practice never counts toward a certificate.
 */
import { errorMessage } from '$lib/api-error';
import type { Amount } from './grading';
import type { PublicProblem } from './index';
import type { Choice } from './types';
import { randomSeed } from './random';

export interface PracticeTopic {
	id: string;
	title: string;
	topic: string;
	extra: boolean;
}

export interface CheckFeedback {
	correct: boolean;
	outcome: string;
	message: string;
	expected: Amount | Choice;
	steps: string[];
	hint?: string;
}

interface TopicRecord {
	answered: number;
	right: number;
}

interface StoredRecord {
	streak: number;
	best: number;
	topics: Record<string, TopicRecord>;
}

const EMPTY: StoredRecord = { streak: 0, best: 0, topics: {} };

type Fetch = typeof fetch;

export class PracticeSession {
	problem = $state<(PublicProblem & { units?: string[] }) | null>(null);
	value = $state('');
	unit = $state('');
	choice = $state<string | null>(null);
	feedback = $state<CheckFeedback | null>(null);
	busy = $state(false);
	error = $state<string | null>(null);
	/** A generator id, or 'all' for a mix of the course's own. */
	focus = $state('all');
	record = $state<StoredRecord>(structuredClone(EMPTY));

	readonly accuracy = $derived.by(() => {
		const all = Object.values(this.record.topics);
		const answered = all.reduce((s, t) => s + t.answered, 0);
		const right = all.reduce((s, t) => s + t.right, 0);
		return { answered, right, percent: answered === 0 ? null : Math.round((right * 100) / answered) };
	});

	readonly canCheck = $derived(
		!!this.problem && !this.feedback && !this.busy && (this.problem.kind === 'choice' ? this.choice !== null : this.value.trim() !== '')
	);

	constructor(
		private readonly courseSlug: string,
		readonly topics: PracticeTopic[],
		private readonly fetcher: Fetch = (...args) => fetch(...args)
	) {}

	private get storageKey() {
		return `patchwright:practice:${this.courseSlug}`;
	}

	/** Reads the stored record; call once in the browser. */
	restore() {
		try {
			const text = localStorage.getItem(this.storageKey);
			if (text) {
				const stored = JSON.parse(text) as StoredRecord;
				if (typeof stored.streak === 'number' && stored.topics && typeof stored.topics === 'object') this.record = stored;
			}
		} catch {
			// A private window or a mangled record: start afresh.
		}
	}

	private save() {
		try {
			localStorage.setItem(this.storageKey, JSON.stringify(this.record));
		} catch {
			// Storage full or blocked: the record lives for this visit only.
		}
	}

	resetRecord() {
		this.record = structuredClone(EMPTY);
		this.save();
	}

	topicRecord(topic: string): TopicRecord {
		return this.record.topics[topic] ?? { answered: 0, right: 0 };
	}

	private pickGenerator(): string {
		if (this.focus !== 'all') return this.focus;
		const own = this.topics.filter((t) => !t.extra);
		const pool = own.length > 0 ? own : this.topics;
		const previous = this.problem?.generator;
		const others = pool.length > 1 ? pool.filter((t) => t.id !== previous) : pool;
		return others[Math.floor(Math.random() * others.length)].id;
	}

	/** Fetches a new problem (a fresh random seed each time). */
	async next() {
		this.busy = true;
		this.error = null;
		try {
			const generator = this.pickGenerator();
			const response = await this.fetcher(`/api/v1/practice/${encodeURIComponent(generator)}?seed=${randomSeed()}`);
			if (!response.ok) throw new Error(errorMessage(await response.json().catch(() => null), `The server answered ${response.status}.`));
			this.problem = await response.json();
			this.value = '';
			this.unit = this.problem?.unit ?? '';
			this.choice = null;
			this.feedback = null;
		} catch (e) {
			this.error = e instanceof Error ? e.message : 'The problem could not be loaded.';
		} finally {
			this.busy = false;
		}
	}

	/** Sends the answer to the check API and records the outcome. */
	async check() {
		const p = this.problem;
		if (!p || !this.canCheck) return;
		this.busy = true;
		this.error = null;
		try {
			const answer = p.kind === 'choice' ? { choice: this.choice } : { value: this.value, unit: this.unit };
			const response = await this.fetcher(`/api/v1/practice/${encodeURIComponent(p.generator)}/check`, {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify({ seed: p.seed, answer })
			});
			const body = await response.json().catch(() => null);
			if (!response.ok) throw new Error(errorMessage(body, `The server answered ${response.status}.`));
			this.feedback = body;
			// A typing slip (empty, not a number, no unit) is not counted as an attempt.
			if (body.outcome === 'correct' || body.outcome === 'wrong') this.count(p.topic, body.correct);
		} catch (e) {
			this.error = e instanceof Error ? e.message : 'The answer could not be checked.';
		} finally {
			this.busy = false;
		}
	}

	private count(topic: string, correct: boolean) {
		const t = this.topicRecord(topic);
		const streak = correct ? this.record.streak + 1 : 0;
		this.record = {
			streak,
			best: Math.max(this.record.best, streak),
			topics: { ...this.record.topics, [topic]: { answered: t.answered + 1, right: t.right + (correct ? 1 : 0) } }
		};
		this.save();
	}

	/** Lets the person try again after a slip that was not counted (empty, no unit ...). */
	retry() {
		this.feedback = null;
	}
}
