import { error, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { getCourse } from '$lib/content';
import { requireUser } from '$lib/server/authz';
import { failWith, parseForm } from '$lib/server/form';
import { readerLocale } from '$lib/server/locale';
import { holdsCertificateOf, MAX_SEATS_PER_ORDER, OrderRefused, startOrder } from '$lib/server/orders';
import { isEnrolled } from '$lib/server/enrolments';
import type { Actions, PageServerLoad } from './$types';

/**
 * Buying seats: a company admin for the crew (1-200), anyone for themselves (one seat).
 * `?product=renewal` buys renewal seats (the shorter renewal path, at the course's renewal price);
 * a person buys one for themselves only when they hold the course's certificate.
 */
export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	const course = getCourse(event.params.course);
	if (!course) error(404, 'No such course');
	const product = event.url.searchParams.get('product') === 'renewal' ? 'renewal' : 'course';
	return {
		course: { slug: course.slug, title: course.title, code: course.code, priceCents: product === 'renewal' ? course.renewal.priceCents : course.priceCents, currency: course.currency },
		product,
		companies: user.companies.filter((c) => c.role === 'admin').map((c) => ({ id: c.id, name: c.name })),
		// for a renewal seat "enrolled" means the person cannot buy one for themselves: they hold no certificate to renew
		enrolled: product === 'renewal' ? !(await holdsCertificateOf(user.id, course.slug)) : await isEnrolled(user.id, course.slug),
		locale: readerLocale(event.request.headers.get('accept-language')),
		maxSeats: MAX_SEATS_PER_ORDER
	};
};

const buySchema = z.object({
	product: z.enum(['course', 'renewal'], { error: 'Choose course seats or renewal seats.' }).default('course'),
	buyer: z.string().trim().min(1, 'Choose who the seats are for.').max(64),
	quantity: z.coerce
		.number({ error: 'Enter a number of seats.' })
		.int('Enter a whole number of seats.')
		.min(1, 'Buy at least one seat.')
		.max(MAX_SEATS_PER_ORDER, `Buy at most ${MAX_SEATS_PER_ORDER} seats in one order.`)
});

export const actions: Actions = {
	default: async (event) => {
		const user = requireUser(event);
		const parsed = await parseForm(event.request, buySchema);
		if (!parsed.ok) return parsed.failure;
		const { buyer, quantity, product } = parsed.data;
		const companyId = buyer === 'self' ? null : buyer;
		let checkoutUrl: string | null;
		try {
			const order = await startOrder(user, { courseSlug: event.params.course, quantity: companyId ? quantity : 1, companyId, product }, event.url.origin);
			checkoutUrl = order.checkout_url;
		} catch (e) {
			if (e instanceof OrderRefused) return failWith(e.status === 502 ? 502 : 400, parsed.form, e.message, e.field ? { [e.field === 'companyId' ? 'buyer' : e.field]: e.message } : {});
			throw e;
		}
		if (!checkoutUrl) return failWith(502, parsed.form, 'The payment service gave no payment page. Nothing was charged.');
		redirect(303, checkoutUrl);
	}
};
