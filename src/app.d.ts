import type { Identity } from '$lib/roles';

declare global {
	namespace App {
		interface Error {
			message: string;
			/** Reference shown to the person and written to the log for unexpected errors. */
			id?: string;
		}
		interface Locals {
			/** The signed-in person with roles and companies, loaded fresh on every request. */
			user: Identity | null;
			/** The open server-side session behind `user` (see $lib/server/sessions). */
			sessionId: string | null;
			/** Set by handleError when the database's write lock could not be had: the answer becomes 503. */
			databaseBusy: boolean;
			/** A lesson body this person may read, put into the page by the `lessonBody` hook (see $lib/server/lesson-html). */
			lessonBody?: Uint8Array;
			/** What the finished lesson page is kept under for readers in the same position (see $lib/server/lesson-page-store). */
			lessonPageKey?: string;
			/** Set by a load function whose page is the same for every visitor not signed in (see $lib/server/page-cache). */
			sharedForSeconds?: number;
		}
	}
}

export {};
