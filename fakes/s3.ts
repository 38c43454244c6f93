/**
 * Local stand-in for S3-compatible object storage: s3rver (from the npm registry), an S3 REST
 * server that keeps objects in a folder and refuses unknown access keys (it does not recompute
 * SigV4 signatures). The app reaches it only through the AWS SDK and the S3_* settings
 * (path-style addressing).
 */
import fs from 'node:fs';
import { createRequire } from 'node:module';
import type { AddressInfo } from 'node:net';
import type S3rverClass from 's3rver';

// s3rver is CommonJS (module.exports = class); loaded the same way under vitest and jiti.
const S3rver = createRequire(import.meta.url)('s3rver') as typeof S3rverClass;

export interface S3FakeOptions {
	port: number;
	dir: string;
	bucket: string;
	host?: string;
}

/** s3rver's one account; requests signed with any other key are refused. */
export const S3_FAKE_KEY = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } as const;

export async function startS3Fake(options: S3FakeOptions) {
	const host = options.host ?? '127.0.0.1';
	fs.mkdirSync(options.dir, { recursive: true });
	const server = new S3rver({
		port: options.port,
		address: host,
		silent: true,
		directory: options.dir,
		configureBuckets: [{ name: options.bucket, configs: [] }]
	});
	const { port } = (await server.run()) as AddressInfo;
	const url = `http://${host}:${port}`;
	return {
		url,
		port,
		bucket: options.bucket,
		/** The app's settings for this fake. */
		env: {
			S3_ENDPOINT: url,
			S3_BUCKET: options.bucket,
			S3_REGION: 'us-east-1',
			S3_ACCESS_KEY_ID: S3_FAKE_KEY.accessKeyId,
			S3_SECRET_ACCESS_KEY: S3_FAKE_KEY.secretAccessKey,
			S3_FORCE_PATH_STYLE: '1'
		},
		close: () => server.close()
	};
}
