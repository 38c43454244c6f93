import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { getCourse, getLesson } from '$lib/content';
import { enrol } from '$lib/server/enrolments';
import {
	getCourseProgress,
	readingState,
	listEnrolledProgress,
	setLessonDone,
	summariseProgress
} from '$lib/server/progress';
import { createUser } from '$lib/server/users';
import { createTestDb } from '../helpers/db';

const COURSE = 'point-repair-installer';

describe('summariseProgress (pure)', () => {
	const course = getCourse(COURSE)!;
	const slugs = course.lessons.map((l) => l.slug);

	it('starts at the first lesson with nothing done', () => {
		const p = summariseProgress(course, []);
		expect(p).toMatchObject({ done: 0, total: course.lessons.length, percent: 0, next: { slug: slugs[0] }, lastDoneAt: null });
	});

	it('carries on after the lesson done most recently, wrapping round to skipped ones', () => {
		const p = summariseProgress(course, [
			{ lesson_slug: slugs[0], completed_at: '2025-01-01T10:00:00.000Z' },
			{ lesson_slug: slugs[4], completed_at: '2025-01-02T10:00:00.000Z' },
			{ lesson_slug: slugs[1], completed_at: '2025-01-01T11:00:00.000Z' }
		]);
		expect(p.next?.slug).toBe(slugs[5]);
		expect(p.doneLessons).toEqual([slugs[0], slugs[1], slugs[4]]);
		expect(p.lastDoneAt).toBe('2025-01-02T10:00:00.000Z');

		const last = summariseProgress(course, [{ lesson_slug: slugs.at(-1)!, completed_at: '2025-01-03T00:00:00.000Z' }]);
		expect(last.next?.slug).toBe(slugs[0]);
	});

	it('rounds down, so 100 % means every lesson, and ignores lessons no longer in the course', () => {
		const allButOne = slugs.slice(1).map((s) => ({ lesson_slug: s, completed_at: '2025-01-01T00:00:00.000Z' }));
		expect(summariseProgress(course, allButOne).percent).toBe(Math.floor(((slugs.length - 1) / slugs.length) * 100));
		const all = [...allButOne, { lesson_slug: slugs[0], completed_at: '2025-01-01T00:00:00.000Z' }, { lesson_slug: 'retired-lesson', completed_at: '2025-02-01T00:00:00.000Z' }];
		const p = summariseProgress(course, all);
		expect(p).toMatchObject({ done: slugs.length, percent: 100, next: null });
	});
});

describe('progress in the database', () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	let userId: string;
	beforeEach(async () => {
		db = await createTestDb();
		userId = (await createUser({ email: 'reader@example.test', name: 'Reader' }, db)).id;
	});
	afterEach(async () => db.destroy());

	it('refuses a person who is not enrolled, and an unknown lesson', async () => {
		expect(await setLessonDone(userId, COURSE, 'wet-out', true, db)).toEqual({ ok: false, reason: 'not-enrolled' });
		await enrol(null, userId, COURSE, 'registrar', db);
		expect(await setLessonDone(userId, COURSE, 'no-such-lesson', true, db)).toEqual({ ok: false, reason: 'unknown-lesson' });
		expect(await setLessonDone(userId, 'no-such-course', 'wet-out', true, db)).toEqual({ ok: false, reason: 'unknown-lesson' });
		expect(await db.selectFrom('lesson_progress').selectAll().execute()).toEqual([]);
	});

	it('marks done once, keeps the first time, and can undo', async () => {
		await enrol(null, userId, COURSE, 'registrar', db);
		const first = await setLessonDone(userId, COURSE, 'wet-out', true, db);
		expect(first.ok && first.progress).toMatchObject({ done: 1, doneLessons: ['wet-out'], next: { slug: 'packer-preparation' } });
		const firstTime = first.ok ? first.progress.lastDoneAt : null;
		await new Promise((r) => setTimeout(r, 5));
		const again = await setLessonDone(userId, COURSE, 'wet-out', true, db);
		expect(again.ok && again.progress).toMatchObject({ done: 1, lastDoneAt: firstTime });

		const undone = await setLessonDone(userId, COURSE, 'wet-out', false, db);
		expect(undone.ok && undone.progress).toMatchObject({ done: 0, doneLessons: [] });
		expect((await getCourseProgress(userId, getCourse(COURSE)!, db)).done).toBe(0);
	});

	it('keeps each person and course apart, and lists enrolled courses in catalogue order', async () => {
		const other = (await createUser({ email: 'other@example.test', name: 'Other' }, db)).id;
		for (const id of [userId, other]) await enrol(null, id, COURSE, 'registrar', db);
		await enrol(null, userId, 'packer-pressure-safety', 'registrar', db);
		await setLessonDone(userId, COURSE, 'the-job-and-defects', true, db);
		await setLessonDone(userId, 'packer-pressure-safety', 'pressure-units', true, db);

		const mine = await listEnrolledProgress(userId, db);
		expect(mine.map((c) => [c.slug, c.progress.done])).toEqual([
			[COURSE, 1],
			['packer-pressure-safety', 1]
		]);
		expect((await listEnrolledProgress(other, db))[0].progress.done).toBe(0);
	});

	it('opens preview lessons to everyone and the rest to enrolled people only', async () => {
		const preview = getLesson(COURSE, 'the-job-and-defects')!;
		const closed = getLesson(COURSE, 'wet-out')!;
		expect(preview.preview).toBe(true);
		expect(closed.preview).toBe(false);
		expect(readingState(false, false, preview)).toBe('preview');
		expect(readingState(true, false, preview)).toBe('preview');
		expect(readingState(false, false, closed)).toBe('sign-in');
		expect(readingState(true, false, closed)).toBe('not-enrolled');
		expect(readingState(true, true, closed)).toBe('enrolled');
		expect(readingState(true, true, preview)).toBe('enrolled');
	});

	it('forgets progress when the person is deleted', async () => {
		await enrol(null, userId, COURSE, 'registrar', db);
		await setLessonDone(userId, COURSE, 'wet-out', true, db);
		await db.deleteFrom('User').where('id', '=', userId).execute();
		expect(await db.selectFrom('lesson_progress').selectAll().execute()).toEqual([]);
	});
});
