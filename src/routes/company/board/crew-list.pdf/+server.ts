import { error } from '@sveltejs/kit';
import { boardFor, crewListOf } from '$lib/server/company-board';
import { CREW_LIST_CAPACITY, renderCrewListPdf } from '$lib/server/pdf/crew-list';
import type { RequestHandler } from './$types';

/** The one-page crew list of the board as filtered: each valid certificate with its verification QR. */
export const GET: RequestHandler = async (event) => {
	const board = await boardFor(event);
	const list = crewListOf(board);
	if (list.entries.length > CREW_LIST_CAPACITY) {
		error(409, `The crew list fits ${CREW_LIST_CAPACITY} certificates on one page and this board has ${list.entries.length}: narrow it by course, state or names first.`);
	}
	const bytes = await renderCrewListPdf(list);
	return new Response(bytes as unknown as BodyInit, {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `attachment; filename="crew-list-${board.today}.pdf"`,
			'cache-control': 'private, no-store'
		}
	});
};
