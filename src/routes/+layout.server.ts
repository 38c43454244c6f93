import { viewerOf } from '$lib/server/viewer';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals }) => viewerOf(locals.user);
