/**
 * A trainee's real next step in one course, from what exists today: lessons, the course test,
 * and then whatever capability comes after (sign-offs, certificates). Pure, for the dashboard
 * and the course page alike.
 */
import { capabilities } from './capabilities';

export interface CourseStanding {
	slug: string;
	title: string;
	progress: { done: number; total: number; next: { href: string; title: string } | null };
	test: {
		passed: boolean;
		passedAt: string | null;
		open: boolean;
		attemptsLeft: number;
		/** Set while the wait after a failed attempt runs. */
		nextStartAt: string | null;
		blockedReason: 'not-enrolled' | 'passed' | 'no-attempts-left' | 'waiting' | null;
	};
}

export type NextStep =
	| { kind: 'read'; text: string; href: string; action: string }
	| { kind: 'resume-test'; text: string; href: string; action: string }
	| { kind: 'take-test'; text: string; href: string; action: string }
	| { kind: 'wait'; text: string; href: string; action: string; until: string }
	| { kind: 'ask'; text: string; href: string; action: string }
	| { kind: 'sign-offs'; text: string; href: string; action: string };

export function traineeNextStep(c: CourseStanding): NextStep {
	const course = `/courses/${c.slug}`;
	if (c.test.passed) {
		return {
			kind: 'sign-offs',
			text: capabilities.signOffs
				? 'Course test passed. Next: show a trainer each practical skill and get it signed off.'
				: 'Course test passed. Next: show a trainer each practical skill. Sign-offs are not recorded in Patchwright yet, so your trainer keeps the record for now.',
			href: `${course}#skills-heading`,
			action: 'See the practical skills'
		};
	}
	if (c.test.open) return { kind: 'resume-test', text: 'You have a course test in progress.', href: `${course}/test`, action: 'Resume the course test' };
	if (c.test.blockedReason === 'waiting' && c.test.nextStartAt) {
		return { kind: 'wait', text: 'Not passed this time. Practise while you wait for the next attempt.', href: `${course}/practice`, action: 'Practice problems', until: c.test.nextStartAt };
	}
	if (c.test.blockedReason === 'no-attempts-left') {
		return { kind: 'ask', text: 'Every attempt at the course test is used. Ask your trainer or the training provider what comes next.', href: course, action: 'The course' };
	}
	if (c.progress.next) {
		return {
			kind: 'read',
			text: c.progress.done === 0 ? 'Start with the first lesson.' : `${c.progress.done} of ${c.progress.total} lessons done.`,
			href: c.progress.next.href,
			action: `${c.progress.done === 0 ? 'Start' : 'Continue'}: ${c.progress.next.title}`
		};
	}
	return { kind: 'take-test', text: 'Every lesson read. Next: the course test.', href: `${course}/test`, action: 'Go to the course test' };
}
