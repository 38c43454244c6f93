/**
 * Every live calculator embedded in a lesson names a real calculator and starts from inputs
 * that validate, so no lesson opens on an error.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCalculation } from '$lib/calc';

function lessonFiles(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
		const path = join(dir, entry.name);
		if (entry.isDirectory()) return lessonFiles(path);
		return entry.name.endsWith('.md') ? [path] : [];
	});
}

const EMBED = /<Calculator\s+id="([^"]+)"(?:\s+inputs=\{\{([^}]*)\}\})?/g;

const embeds = lessonFiles('content').flatMap((file) =>
	[...readFileSync(file, 'utf8').matchAll(EMBED)].map((m) => ({
		file,
		id: m[1],
		inputs: Object.fromEntries([...(m[2] ?? '').matchAll(/(\w+)\s*:\s*(-?[\d.]+(?:e-?\d+)?)/g)].map((p) => [p[1], Number(p[2])]))
	}))
);

describe('calculators embedded in lessons', () => {
	it('finds the embeds', () => {
		expect(embeds.length).toBeGreaterThan(0);
	});

	for (const embed of embeds) {
		it(`${embed.file}: ${embed.id} ${JSON.stringify(embed.inputs)}`, () => {
			const out = runCalculation(embed.id, embed.inputs);
			expect(out.ok ? 'ok' : out.errors).toBe('ok');
		});
	}
});
