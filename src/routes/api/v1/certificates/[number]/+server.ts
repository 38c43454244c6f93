import { certificate, kitRoute } from '$lib/server/api-routes';

export const GET = kitRoute(certificate);
