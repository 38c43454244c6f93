import fs from 'node:fs';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import sharp from 'sharp';
import { config } from './config';
import { db as defaultDb, type DB } from './db';
import { gaugeSvg, rigBaySvg, wetOutSvg } from './demo-rig-photos';
import { assessInPerson, assessSubmission, submitEvidence } from './sign-offs';
import { fileStore, type FileStore } from './storage';
import { checkStagedFiles, storeCheckedFiles, type StagedFile } from './uploads';
import { findUserByEmail } from './users';
import { getCourse } from '$lib/content';

/** Renders drawn SVGs to JPEG and runs them through the upload pipeline, as a phone's photos would. */
async function photos(store: FileStore, svgs: { name: string; svg: string }[]) {
	const dir = path.join(config.dataDir, 'tmp');
	fs.mkdirSync(dir, { recursive: true });
	const staged: StagedFile[] = [];
	for (const { name, svg } of svgs) {
		const tempPath = path.join(dir, `${randomBytes(8).toString('hex')}.seed`);
		const jpeg = await sharp(Buffer.from(svg)).jpeg({ quality: 82 }).toBuffer();
		fs.writeFileSync(tempPath, jpeg);
		staged.push({ originalName: name, tempPath, sizeBytes: jpeg.length, tooLarge: false });
	}
	try {
		return await storeCheckedFiles(await checkStagedFiles(staged), store);
	} finally {
		for (const s of staged) fs.rmSync(s.tempPath, { force: true });
	}
}

const allMet = (course: string, skill: string) => getCourse(course)!.practicalSkills.find((s) => s.id === skill)!.criteria.map(() => ({ result: 'met', remark: '' }));
const daysAgo = (n: number) => new Date(Date.now() - n * 86_400_000).toISOString();

async function backdate(submissionId: string, days: number, db: DB) {
	await db.updateTable('practical_submission').set({ submitted_at: daysAgo(days) }).where('id', '=', submissionId).execute();
}

/**
 * The demo's practical state: Sam has two skills signed off, one waiting and one sent back
 * with a reason; Priya has evidence waiting; Ade has a transition skill signed off in person by
 * his company's own trainer and another waiting. Luca has nothing yet (the e2e test uses him).
 */
export async function seedDemoPracticals(db: DB = defaultDb, store: FileStore = fileStore()): Promise<void> {
	const id = async (email: string) => (await findUserByEmail(email, db))!.id;
	const [sam, priya, ade, mira, dana] = await Promise.all(['sam@brindlewick.test', 'priya@brindlewick.test', 'ade@tarnside.test', 'trainer@fenmoor.test', 'admin@tarnside.test'].map(id));
	const pri = 'point-repair-installer';
	const signature = { place: 'Fenmoor Training Yard, rig bay 2', signatureName: 'Mira Calloway' };

	const calc = await submitEvidence(
		{
			traineeId: sam,
			courseSlug: pri,
			skillId: 'job-calculations',
			note: 'Job sheet for the DN150 rig pipe, 600 mm patch, 3 plies.',
			readings: {
				diameterMm: { value: '150', unit: 'mm' },
				patchLengthMm: { value: '600', unit: 'mm' },
				plies: { value: '3', unit: '' },
				groundwaterHeadM: { value: '2', unit: 'm' },
				minPressureBar: { value: '0.5', unit: 'bar' },
				pipeTempC: { value: '12', unit: 'degC' },
				sheetCureMinutes: { value: '90', unit: 'min' }
			},
			files: await photos(store, [{ name: 'job-sheet-bay2.jpg', svg: rigBaySvg('Job sheet check, Sam Okafor') }])
		},
		db
	);
	await assessSubmission(calc, mira, { criteria: allMet(pri, 'job-calculations'), outcome: 'signed off', practicalDate: daysAgo(9).slice(0, 10), ...signature }, db);

	await assessInPerson(
		{ traineeId: sam, trainerId: mira, courseSlug: pri, skillId: 'packer-check', note: 'Watched on the rig.', readings: {}, files: await photos(store, [{ name: 'packer-check.jpg', svg: rigBaySvg('Packer leak check in the sleeve') }]) },
		{ criteria: allMet(pri, 'packer-check'), outcome: 'signed off', practicalDate: daysAgo(8).slice(0, 10), ...signature },
		db
	);

	const metering = await submitEvidence(
		{
			traineeId: sam,
			courseSlug: pri,
			skillId: 'resin-metering',
			note: 'Weighed on the bench scale.',
			readings: { totalKg: { value: '1.2', unit: 'kg' }, ratioA: { value: '100', unit: '' }, ratioB: { value: '50', unit: '' }, partAKg: { value: '0.9', unit: 'kg' }, partBKg: { value: '0.3', unit: 'kg' } },
			files: []
		},
		db
	);
	const metCriteria = allMet(pri, 'resin-metering');
	metCriteria[0] = { result: 'not met', remark: 'Part A 0.9 kg against 0.8 kg computed: outside ±2 %.' };
	await assessSubmission(metering, mira, { criteria: metCriteria, outcome: 'returned', reasons: 'Recheck the split: 100:50 by mass means two thirds part A. Weigh again and send the scale photo.', practicalDate: daysAgo(4).slice(0, 10), ...signature }, db);

	await backdate(
		await submitEvidence(
			{ traineeId: sam, courseSlug: pri, skillId: 'wet-out', note: 'Whole mat wetted out, edges included, 14 minutes into a 30 minute pot life.', readings: {}, files: await photos(store, [{ name: 'wet-out-1.jpg', svg: wetOutSvg() }]) },
			db
		),
		3,
		db
	);
	await backdate(
		await submitEvidence(
			{ traineeId: priya, courseSlug: pri, skillId: 'staged-inflation', note: 'Three stages, camera check after each.', readings: { pressureHeldBar: { value: '1.5', unit: 'bar' }, pipeTempC: { value: '11', unit: 'degC' } }, files: await photos(store, [{ name: 'gauge.jpg', svg: gaugeSvg(1.5) }, { name: 'bay.jpg', svg: rigBaySvg('Inflated in the DN150 test pipe') }]) },
			db
		),
		1,
		db
	);

	await assessInPerson(
		{ traineeId: ade, trainerId: dana, courseSlug: 'transition-patches', skillId: 'size-transition-mat', note: '', readings: { smallDiameterMm: { value: '100', unit: 'mm' }, largeDiameterMm: { value: '150', unit: 'mm' }, taperLengthMm: { value: '100', unit: 'mm' }, slantMm: { value: '103', unit: 'mm' } }, files: [] },
		{ criteria: allMet('transition-patches', 'size-transition-mat'), outcome: 'signed off', place: 'Tarnside yard, transition rig', practicalDate: daysAgo(6).slice(0, 10), signatureName: 'Dana Whitlow' },
		db
	);
	await submitEvidence(
		{ traineeId: ade, courseSlug: 'transition-patches', skillId: 'place-and-inflate', note: 'Restrained toward the larger pipe before the first stage.', readings: { pressureHeldBar: { value: '1.2', unit: 'bar' } }, files: await photos(store, [{ name: 'transition-gauge.jpg', svg: gaugeSvg(1.2) }]) },
		db
	);
}
