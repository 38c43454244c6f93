import { health, kitRoute } from '$lib/server/api-routes';

export const GET = kitRoute(health);
