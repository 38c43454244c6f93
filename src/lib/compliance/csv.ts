import Papa from 'papaparse';
import { csvSafe } from '../audit-words';
import { cellSummary, type BoardView } from './board';

/**
 * The board as CSV (RFC 4180, written by papaparse): the rows and columns the board shows, in
 * its order. For each course: where the person stands in words (exactly the board's text), the
 * current certificate's number and its expiry date. Cells a spreadsheet would run as a formula
 * (starting with = + - @, a tab or a carriage return) are written as text.
 */
export function boardCsv(view: BoardView): string {
	const fields = ['Name', 'E-mail', 'Company role'];
	for (const c of view.columns) fields.push(`${c.code} ${c.title}`, `${c.code} certificate number`, `${c.code} valid until`);
	const data = view.rows.map((row) => {
		const cells = [row.name, row.email, row.role === 'admin' ? 'Company admin' : 'Crew member'];
		for (const cell of row.cells) cells.push(cellSummary(cell), cell.certificate?.number ?? '', cell.certificate?.expiresOn ?? '');
		return cells.map(csvSafe);
	});
	return `${Papa.unparse({ fields: fields.map(csvSafe), data })}\r\n`;
}
