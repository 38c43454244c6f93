import { getCourse } from '$lib/content';
import { addMonths, issueIfEarned, revokeCertificate } from './certificates';
import type { DB } from './db';
import { recordPassedTest, recordSignOffs } from './demo-certificates';
import type { DemoPerson } from './demo-people';
import { setLessonDone } from './progress';

/**
 * More of Brindlewick Drainage's crew, so that its compliance board shows every state with
 * dates relative to the day the demo is seeded: with the people of demo-people.ts the board has
 * not enrolled (Jo), learning (Priya, some lessons read), skills signed off (Sam, Nell), test
 * passed (Cole), certified (Nell, Mae), expiring within 60 days (Owen, Mae), within 90 days
 * (Tom), expired (Ivo) and revoked (Bea).
 */
const company = { name: 'Brindlewick Drainage', role: 'member' } as const;

export const BOARD_DEMO_PEOPLE: DemoPerson[] = [
	{ name: 'Bea Holloway', email: 'bea@brindlewick.test', roles: [], company, part: 'PR-100 certificate revoked (a sign-off was withdrawn)', enrolments: ['point-repair-installer'] },
	{ name: 'Cole Farrant', email: 'cole@brindlewick.test', roles: [], company, part: 'PR-100 course test passed, no sign-off yet', enrolments: ['point-repair-installer'] },
	{ name: 'Mae Ridley', email: 'mae@brindlewick.test', roles: [], company, part: 'PR-100 expiring within 60 days; PS-150 valid', enrolments: ['point-repair-installer', 'packer-pressure-safety'] },
	{ name: 'Tom Quarrie', email: 'tom@brindlewick.test', roles: [], company, part: 'PS-150 expiring within 90 days', enrolments: ['packer-pressure-safety'] }
];

const DAY = 86_400_000;

export async function seedBoardDemo(byEmail: Map<string, string>, db: DB, now = new Date()): Promise<void> {
	const today = now.toISOString().slice(0, 10);
	const dayOf = (offsetDays: number, from = today) => new Date(Date.parse(`${from}T10:00:00Z`) + offsetDays * DAY);
	const trainer = { id: byEmail.get('trainer@fenmoor.test')!, name: 'Mira Calloway' };
	const registrar = byEmail.get('registrar@fenmoor.test')!;
	/** Issues the course's certificate on `issued`, after a passed test and every sign-off. */
	const certify = async (email: string, course: string, issued: Date) => {
		const userId = byEmail.get(email)!;
		await recordPassedTest(userId, course, new Date(issued.getTime() - 6 * DAY), db);
		await recordSignOffs(userId, course, trainer, issued, db);
		const outcome = await issueIfEarned(userId, course, { db, now: issued });
		if (!outcome.issued) throw new Error(`Board demo certificate for ${email} in ${course} was not issued`);
		return outcome.certificate;
	};
	/** The issue day that makes the certificate expire `days` from today. */
	const expiringIn = (course: string, days: number) => dayOf(0, addMonths(dayOf(days).toISOString().slice(0, 10), -getCourse(course)!.validityMonths));

	await certify('mae@brindlewick.test', 'point-repair-installer', expiringIn('point-repair-installer', 45));
	await certify('mae@brindlewick.test', 'packer-pressure-safety', dayOf(-100));
	await certify('tom@brindlewick.test', 'packer-pressure-safety', expiringIn('packer-pressure-safety', 80));
	const bea = await certify('bea@brindlewick.test', 'point-repair-installer', dayOf(-200));
	await revokeCertificate(registrar, bea.number, 'requirement-withdrawn', 'The wet-out sign-off was voided after a re-check.', { db, now: dayOf(-150) });
	await recordPassedTest(byEmail.get('cole@brindlewick.test')!, 'point-repair-installer', dayOf(-12), db);
	const priya = byEmail.get('priya@brindlewick.test')!;
	for (const lesson of getCourse('point-repair-installer')!.lessons.slice(0, 5)) await setLessonDone(priya, 'point-repair-installer', lesson.slug, true, db);
}
