import { error, type RequestEvent } from '@sveltejs/kit';
import { courses } from '$lib/content';
import { boardCatalogue, readBoardQuery, stateLabels, validCertificates, viewBoard, type BoardFilter } from '$lib/compliance/board';
import { requireCompanyAdmin } from './authz';
import { companyBoard } from './compliance';
import { config } from './config';
import { verifyUrl } from './credential';
import { db as defaultDb, type DB } from './db';
import type { CrewListDocument } from './pdf/crew-list';

/** The board's course columns: every course of the catalogue. */
export const catalogue = boardCatalogue(courses);

type Event = Pick<RequestEvent, 'locals' | 'url'>;

/**
 * The company whose board is asked for (`?c=`, else the first the person runs). Someone who
 * runs no company gets 403; a company admin naming a company they do not run gets 404, so ids
 * of other companies reveal nothing.
 */
export function adminCompany(event: Event) {
	const user = requireCompanyAdmin(event);
	const adminOf = user.companies.filter((c) => c.role === 'admin');
	const wanted = event.url.searchParams.get('c');
	const company = wanted === null ? adminOf[0] : adminOf.find((c) => c.id === wanted);
	if (!company) error(404, 'Not found');
	return { user, company: { id: company.id, name: company.name }, companies: adminOf.map((c) => ({ id: c.id, name: c.name })) };
}

/** The board of the event's company with the filters of its address. */
export async function boardFor(event: Event, { db = defaultDb, now = new Date() }: { db?: DB; now?: Date } = {}) {
	const { company, companies } = adminCompany(event);
	const { filter, notices } = readBoardQuery(event.url.searchParams, catalogue);
	const rows = await companyBoard(company.id, catalogue, { db, now });
	return { company, companies, filter, notices, view: viewBoard(rows, catalogue, filter), today: now.toISOString().slice(0, 10) };
}

/** The filters in words, for the crew list's heading ("" for the whole crew). */
export function filterWords(filter: BoardFilter): string {
	const parts: string[] = [];
	const course = catalogue.find((c) => c.slug === filter.course);
	if (course) parts.push(`${course.code} ${course.title}`);
	if (filter.state) parts.push(stateLabels[filter.state].toLowerCase());
	if (filter.expiring) parts.push(`expiring within ${filter.expiring} days`);
	if (filter.q) parts.push(`names matching “${filter.q}”`);
	return parts.join(', ');
}

/** The crew-list document for a board view: its valid certificates with their verification links. */
export function crewListOf(board: Awaited<ReturnType<typeof boardFor>>, origin = config.origin): CrewListDocument {
	return {
		companyName: board.company.name,
		issuerName: config.issuerName,
		madeOn: board.today,
		filterWords: filterWords(board.filter),
		checkUrl: `${origin.replace(/^https?:\/\//, '')}/verify`,
		entries: validCertificates(board.view).map((c) => ({
			name: c.name,
			courseCode: c.course.code,
			courseTitle: c.course.title,
			number: c.number,
			expiresOn: c.expiresOn,
			verifyUrl: verifyUrl(c.number, origin)
		}))
	};
}
