/**
 * The audit log in words: who did what to whom, for the registrar's page and its CSV export.
 * Pure, so the page, the export and the tests share it. Each capability that records a new
 * action adds one line to `phrases` (and `actionLabels`, for the filter); an action without
 * one still reads as a sentence.
 */
export interface AuditView {
	id: number;
	at: string;
	action: string;
	subjectType: string;
	subjectId: string;
	/** Parsed detail; {} when it was not an object. */
	detail: Record<string, unknown>;
	actor: string | null;
	/** The person the entry is about, when there is one (the subject user, an attempt's trainee). */
	subject: string | null;
	/** A company's name, for company entries. */
	company?: string | null;
}

/** Course titles by slug, so that "point-repair-installer" reads as its title. */
export type CourseTitles = Record<string, string>;

export const actionLabels: Record<string, string> = {
	'role.grant': 'Role granted',
	'role.revoke': 'Role removed',
	'enrolment.create': 'Enrolled in a course',
	'company.create': 'Company created',
	'membership.set': 'Company membership set',
	'password.reset': 'Password reset',
	'user.sign-up': 'Account created',
	'user.address-confirmed': 'E-mail address confirmed',
	'user.signed-out-everywhere': 'Signed out everywhere',
	'role.trainer-scope': 'Trainer’s crew set',
	'test.start': 'Course test started',
	'test.submit': 'Course test submitted',
	'test.wait-waived': 'Wait before a retake lifted',
	'certificate.reminder': 'Expiry reminder sent',
	'renewal.start': 'Renewal started',
	'renewal.complete': 'Certificate renewed'
};

const roleWords: Record<string, string> = { trainer: 'trainer', inspector: 'inspector', registrar: 'registrar' };

function text(value: unknown): string {
	return typeof value === 'string' ? value : typeof value === 'number' || typeof value === 'boolean' ? String(value) : '';
}

type Phrase = (e: AuditView, actor: string, subject: string, course: string) => string;

const phrases: Record<string, Phrase> = {
	'role.grant': (e, actor, subject) => `${actor} granted the ${roleWords[text(e.detail.role)] ?? text(e.detail.role)} role to ${subject}.`,
	'role.revoke': (e, actor, subject) => `${actor} removed the ${roleWords[text(e.detail.role)] ?? text(e.detail.role)} role from ${subject}.`,
	'enrolment.create': (e, actor, subject, course) =>
		e.detail.source === 'self' ? `${subject} enrolled in ${course}.` : `${actor} enrolled ${subject} in ${course}.`,
	'company.create': (e, actor) => `${actor} created the company ${text(e.detail.name) || e.company || 'without a name'}.`,
	'membership.set': (e, actor, subject) =>
		`${actor} made ${subject} ${e.detail.role === 'admin' ? 'a company admin' : 'a crew member'}${e.company ? ` of ${e.company}` : ''}.`,
	'password.reset': (_e, _actor, subject) => `${subject} chose a new password through a reset link.`,
	'user.sign-up': (_e, _actor, subject) => `${subject} created an account.`,
	'user.address-confirmed': (_e, _actor, subject) => `${subject} confirmed their e-mail address.`,
	'user.signed-out-everywhere': (e, actor, subject) =>
		`${actor} signed ${subject} out everywhere (${typeof e.detail.sessions === 'number' ? e.detail.sessions : 'all'} ${e.detail.sessions === 1 ? 'session' : 'sessions'} ended).`,
	'role.trainer-scope': (e, actor, subject) =>
		e.detail.companyId ? `${actor} limited ${subject} as a trainer to one company’s crew${e.company ? ` (${e.company})` : ''}.` : `${actor} let ${subject} train everyone.`,
	'test.start': (e, _actor, subject, course) => `${subject} started attempt ${text(e.detail.attempt) || ''} of the ${course} course test.`.replace('attempt  of', 'an attempt of'),
	'test.submit': (e, actor, subject, course) => {
		const score = typeof e.detail.scorePercent === 'number' ? `${e.detail.scorePercent} %` : 'a score';
		const outcome = e.detail.passed === true ? 'passed' : 'not passed';
		const how = e.detail.closedBy === 'time limit' ? ' when time ran out' : '';
		return `${e.actor ? actor : subject} submitted the ${course} course test${how}: ${score}, ${outcome}.`.replace(/^(.)/, (c) => c.toUpperCase());
	},
	'test.wait-waived': (e, actor, subject, course) =>
		`${actor} let ${subject} retake the ${course} course test before the wait ended. Reason: ${text(e.detail.reason) || 'none given (recorded before reasons were asked)'}.`,
	'certificate.reminder': (e) =>
		`The system reminded ${text(e.detail.to) || 'someone'} (${text(e.detail.recipientRole) || 'recipient'}) that certificate ${text(e.detail.number)} expires in ${text(e.detail.daysLeft)} days (${text(e.detail.thresholdDays)}-day reminder).`,
	'renewal.start': (e, actor, _subject, course) => `${actor} started the renewal of certificate ${text(e.detail.number)} (${course}).`,
	'renewal.complete': (e, _actor, _subject, course) =>
		`Certificate ${text(e.detail.number)} (${course}) was renewed by ${text(e.detail.replacedBy)}, valid until ${text(e.detail.expiresOn)}.`
};

/** One sentence for an entry. */
export function describeAudit(e: AuditView, courses: CourseTitles = {}): string {
	const actor = e.actor ?? 'The system';
	const subject = e.subject ?? (e.subjectType === 'user' ? 'a removed account' : e.company ?? `a ${e.subjectType.replace(/_/g, ' ')}`);
	const slug = text(e.detail.courseSlug);
	const course = courses[slug] ?? (slug || 'a course');
	const phrase = phrases[e.action];
	if (phrase) return phrase(e, actor, subject, course);
	return `${actor}: ${actionLabels[e.action] ?? e.action.replace(/[._-]/g, ' ')} (${subject}).`;
}

/** A cell that a spreadsheet would run as a formula is written as text. */
export function csvSafe(cell: string): string {
	return /^[=+\-@\t\r]/.test(cell) ? `'${cell}` : cell;
}
