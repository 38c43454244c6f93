/** States and grades of practical skills, shared by pages, the API and the server. */
export type SkillState = 'not started' | 'waiting' | 'returned' | 'signed off';
export type CriterionGrade = 'met' | 'not met' | 'not observed';

export interface CriterionResult {
	criterion: string;
	result: CriterionGrade;
	remark: string;
}

/** What each state is called on screen (word + icon + colour go together in SkillStateBadge). */
export const skillStateLabels: Record<SkillState, string> = {
	'not started': 'Not started',
	waiting: 'With a trainer',
	returned: 'Sent back',
	'signed off': 'Signed off'
};

export const gradeLabels: Record<CriterionGrade, string> = {
	met: 'Met',
	'not met': 'Not met',
	'not observed': 'Not observed'
};
