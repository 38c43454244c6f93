import { kitRoute, practiceProblem } from '$lib/server/api-routes';

export const GET = kitRoute(practiceProblem);
