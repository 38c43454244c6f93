import { courseSchema, lessonSchema, type CourseMeta, type LessonMeta } from './schema';

/**
 * The curriculum, indexed once from `content/courses/` at build time. Malformed front matter
 * fails loudly with the file's path. Only metadata is here: lesson bodies are rendered by the
 * server (`$lib/server/lesson-html`), never imported in browser code.
 * Question banks (with answers) are server-only: see `$lib/server/question-bank`.
 */

export interface Lesson extends LessonMeta {
	slug: string;
	courseSlug: string;
	href: string;
}

export interface Course extends CourseMeta {
	slug: string;
	/** Lessons in reading order. */
	lessons: Lesson[];
}

const courseFiles = import.meta.glob<Record<string, unknown>>('/content/courses/*/course.md', { eager: true, import: 'metadata' });
const lessonFiles = import.meta.glob<Record<string, unknown>>('/content/courses/*/lessons/*.md', { eager: true, import: 'metadata' });

function parseOrThrow<T>(schema: { safeParse(v: unknown): { success: true; data: T } | { success: false; error: { issues: { path: PropertyKey[]; message: string }[] } } }, value: unknown, file: string): T {
	const parsed = schema.safeParse(value);
	if (parsed.success) return parsed.data;
	const problems = parsed.error.issues.map((i) => `${i.path.join('.') || '(root)'}: ${i.message}`).join('; ');
	throw new Error(`Bad front matter in ${file}: ${problems}`);
}

function buildCatalogue(): Course[] {
	const courses: Course[] = [];
	for (const [file, metadata] of Object.entries(courseFiles)) {
		const slug = file.split('/')[3];
		const meta = parseOrThrow(courseSchema, metadata, file);
		const lessons: Lesson[] = Object.entries(lessonFiles)
			.filter(([path]) => path.startsWith(`/content/courses/${slug}/lessons/`))
			.map(([path, m]) => {
				const lessonSlug = path.split('/').pop()!.replace(/\.md$/, '');
				return { ...parseOrThrow(lessonSchema, m, path), slug: lessonSlug, courseSlug: slug, href: `/courses/${slug}/${lessonSlug}` };
			})
			.sort((a, b) => a.order - b.order);
		courses.push({ ...meta, slug, lessons });
	}
	const levelOrder = { foundation: 0, intermediate: 1, advanced: 2 };
	return courses.sort((a, b) => levelOrder[a.level] - levelOrder[b.level] || a.code.localeCompare(b.code));
}

export const courses: Course[] = buildCatalogue();

export function getCourse(slug: string): Course | undefined {
	return courses.find((c) => c.slug === slug);
}

export function getLesson(courseSlug: string, lessonSlug: string): Lesson | undefined {
	return getCourse(courseSlug)?.lessons.find((l) => l.slug === lessonSlug);
}
