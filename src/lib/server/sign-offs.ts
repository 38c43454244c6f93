import { db as defaultDb, type DB } from './db';

export interface CurrentSignOff {
	skillId: string;
	signedOffAt: string;
	trainerId: string;
	trainerName: string;
}

/**
 * The person's current sign-offs in a course (voided ones left out), oldest first.
 * `trainerName` is the name the trainer typed as their signature.
 */
export async function signedOffSkills(userId: string, courseSlug: string, db: DB = defaultDb): Promise<CurrentSignOff[]> {
	const rows = await db
		.selectFrom('sign_off')
		.innerJoin('practical_assessment', 'practical_assessment.id', 'sign_off.assessment_id')
		.select([
			'sign_off.skill_id as skillId',
			'sign_off.signed_off_at as signedOffAt',
			'sign_off.trainer_id as trainerId',
			'practical_assessment.signature_name as trainerName'
		])
		.where('sign_off.user_id', '=', userId)
		.where('sign_off.course_slug', '=', courseSlug)
		.where('sign_off.voided_at', 'is', null)
		.orderBy('sign_off.signed_off_at')
		.execute();
	return rows;
}
