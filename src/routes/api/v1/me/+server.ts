import { json } from '@sveltejs/kit';
import { requireUser } from '$lib/server/authz';
import type { RequestHandler } from './$types';

/** The signed-in person's identity: roles and companies, never secrets. */
export const GET: RequestHandler = async (event) => json(requireUser(event));
