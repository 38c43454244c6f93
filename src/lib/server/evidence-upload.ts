import type { TypedReadings } from '$lib/practicals/readings';
import { readingSpecs } from '$lib/practicals/readings';
import {
	assertMayAssessInPerson,
	assertMaySubmit,
	assessInPerson,
	checkEvidence,
	findSkill,
	SignOffError,
	submitEvidence,
	type AssessmentResult
} from './sign-offs';
import { db as defaultDb, type DB } from './db';
import { fileStore, type FileStore } from './storage';
import { checkStagedFiles, readMultipart, removeStored, storeCheckedFiles, type MultipartBody } from './uploads';

/**
 * The upload side of evidence: one multipart body (form action without JavaScript, or the
 * API with it) turned into a submission. Order matters: everything that can be refused is
 * checked before any file reaches the store, and stored files are removed again if the
 * database refuses the row, so a refused upload leaves nothing behind.
 */
export const FILE_FIELD = 'photos';

/** Readings arrive as `reading.<name>` with the unit in `reading.<name>.unit`. */
export function readingsFromFields(courseSlug: string, skillId: string, fields: Record<string, string>): TypedReadings {
	const typed: TypedReadings = {};
	for (const spec of readingSpecs(courseSlug, skillId)) {
		const value = fields[`reading.${spec.name}`];
		if (value !== undefined) typed[spec.name] = { value, unit: fields[`reading.${spec.name}.unit`] ?? spec.unit };
	}
	return typed;
}

/** Criteria grades arrive as `criterion.<i>` and `remark.<i>`. */
export function assessmentFromFields(fields: Record<string, string>, criteriaCount: number) {
	return {
		criteria: Array.from({ length: criteriaCount }, (_, i) => ({ result: fields[`criterion.${i}`] ?? '', remark: fields[`remark.${i}`] ?? '' })),
		outcome: fields.outcome ?? '',
		reasons: fields.reasons ?? '',
		place: fields.place ?? '',
		practicalDate: fields.practicalDate ?? '',
		signatureName: fields.signatureName ?? ''
	};
}

async function storeAndRecord<T>(body: MultipartBody, store: FileStore, record: (files: Awaited<ReturnType<typeof storeCheckedFiles>>) => Promise<T>): Promise<T> {
	const types = await checkStagedFiles(body.files);
	const stored = await storeCheckedFiles(types, store);
	try {
		return await record(stored);
	} catch (err) {
		await removeStored(stored, store);
		throw err;
	}
}

/** A trainee's evidence for one skill; returns the new submission's id. */
export async function receiveEvidence(
	request: Request,
	who: { traineeId: string; courseSlug: string; skillId: string },
	store: FileStore = fileStore(),
	db: DB = defaultDb
): Promise<{ submissionId: string; fields: Record<string, string> }> {
	await assertMaySubmit(who.traineeId, who.courseSlug, who.skillId, db);
	const body = await readMultipart(request, FILE_FIELD);
	try {
		const input = { ...who, note: body.fields.note ?? '', readings: readingsFromFields(who.courseSlug, who.skillId, body.fields) };
		checkEvidence(input);
		const submissionId = await storeAndRecord(body, store, (files) => submitEvidence({ ...input, files }, db));
		return { submissionId, fields: body.fields };
	} catch (err) {
		if (err instanceof SignOffError) err.values = body.fields;
		throw err;
	} finally {
		await body.discard();
	}
}

/** A trainer's in-person assessment: trainee, skill, readings, photos and grades in one form. */
export async function receiveInPersonAssessment(
	request: Request,
	trainerId: string,
	store: FileStore = fileStore(),
	db: DB = defaultDb
): Promise<{ result: AssessmentResult; fields: Record<string, string> }> {
	const body = await readMultipart(request, FILE_FIELD);
	try {
		const [courseSlug, skillId] = (body.fields.skill ?? '').split('/');
		const found = findSkill(courseSlug ?? '', skillId ?? '');
		if (!found) throw new SignOffError(400, 'Choose the skill.', { skill: 'Choose the skill.' });
		const traineeId = body.fields.traineeId ?? '';
		if (!traineeId) throw new SignOffError(400, 'Choose the trainee.', { traineeId: 'Choose the trainee.' });
		const input = { traineeId, courseSlug, skillId, trainerId, note: body.fields.note ?? '', readings: readingsFromFields(courseSlug, skillId, body.fields) };
		const raw = assessmentFromFields(body.fields, found.skill.criteria.length);
		checkEvidence(input);
		await assertMayAssessInPerson(trainerId, traineeId, courseSlug, skillId, db);
		const result = await storeAndRecord(body, store, (files) => assessInPerson({ ...input, files }, raw, db));
		return { result, fields: body.fields };
	} catch (err) {
		if (err instanceof SignOffError) err.values = body.fields;
		throw err;
	} finally {
		await body.discard();
	}
}
