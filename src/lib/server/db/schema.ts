import type { Generated, Insertable, Selectable, Updateable } from 'kysely';

/** Column types match what SQLite returns: 0/1 for booleans, ISO-8601 UTC strings for times. */

export interface UserTable {
	id: string;
	name: string | null;
	email: string;
	emailVerified: string | null;
	image: string | null;
	passwordHash: string | null;
	createdAt: Generated<string>;
}

export interface AccountTable {
	id: Generated<string>;
	userId: string;
	type: string;
	provider: string;
	providerAccountId: string;
	refresh_token: string | null;
	access_token: string | null;
	expires_at: number | null;
	token_type: string | null;
	scope: string | null;
	id_token: string | null;
	session_state: string | null;
}

export interface SessionTable {
	id: Generated<string>;
	userId: string;
	sessionToken: string;
	expires: string;
}

export interface VerificationTokenTable {
	identifier: string;
	token: string;
	expires: string;
}

export type PlatformRole = 'trainer' | 'inspector' | 'registrar';
export type CompanyRole = 'admin' | 'member';

export interface UserRoleTable {
	user_id: string;
	role: PlatformRole;
	granted_at: string;
	granted_by: string | null;
	/** Trainer grants only: null for the training provider's trainer (everyone), else the one company whose crew this trainer works with. */
	company_id: Generated<string | null>;
}

export interface CompanyTable {
	id: string;
	name: string;
	created_at: string;
}

export interface MembershipTable {
	company_id: string;
	user_id: string;
	role: CompanyRole;
	created_at: string;
}

export interface PasswordResetTable {
	token_hash: string;
	user_id: string;
	expires_at: string;
	used_at: string | null;
}

/** A signed-in session; the session cookie carries its id. Ended sessions keep their row for the record. */
export interface UserSessionTable {
	id: string;
	user_id: string;
	created_at: string;
	last_seen_at: string;
	/** The latest moment it may be used, however active (SESSION_MAX_DAYS after sign-in). */
	expires_at: string;
	ended_at: string | null;
	ended_why: 'sign-out' | 'password-reset' | 'role-removed' | 'signed-out-everywhere' | null;
}

/** A link that confirms the address of an account created with a password (only the hash is kept). */
export interface AddressConfirmationTable {
	token_hash: string;
	user_id: string;
	expires_at: string;
	used_at: string | null;
}

export interface AuditLogTable {
	id: Generated<number>;
	at: string;
	actor_id: string | null;
	action: string;
	subject_type: string;
	subject_id: string;
	/** JSON text. */
	detail: Generated<string>;
}

export interface EnrolmentTable {
	user_id: string;
	course_slug: string;
	enrolled_at: string;
	/** How the enrolment came about: 'demo', 'registrar', later 'seat'. */
	source: string;
}

/** A lesson the person marked as done (slugs name content, not rows). */
export interface LessonProgressTable {
	user_id: string;
	course_slug: string;
	lesson_slug: string;
	completed_at: string;
}

/**
 * A course test attempt. `items` is the draw as JSON. Answers and per-item results live in
 * `test_answer` and `test_item_result`; the `answers` and `results` columns are left from
 * before migration 011 and no longer used.
 */
export interface TestAttemptTable {
	id: string;
	user_id: string;
	course_slug: string;
	started_at: string;
	deadline_at: string | null;
	submitted_at: string | null;
	closed_by: 'person' | 'time limit' | null;
	draw_seed: number;
	items: string;
	answers: Generated<string>;
	item_count: number;
	pass_mark: number;
	correct_count: number | null;
	score_percent: number | null;
	passed: 0 | 1 | null;
	results: Generated<string | null>;
	wait_waived_at: string | null;
	wait_waived_by: string | null;
}

/** One autosaved answer: `answer` is the JSON of an `ItemAnswer`. */
export interface TestAnswerTable {
	attempt_id: string;
	position: number;
	answer: string;
	saved_at: string;
}

/** How one item of a closed attempt was graded. */
export interface TestItemResultTable {
	attempt_id: string;
	position: number;
	correct: 0 | 1;
	answered: 0 | 1;
	hint: string | null;
}

export type SubmissionStatus = 'waiting' | 'withdrawn' | 'returned' | 'signed off';
export type AssessmentOutcome = 'signed off' | 'returned';

/**
 * Evidence for one practical skill. JSON text: `readings` (array of recorded readings).
 * `in_person` = 1 when a trainer recorded it at an assessment without prior evidence.
 */
export interface PracticalSubmissionTable {
	id: string;
	trainee_id: string;
	course_slug: string;
	skill_id: string;
	submitted_by: string;
	in_person: 0 | 1;
	note: string;
	readings: string;
	status: SubmissionStatus;
	submitted_at: string;
	closed_at: string | null;
}

/** A stored upload of a submission; the bytes live in the file store under `storage_key`. */
export interface EvidenceFileTable {
	id: string;
	submission_id: string;
	position: number;
	storage_key: string;
	thumbnail_key: string | null;
	original_name: string;
	media_type: string;
	size_bytes: number;
	sha256: string;
	width_px: number | null;
	height_px: number | null;
	uploaded_by: string;
	created_at: string;
}

/** A trainer's grading of one submission. JSON text: `criteria` (per-criterion results). */
export interface PracticalAssessmentTable {
	id: string;
	submission_id: string;
	trainer_id: string;
	outcome: AssessmentOutcome;
	criteria: string;
	reasons: string;
	place: string;
	/** The day the practical took place, YYYY-MM-DD. */
	practical_date: string;
	signature_name: string;
	assessed_at: string;
}

/** A skill signed off for a person; never deleted, voided by a registrar with a reason. */
export interface SignOffTable {
	id: string;
	user_id: string;
	course_slug: string;
	skill_id: string;
	assessment_id: string;
	trainer_id: string;
	signed_off_at: string;
	voided_at: string | null;
	voided_by: string | null;
	void_reason: string | null;
}

/** An issued certificate; what it shows is copied at issue and never follows later edits. */
export interface CertificateTable {
	id: string;
	/** Canonical number, 16 Crockford base32 symbols grouped XXXX-XXXX-XXXX-XXXX. */
	number: string;
	/** `<user id>|<course slug>` on the certificate holding the person's place for the course; null once replaced. */
	slot: string | null;
	user_id: string;
	course_slug: string;
	holder_name: string;
	course_code: string;
	course_title: string;
	scope: string;
	diameter_min_mm: number;
	diameter_max_mm: number;
	/** YYYY-MM-DD (UTC) of the latest sign-off and of the passed test. */
	practical_on: string;
	test_on: string;
	issued_at: string;
	issued_on: string;
	expires_on: string;
	/** JSON: [{ id, name }] of the trainers who signed off. */
	trainers: string;
	issuer_name: string;
	credential_jwt: string;
	revoked_at: string | null;
	revoked_by: string | null;
	revocation_reason: string | null;
	replaces_id: string | null;
	replaced_by_id: string | null;
}

/** One issued PDF of a certificate; its SHA-256 identifies the genuine file on upload. */
export interface CertificateFileTable {
	certificate_id: string;
	format: 'a4' | 'letter' | 'card';
	sha256: string;
	size_bytes: number;
	storage_key: string;
	created_at: string;
}

/** An inspector's crew check: the answers as they were at that moment (JSON rows). */
export interface CrewCheckTable {
	id: string;
	inspector_id: string;
	checked_at: string;
	label: string;
	results: string;
}

/** A scheduled job's lease: the process holding it runs the job until lease_until (see job-lease.ts). */
export interface JobLeaseTable {
	job_name: string;
	holder: string;
	lease_until: string;
	taken_at: string;
}

export interface Database {
	User: UserTable;
	Account: AccountTable;
	Session: SessionTable;
	VerificationToken: VerificationTokenTable;
	user_role: UserRoleTable;
	company: CompanyTable;
	membership: MembershipTable;
	password_reset: PasswordResetTable;
	user_session: UserSessionTable;
	address_confirmation: AddressConfirmationTable;
	audit_log: AuditLogTable;
	enrolment: EnrolmentTable;
	lesson_progress: LessonProgressTable;
	test_attempt: TestAttemptTable;
	test_answer: TestAnswerTable;
	test_item_result: TestItemResultTable;
	course_order: CourseOrderTable;
	seat: SeatTable;
	invitation: InvitationTable;
	payment_event: PaymentEventTable;
	practical_submission: PracticalSubmissionTable;
	evidence_file: EvidenceFileTable;
	practical_assessment: PracticalAssessmentTable;
	sign_off: SignOffTable;
	certificate: CertificateTable;
	certificate_file: CertificateFileTable;
	crew_check: CrewCheckTable;
	job_lease: JobLeaseTable;
	certificate_reminder: CertificateReminderTable;
	renewal: RenewalTable;
	rate_limit_count: RateLimitCountTable;
}

/** One rate-limit window per bucket and key, when the database is PostgreSQL (see rate-limit.ts). */
export interface RateLimitCountTable {
	key: string;
	points: number;
	/** End of the window, epoch milliseconds. */
	expire_ms: number;
}

export type User = Selectable<UserTable>;
export type NewUser = Insertable<UserTable>;
export type UserUpdate = Updateable<UserTable>;
export type Company = Selectable<CompanyTable>;
export type Membership = Selectable<MembershipTable>;
export type AuditEntry = Selectable<AuditLogTable>;

/** An expiry reminder claimed (sent_at null) or handed to the mail server; one per certificate, threshold and address. */
export interface CertificateReminderTable {
	id: string;
	certificate_id: string;
	/** 60, 30 or 7: the days before expiry this reminder is for. */
	threshold_days: number;
	recipient_email: string;
	recipient_id: string | null;
	recipient_role: 'holder' | 'company admin';
	claimed_at: string;
	sent_at: string | null;
	attempts: number;
}

/** A holder's renewal of one certificate, completed by the certificate that replaces it. */
export interface RenewalTable {
	id: string;
	certificate_id: string;
	user_id: string;
	course_slug: string;
	seat_id: string | null;
	started_at: string;
	completed_at: string | null;
	new_certificate_id: string | null;
}

/** What an order or a seat buys: the full course or the shorter renewal path. */
export type SeatProduct = 'course' | 'renewal';

export type OrderState = 'open' | 'paid' | 'expired' | 'cancelled' | 'refunded' | 'partly refunded';

/** A purchase of seats for one course. Amounts in the currency's minor unit. */
export interface CourseOrderTable {
	id: string;
	/** Shown to people and on the receipt. */
	number: string;
	buyer_id: string;
	/** Null when a person buys a seat for themselves. */
	company_id: string | null;
	course_slug: string;
	product: Generated<SeatProduct>;
	quantity: number;
	unit_amount: number;
	total_amount: number;
	/** ISO 4217, upper case. */
	currency: string;
	state: OrderState;
	checkout_session_id: string | null;
	checkout_url: string | null;
	payment_intent_id: string | null;
	refunded_quantity: number;
	refunded_amount: number;
	created_at: string;
	paid_at: string | null;
	updated_at: string;
}

/** One paid place on a course; assigned to a holder, in use from the first paid lesson opened. */
export interface SeatTable {
	id: string;
	order_id: string;
	company_id: string | null;
	course_slug: string;
	product: Generated<SeatProduct>;
	holder_id: string | null;
	assigned_at: string | null;
	used_at: string | null;
	refunded_at: string | null;
	created_at: string;
}

/** A single-use invitation to take a company's seat; only the token's SHA-256 is stored. */
export interface InvitationTable {
	id: string;
	token_hash: string;
	company_id: string;
	course_slug: string;
	email: string;
	name: string;
	invited_by: string | null;
	created_at: string;
	expires_at: string;
	accepted_at: string | null;
	accepted_by: string | null;
	withdrawn_at: string | null;
}

/** A payment-service webhook event already applied (or deliberately ignored). */
export interface PaymentEventTable {
	id: string;
	type: string;
	received_at: string;
	outcome: string;
}
