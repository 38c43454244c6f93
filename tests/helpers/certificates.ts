import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { DB } from '$lib/server/db';
import { enrol } from '$lib/server/enrolments';
import { createUser } from '$lib/server/users';

/** Points DATA_DIR (issuer key, stored files) at a fresh temporary folder. */
export function useTemporaryDataDir(): string {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-certs-'));
	process.env.DATA_DIR = dir;
	return dir;
}

export async function makeTraineeAndTrainer(db: DB, courseSlug: string | null, name = 'Ada Quillfeather') {
	const trainee = await createUser({ email: `${crypto.randomUUID().slice(0, 8)}@example.test`, name }, db);
	const trainerUser = await createUser({ email: `${crypto.randomUUID().slice(0, 8)}@example.test`, name: 'Bram Trainer' }, db);
	if (courseSlug) await enrol(null, trainee.id, courseSlug, 'registrar', db);
	return { trainee, trainer: { id: trainerUser.id, name: 'Bram Trainer' } };
}
