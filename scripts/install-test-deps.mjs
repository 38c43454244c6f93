// Installs what the tests need from Debian: chromium (Playwright drives /usr/bin/chromium; it
// never downloads a browser of its own), poppler-utils (PDF checks) and postgresql (the real
// server the suites also run against; scripts/postgres-server.mjs starts a throwaway one).
// Installing needs root; without it, this only says what is missing.
import { execSync } from 'node:child_process';
import fs from 'node:fs';

const needed = [
	{ pkg: 'chromium', file: '/usr/bin/chromium' },
	{ pkg: 'poppler-utils', file: '/usr/bin/pdftotext' },
	{ pkg: 'postgresql', file: '/usr/lib/postgresql' }
];
const missing = needed.filter((n) => !fs.existsSync(n.file)).map((n) => n.pkg);

if (missing.length === 0) {
	console.log('Test dependencies present: ' + needed.map((n) => n.file).join(', '));
} else if (process.getuid?.() === 0) {
	console.log(`Installing ${missing.join(' ')} from Debian...`);
	const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
	execSync('apt-get update -qq', { stdio: 'inherit', env });
	execSync(`apt-get install -y -qq --no-install-recommends ${missing.join(' ')}`, { stdio: 'inherit', env });
} else {
	console.error(`Missing Debian packages: ${missing.join(' ')}. Run as root, or: sudo apt-get install ${missing.join(' ')}`);
	process.exit(1);
}
