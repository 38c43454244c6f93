import { getCourse, getLesson, type Lesson } from '$lib/content';
import { hasRole, type Identity } from '$lib/roles';
import { getDb, type DB } from './db';
import { reusableQuery } from './db/engine';
import { enrolmentRow } from './enrolments';
import { completionRows, readingState, summariseProgress } from './progress';
import { unusedSeatRow } from './seats';

/**
 * What a lesson page shows a reader, decided in one place for the page's load function and for
 * the built server's front door (lesson-page-store.ts). Preview lessons are open to everyone;
 * the rest need an enrolment: a visitor is sent to sign in, a signed-in person without one is
 * refused. Trainers and registrars may read every lesson (to assess and to manage courses)
 * without keeping progress.
 */

export interface LessonPageData {
	course: { slug: string; title: string; code: string };
	lesson: { slug: string; title: string; order: number; minutes: number; preview: boolean; objectives: string[] };
	outline: { slug: string; title: string; order: number; minutes: number; preview: boolean; href: string }[];
	previous: LessonPageData['outline'][number] | null;
	next: LessonPageData['outline'][number] | null;
	enrolled: boolean;
	doneLessons: string[];
}

export type LessonView =
	| { kind: 'not-found' }
	| { kind: 'sign-in' }
	| { kind: 'not-enrolled'; courseTitle: string }
	/** `markSeat`: this reader's seat is not yet counted as in use, and opening this lesson counts it. */
	| { kind: 'page'; lesson: Lesson; data: LessonPageData; markSeat: boolean };

// A lesson page is the most read page there is: its three reads are built once and prepared on
// the read-only connection (committed rows only, so never inside a transaction).
const enrolmentRead = reusableQuery((db) => enrolmentRow(db, '', ''));
const completionsRead = reusableQuery((db) => completionRows(db, '', ''));
// parameters in the order the query names them: holder, course, product 'course'
const unusedSeatRead = reusableQuery((db) => unusedSeatRow(db, '', ''));

export async function lessonView(user: Identity | null, courseSlug: string, lessonSlug: string, db: DB = getDb()): Promise<LessonView> {
	const course = getCourse(courseSlug);
	const lesson = getLesson(courseSlug, lessonSlug);
	if (!course || !lesson) return { kind: 'not-found' };

	const enrolledNow = user ? (await enrolmentRead(db, [user.id, course.slug])).length > 0 : false;
	const state = readingState(user !== null, enrolledNow, lesson);
	if (state === 'sign-in') return { kind: 'sign-in' };
	const staff = hasRole(user, 'trainer') || hasRole(user, 'registrar');
	if (state === 'not-enrolled' && !staff) return { kind: 'not-enrolled', courseTitle: course.title };

	const outline = course.lessons.map(({ slug, title, order, minutes, preview, href }) => ({ slug, title, order, minutes, preview, href }));
	const at = outline.findIndex((l) => l.slug === lesson.slug);
	const enrolled = state === 'enrolled';
	// A seat counts as used from the first lesson opened beyond the free previews.
	const [doneLessons, markSeat] = await Promise.all([
		enrolled ? completionsRead(db, [user!.id, course.slug]).then((rows) => summariseProgress(course, rows).doneLessons) : ([] as string[]),
		enrolled && !lesson.preview ? unusedSeatRead(db, [user!.id, course.slug, 'course']).then((rows) => rows.length > 0) : false
	]);
	return {
		kind: 'page',
		lesson,
		markSeat,
		data: {
			course: { slug: course.slug, title: course.title, code: course.code },
			lesson: { slug: lesson.slug, title: lesson.title, order: lesson.order, minutes: lesson.minutes, preview: lesson.preview, objectives: lesson.objectives },
			outline,
			previous: outline[at - 1] ?? null,
			next: outline[at + 1] ?? null,
			enrolled,
			doneLessons
		}
	};
}
