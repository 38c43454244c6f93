import { boardCsv } from '$lib/compliance/csv';
import { boardFor } from '$lib/server/company-board';
import type { RequestHandler } from './$types';

/** The board as CSV, with the page's filters and sorting. */
export const GET: RequestHandler = async (event) => {
	const board = await boardFor(event);
	return new Response(`\ufeff${boardCsv(board.view)}`, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="compliance-board-${board.today}.csv"`,
			'cache-control': 'private, no-store'
		}
	});
};
