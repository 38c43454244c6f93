/**
 * A small timing helper for `npm run bench`. Each section of the benchmark calls `bench`
 * per case and prints the rows with `printSection`.
 */

export interface BenchResult {
	name: string;
	iterations: number;
	ms: number;
	perSecond: number;
}

/** Calls `fn(i)` for i = 0..iterations-1 after a short warm-up and reports the rate. */
export function bench(name: string, fn: (i: number) => unknown, iterations: number): BenchResult {
	const warmUp = Math.min(1000, Math.ceil(iterations / 10));
	let sink: unknown;
	for (let i = 0; i < warmUp; i++) sink = fn(i);
	const start = performance.now();
	for (let i = 0; i < iterations; i++) sink = fn(i);
	const ms = performance.now() - start;
	// Keep the last answer reachable so the loop cannot be optimised away.
	if (sink === Symbol.for('never')) console.log(sink);
	return { name, iterations, ms, perSecond: iterations / (ms / 1000) };
}

/** Prints one section as an aligned table. */
export function printSection(title: string, results: BenchResult[]): void {
	const width = Math.max(...results.map((r) => r.name.length), 4);
	console.log(`\n${title}`);
	console.log(`${'case'.padEnd(width)}  ${'per second'.padStart(12)}  ${'runs'.padStart(8)}  ${'ms'.padStart(8)}`);
	for (const r of results) {
		console.log(
			`${r.name.padEnd(width)}  ${Math.round(r.perSecond).toLocaleString('en-US').padStart(12)}  ${String(r.iterations).padStart(8)}  ${r.ms.toFixed(0).padStart(8)}`
		);
	}
}
