import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import jsQR from 'jsqr';
import Papa from 'papaparse';
import sharp from 'sharp';
import { extractText, getDocumentProxy } from 'unpdf';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { longDate } from '$lib/certificates/status';
import { cellSummary, readBoardQuery, viewBoard, type BoardView } from '$lib/compliance/board';
import { boardCsv } from '$lib/compliance/csv';
import { reloadConfig } from '$lib/server/config';
import { catalogue, crewListOf } from '$lib/server/company-board';
import { companyBoard } from '$lib/server/compliance';
import { CREW_LIST_CAPACITY, crewListSlot, renderCrewListPdf } from '$lib/server/pdf/crew-list';
import { createTestDb } from '../helpers/db';
import { useTemporaryDataDir } from '../helpers/certificates';
import { buildFixtureCompany, NOW, TODAY, type Fixture } from '../helpers/compliance-fixture';

describe('board exports', () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	let fx: Fixture;
	let dataDir: string;
	const view = async (query: string): Promise<BoardView> => {
		const rows = await companyBoard(fx.companyId, catalogue, { db, now: NOW });
		return viewBoard(rows, catalogue, readBoardQuery(new URLSearchParams(query), catalogue).filter);
	};

	beforeAll(async () => {
		process.env.ORIGIN = 'http://crew.example.test';
		dataDir = useTemporaryDataDir();
		db = await createTestDb();
		fx = await buildFixtureCompany(db);
	});
	afterAll(async () => {
		delete process.env.ORIGIN;
		reloadConfig();
		await db.destroy();
	});

	it('writes CSV that papaparse reads back to the board, cell by cell', async () => {
		for (const query of ['', 'expiring=60', 'course=packer-pressure-safety&sort=packer-pressure-safety&dir=desc', 'q=ivo,jen,eq']) {
			const board = await view(query);
			const parsed = Papa.parse<string[]>(boardCsv(board), { skipEmptyLines: true });
			expect(parsed.errors, query).toEqual([]);
			const [header, ...body] = parsed.data;
			expect(header.slice(0, 3)).toEqual(['Name', 'E-mail', 'Company role']);
			expect(header.slice(3)).toEqual(board.columns.flatMap((c) => [`${c.code} ${c.title}`, `${c.code} certificate number`, `${c.code} valid until`]));
			expect(body).toHaveLength(board.rows.length);
			body.forEach((line, i) => {
				const row = board.rows[i];
				const name = row.name.startsWith('=') ? `'${row.name}` : row.name;
				expect(line.slice(0, 3)).toEqual([name, row.email, row.role === 'admin' ? 'Company admin' : 'Crew member']);
				row.cells.forEach((cell, j) => {
					expect(line.slice(3 + 3 * j, 6 + 3 * j), `${query} ${row.name} ${board.columns[j].code}`).toEqual([cellSummary(cell), cell.certificate?.number ?? '', cell.certificate?.expiresOn ?? '']);
				});
			});
		}
	});

	it('neutralises every cell a spreadsheet would run as a formula (= + - @ tab CR at the start)', async () => {
		const board = await view('q=eq');
		const evil = ['=1+1', '+1', '-1', '@SUM(A1)', '\tx', '\rx'];
		board.rows[0] = { ...board.rows[0], name: evil[0] };
		board.rows.push(...evil.slice(1).map((name, i) => ({ ...board.rows[0], id: `x${i}`, name, email: `${name}@x.test` })));
		const parsed = Papa.parse<string[]>(boardCsv(board), { skipEmptyLines: true });
		const names = parsed.data.slice(1).map((r) => r[0]);
		expect(names).toEqual(evil.map((e) => `'${e}`));
		for (const line of parsed.data.slice(1)) for (const cell of line) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
	});

	it('makes a one-page crew list with each valid certificate, its number and a QR code to its verification page', async () => {
		const board = await view('');
		const list = crewListOf({ company: { id: fx.companyId, name: 'Fixture Drainage' }, companies: [], filter: readBoardQuery(new URLSearchParams(), catalogue).filter, notices: [], view: board, today: TODAY });
		// the fixture's valid certificates: Eve, Fay (PS-150), Gil, Hana, Kai (replacement), Lou (latest)
		expect(list.entries.map((e) => e.number).sort()).toEqual([fx.numbers.eve, fx.numbers.fay, fx.numbers.gil, fx.numbers.hana, fx.numbers.kai, fx.numbers.lou].sort());
		const bytes = await renderCrewListPdf(list);
		const pdf = await getDocumentProxy(new Uint8Array(bytes));
		expect(pdf.numPages).toBe(1);
		const { text } = await extractText(pdf, { mergePages: true });
		const flat = text.replace(/\s+/g, ' ');
		expect(flat).toContain('Crew list');
		expect(flat).toContain('Fixture Drainage');
		expect(flat).toContain(`6 certificates valid on ${longDate(TODAY)}`);
		for (const e of list.entries) {
			expect(flat).toContain(e.number);
			expect(flat).toContain(e.name);
			expect(flat).toContain(`Valid until ${longDate(e.expiresOn)}`);
		}
		for (const gone of [fx.numbers.ivo, fx.numbers.jen, fx.numbers.kaiOld, fx.numbers.louOld, fx.numbers.zed]) expect(flat).not.toContain(gone);

		// render with poppler, cut out each code where the layout puts it, decode with jsQR
		const file = path.join(dataDir, 'crew-list.pdf');
		fs.writeFileSync(file, bytes);
		const dpi = 150;
		execFileSync('pdftoppm', ['-r', String(dpi), '-png', '-singlefile', file, path.join(dataDir, 'crew-list')]);
		const image = sharp(path.join(dataDir, 'crew-list.png'));
		const { height } = await image.metadata();
		const px = (pt: number) => Math.round((pt * dpi) / 72);
		for (const [i, e] of list.entries.entries()) {
			const { qr } = crewListSlot(i);
			const margin = 6;
			const region = { left: px(qr.x) - margin, top: height! - px(qr.y - 2 + qr.size) - margin, width: px(qr.size) + 2 * margin, height: px(qr.size) + 2 * margin };
			const { data, info } = await sharp(path.join(dataDir, 'crew-list.png')).extract(region).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
			const code = jsQR(new Uint8ClampedArray(data.buffer, data.byteOffset, data.length), info.width, info.height);
			expect(code?.data, e.name).toBe(`http://crew.example.test/verify/${e.number}`);
		}
	});

	it('honours the board filters and refuses more than one page of certificates', async () => {
		const filtered = crewListOf({ company: { id: fx.companyId, name: 'Fixture Drainage' }, companies: [], filter: readBoardQuery(new URLSearchParams('expiring=30'), catalogue).filter, notices: [], view: await view('expiring=30'), today: TODAY });
		expect(filtered.entries.map((e) => e.number)).toEqual([fx.numbers.fay]);
		expect(filtered.filterWords).toBe('expiring within 30 days');
		const { text } = await extractText(await getDocumentProxy(new Uint8Array(await renderCrewListPdf(filtered))), { mergePages: true });
		expect(text.replace(/\s+/g, ' ')).toContain('1 certificate valid on');
		const many = { ...filtered, entries: Array.from({ length: CREW_LIST_CAPACITY + 1 }, () => filtered.entries[0]) };
		await expect(renderCrewListPdf(many)).rejects.toThrow(RangeError);
		const full = { ...filtered, entries: many.entries.slice(1) };
		expect((await getDocumentProxy(new Uint8Array(await renderCrewListPdf(full)))).numPages).toBe(1);
	});
});
