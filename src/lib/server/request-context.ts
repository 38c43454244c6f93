import { AsyncLocalStorage } from 'node:async_hooks';

/**
 * What code deep inside Auth.js's callbacks needs to know about the request it serves: the
 * client's address (Auth.js hands its callbacks a rebuilt Request without it). The object is
 * also the key under which a request remembers what its form action already checked. Set by the first
 * hook for every request; nothing in it comes from a header the client could forge.
 */
export interface RequestContext {
	clientAddress: string;
}

const storage = new AsyncLocalStorage<RequestContext>();

export function withRequestContext<T>(context: RequestContext, work: () => T): T {
	return storage.run(context, work);
}

/** The current request's context; outside a request (scripts, tests) an anonymous local one. */
export function requestContext(): RequestContext {
	return storage.getStore() ?? { clientAddress: 'local' };
}
