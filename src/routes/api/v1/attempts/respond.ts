import { apiError, codeForStatus } from '$lib/server/api';
import type { Refusal } from '$lib/server/attempts';

/** A refused test action in the API's error shape, with the machine reason, and the summary or retry time when any. */
export function refusal(r: Refusal): Response {
	const { status, message, reason, errors, summary, availableAt } = r;
	return apiError(status, codeForStatus(status), message, errors, { reason, extra: { ...(summary ? { summary } : {}), ...(availableAt ? { availableAt } : {}) } });
}

export const resultUrl = (courseSlug: string, attemptId: string) => `/courses/${courseSlug}/test/${attemptId}`;
