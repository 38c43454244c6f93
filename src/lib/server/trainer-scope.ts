/**
 * Whose work a trainer may see and act on (DESIGN: trainer role).
 *
 * - A trainer of the training provider (a trainer grant without a company) and a registrar
 *   work with everyone.
 * - A company's own trainer (a trainer grant with `company_id`) works only with that
 *   company's crew: the people with a membership in that company.
 * - Anyone else works with nobody.
 *
 * Every trainer page and API reaches trainee data through domain functions that apply this
 * scope (`trainerMaySee` for one person, `inTrainerScope` to restrict a query); out of scope
 * is answered as "not found", so that ids of other companies' people reveal nothing.
 */
import { sql, type Expression, type ExpressionBuilder, type SqlBool } from 'kysely';
import { db as defaultDb, type DB } from './db';

export type TrainerScope = { kind: 'everyone' } | { kind: 'companies'; companyIds: string[] } | { kind: 'nobody' };

/** The scope of the person's trainer and registrar grants. */
export async function trainerScope(viewerId: string, db: DB = defaultDb): Promise<TrainerScope> {
	const grants = await db
		.selectFrom('user_role')
		.select(['role', 'company_id'])
		.where('user_id', '=', viewerId)
		.where('role', 'in', ['trainer', 'registrar'])
		.execute();
	if (grants.some((g) => g.role === 'registrar' || g.company_id === null)) return { kind: 'everyone' };
	const companyIds = grants.map((g) => g.company_id).filter((id): id is string => id !== null);
	return companyIds.length > 0 ? { kind: 'companies', companyIds } : { kind: 'nobody' };
}

/** Whether the trainer (or registrar) may see and act on the trainee's attempts, answers and sign-offs. */
export async function trainerMaySee(trainerId: string, traineeId: string, db: DB = defaultDb): Promise<boolean> {
	const scope = await trainerScope(trainerId, db);
	if (scope.kind !== 'companies') return scope.kind === 'everyone';
	const member = await db
		.selectFrom('membership')
		.select('user_id')
		.where('user_id', '=', traineeId)
		.where('company_id', 'in', scope.companyIds)
		.executeTakeFirst();
	return !!member;
}

/**
 * A `where` filter keeping only rows whose `userIdColumn` (such as "test_attempt.user_id") is a
 * person in the scope: `query.where(inTrainerScope(scope, 'test_attempt.user_id'))`.
 */
export function inTrainerScope(scope: TrainerScope, userIdColumn: string) {
	return (eb: ExpressionBuilder<any, any>): Expression<SqlBool> => {
		if (scope.kind === 'everyone') return sql<SqlBool>`1 = 1`;
		if (scope.kind === 'nobody') return sql<SqlBool>`1 = 0`;
		return eb(
			eb.ref(userIdColumn),
			'in',
			eb.selectFrom('membership').select('membership.user_id').where('membership.company_id', 'in', scope.companyIds)
		);
	};
}

/** The company whose crew a trainer grant is limited to, by person: null for the provider's trainers. */
export async function trainerCompanies(userIds: string[], db: DB = defaultDb): Promise<Map<string, string | null>> {
	if (userIds.length === 0) return new Map();
	const rows = await db.selectFrom('user_role').select(['user_id', 'company_id']).where('role', '=', 'trainer').where('user_id', 'in', userIds).execute();
	return new Map(rows.map((r) => [r.user_id, r.company_id]));
}
