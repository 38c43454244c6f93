import { courses, getCourse, getLesson, type Course, type Lesson } from '$lib/content';
import { db as defaultDb, inTransaction, type DB } from './db';
import { isEnrolled, listEnrolments } from './enrolments';

/**
 * Reading progress: which lessons a person has marked as done, and where to carry on.
 * Only enrolled people record progress; a preview lesson is open to read without it.
 */

export interface LessonLink {
	slug: string;
	title: string;
	href: string;
	order: number;
}

export interface CourseProgress {
	courseSlug: string;
	done: number;
	total: number;
	/** Whole percent, 0-100, rounded down so 100 means every lesson is done. */
	percent: number;
	doneLessons: string[];
	/** Where to carry on reading; null once every lesson is done. */
	next: LessonLink | null;
	/** UTC ISO time of the latest completion, or null. */
	lastDoneAt: string | null;
}

export interface Completion {
	lesson_slug: string;
	completed_at: string;
}

const linkTo = (lesson: Lesson): LessonLink => ({ slug: lesson.slug, title: lesson.title, href: lesson.href, order: lesson.order });

/**
 * Pure: progress through `course` from its completion rows. Rows for lessons no longer in
 * the course are ignored. The next lesson is the first not-done lesson after the one done
 * most recently, wrapping round to the start, so a reader who skips ahead carries on there.
 */
export function summariseProgress(course: Course, completions: Completion[]): CourseProgress {
	const known = completions.filter((c) => course.lessons.some((l) => l.slug === c.lesson_slug));
	const doneSet = new Set(known.map((c) => c.lesson_slug));
	const orderOf = (slug: string) => course.lessons.findIndex((l) => l.slug === slug);
	const latest = [...known].sort(
		(a, b) => b.completed_at.localeCompare(a.completed_at) || orderOf(b.lesson_slug) - orderOf(a.lesson_slug)
	)[0];
	const total = course.lessons.length;
	const start = latest ? orderOf(latest.lesson_slug) + 1 : 0;
	let next: LessonLink | null = null;
	for (let i = 0; i < total; i++) {
		const lesson = course.lessons[(start + i) % total];
		if (!doneSet.has(lesson.slug)) {
			next = linkTo(lesson);
			break;
		}
	}
	return {
		courseSlug: course.slug,
		done: doneSet.size,
		total,
		percent: total ? Math.floor((doneSet.size / total) * 100) : 0,
		doneLessons: course.lessons.filter((l) => doneSet.has(l.slug)).map((l) => l.slug),
		next,
		lastDoneAt: latest?.completed_at ?? null
	};
}

/** A person's completion rows in a course (shared by `listCompletions` and the lesson view's prepared read). */
export const completionRows = (db: DB, userId: string, courseSlug: string) =>
	db.selectFrom('lesson_progress').select(['lesson_slug', 'completed_at']).where('user_id', '=', userId).where('course_slug', '=', courseSlug);

export function listCompletions(userId: string, courseSlug: string, db: DB = defaultDb): Promise<Completion[]> {
	return completionRows(db, userId, courseSlug).execute();
}

export async function getCourseProgress(userId: string, course: Course, db: DB = defaultDb): Promise<CourseProgress> {
	return summariseProgress(course, await listCompletions(userId, course.slug, db));
}

export interface EnrolledCourse {
	slug: string;
	title: string;
	code: string;
	href: string;
	progress: CourseProgress;
}

/** The person's enrolled courses (catalogue order) with their progress; unknown slugs are skipped. */
export async function listEnrolledProgress(userId: string, db: DB = defaultDb): Promise<EnrolledCourse[]> {
	const enrolled = new Set((await listEnrolments(userId, db)).map((e) => e.course_slug));
	const rows = await db
		.selectFrom('lesson_progress')
		.select(['course_slug', 'lesson_slug', 'completed_at'])
		.where('user_id', '=', userId)
		.execute();
	return courses
		.filter((c) => enrolled.has(c.slug))
		.map((course) => ({
			slug: course.slug,
			title: course.title,
			code: course.code,
			href: `/courses/${course.slug}`,
			progress: summariseProgress(course, rows.filter((r) => r.course_slug === course.slug))
		}));
}

export type ProgressChange =
	| { ok: true; progress: CourseProgress }
	| { ok: false; reason: 'unknown-lesson' | 'not-enrolled' };

/**
 * Marks a lesson done (keeping the first completion time) or not done. The enrolment check
 * and the write share one transaction, so an enrolment removed meanwhile records nothing.
 */
export async function setLessonDone(
	userId: string,
	courseSlug: string,
	lessonSlug: string,
	done: boolean,
	db: DB = defaultDb
): Promise<ProgressChange> {
	const course = getCourse(courseSlug);
	if (!course || !getLesson(courseSlug, lessonSlug)) return { ok: false, reason: 'unknown-lesson' };
	return inTransaction(db, async (trx) => {
		if (!(await isEnrolled(userId, courseSlug, trx))) return { ok: false, reason: 'not-enrolled' } as const;
		if (done) {
			await trx
				.insertInto('lesson_progress')
				.values({ user_id: userId, course_slug: courseSlug, lesson_slug: lessonSlug, completed_at: new Date().toISOString() })
				.onConflict((oc) => oc.doNothing())
				.execute();
		} else {
			await trx
				.deleteFrom('lesson_progress')
				.where('user_id', '=', userId)
				.where('course_slug', '=', courseSlug)
				.where('lesson_slug', '=', lessonSlug)
				.execute();
		}
		return { ok: true, progress: await getCourseProgress(userId, course, trx) } as const;
	});
}

/**
 * What a person may do with a lesson: `enrolled` reads and records progress, `preview` reads
 * only (a preview lesson for someone not enrolled); `sign-in` and `not-enrolled` may not read.
 */
export type ReadingState = 'enrolled' | 'preview' | 'sign-in' | 'not-enrolled';

export function readingState(signedIn: boolean, enrolled: boolean, lesson: Lesson): ReadingState {
	if (enrolled) return 'enrolled';
	if (lesson.preview) return 'preview';
	return signedIn ? 'not-enrolled' : 'sign-in';
}
