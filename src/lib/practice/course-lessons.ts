/**
 * Which lesson of each course teaches a computed problem: the lesson that embeds the
 * calculator. Used to balance a course test across lessons and to point a wrong answer at
 * its lesson. A test checks every entry against the lesson files.
 */
const LESSONS: Record<string, Record<string, string>> = {
	'point-repair-installer': {
		'resin-quantity': 'resin-quantity',
		'laminate-volume': 'resin-quantity',
		'mat-size': 'measuring-and-sizing',
		'mix-ratio': 'materials',
		'pressure-window': 'placing-and-inflating',
		'cure-time': 'cure-and-witness-cup',
		'water-test': 'testing-and-records',
		'air-test': 'testing-and-records'
	},
	'transition-patches': {
		'transition-area': 'sizing-the-taper',
		'mat-size': 'sizing-the-taper',
		'pressure-window': 'packer-choice-and-preconditioning',
		'end-thrust': 'thrust-on-the-step',
		'cure-time': 'checking-both-sides',
		'water-test': 'testing-the-transition'
	},
	'packer-pressure-safety': {
		'groundwater-head': 'pressure-units',
		'pressure-window': 'groundwater-head-and-pressure-window',
		'end-thrust': 'end-thrust',
		'cure-time': 'hoses-gauges-relief-valves'
	}
};

/** The lesson slug within `courseSlug` for a generator, or null when the course has none. */
export function lessonForGenerator(courseSlug: string, generatorId: string): string | null {
	const course = Object.hasOwn(LESSONS, courseSlug) ? LESSONS[courseSlug] : undefined;
	return course && Object.hasOwn(course, generatorId) ? course[generatorId] : null;
}

/** Every (course, generator, lesson) entry, for tests. */
export function generatorLessonEntries(): [string, string, string][] {
	return Object.entries(LESSONS).flatMap(([course, map]) => Object.entries(map).map(([gen, lesson]) => [course, gen, lesson] as [string, string, string]));
}

/**
 * The generators a course's practice page drills: its test generators, then the advanced
 * ones as an optional extra (practice never counts).
 */
export function practiceGenerators(testGenerators: string[], all: { id: string; level: string }[]): { id: string; extra: boolean }[] {
	const extra = all.filter((g) => g.level === 'advanced' && !testGenerators.includes(g.id)).map((g) => ({ id: g.id, extra: true }));
	return [...testGenerators.map((id) => ({ id, extra: false })), ...extra];
}
