import { calculation, kitRoute } from '$lib/server/api-routes';

export const POST = kitRoute(calculation);
