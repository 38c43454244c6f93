import { kitRoute, me } from '$lib/server/api-routes';

export const GET = kitRoute(me);
