/** The parts of s3rver 3.7 (no types of its own) that fakes/s3.ts uses. */
declare module 's3rver' {
	import type { AddressInfo } from 'node:net';

	interface S3rverOptions {
		port?: number;
		address?: string;
		silent?: boolean;
		directory: string;
		resetOnClose?: boolean;
		allowMismatchedSignatures?: boolean;
		configureBuckets?: { name: string; configs: (string | Buffer)[] }[];
	}

	export default class S3rver {
		constructor(options: S3rverOptions);
		run(): Promise<AddressInfo>;
		close(): Promise<void>;
		reset(): void;
	}
}
