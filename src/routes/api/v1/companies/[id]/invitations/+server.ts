import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { apiError, readBodyText, readJson } from '$lib/server/api';
import { requireCompanyAdmin } from '$lib/server/authz';
import { checkInvitations, courseRefs, inviteCrew, rowsFromInput } from '$lib/server/invitations';
import { MAX_ROSTER_BYTES, MAX_ROSTER_ROWS, parseRoster } from '$lib/roster';
import type { RequestHandler } from './$types';

const invitationList = z.strictObject({
	invitations: z
		.array(z.strictObject({ name: z.string().trim().min(1).max(120), email: z.string().trim().max(254), course: z.string().trim().min(1).max(200) }))
		.min(1)
		.max(MAX_ROSTER_ROWS)
});

/**
 * Invites people to the company's seats: a JSON list, or a CSV roster (`Content-Type: text/csv`).
 * All rows are checked first; when any row has an error nothing is sent and every row's errors
 * are returned. `?preview=1` only checks.
 */
export const POST: RequestHandler = async (event) => {
	const user = requireCompanyAdmin(event, event.params.id);
	const type = event.request.headers.get('content-type') ?? '';
	let rows;
	if (/^text\/csv\b/i.test(type)) {
		const read = await readBodyText(event.request, MAX_ROSTER_BYTES);
		if (!read.ok) return read.response;
		const parsed = parseRoster(read.text, courseRefs);
		if (parsed.problems.length) return apiError(400, 'bad_request', parsed.problems.join(' '), undefined, { reason: 'invalid-roster' });
		rows = parsed.rows;
	} else if (/^application\/json\b/i.test(type)) {
		const body = await readJson(event.request, invitationList, { maxBytes: MAX_ROSTER_BYTES });
		if (!body.ok) return body.response;
		rows = rowsFromInput(body.data.invitations);
	} else return apiError(415, 'unsupported_media_type', 'Send application/json or text/csv.');

	const report = (checked: typeof rows) => checked.map((r) => ({ line: r.line, name: r.name, email: r.email, course: r.courseSlug, errors: r.errors }));
	if (event.url.searchParams.get('preview') === '1') {
		const checked = await checkInvitations(event.params.id, rows);
		return json({ rows: report(checked), ok: checked.every((r) => r.errors.length === 0) });
	}
	const result = await inviteCrew(user.id, event.params.id, rows, event.url.origin);
	if (!result.ok) return apiError(422, 'bad_request', 'Some rows have errors; nothing was sent.', undefined, { reason: 'invalid-rows', extra: { rows: report(result.rows) } });
	return json({ sent: result.sent }, { status: 201 });
};
