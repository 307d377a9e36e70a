/**
 * A small seeded pseudo-random generator (mulberry32) for the demo data, the tests and the
 * benchmarks, so every run sees the same "random" values. Not for anything secret.
 */
export function mulberry32(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/** Standard normal deviates from a uniform source (Box–Muller). */
export function gaussian(rand: () => number): () => number {
	return () => Math.sqrt(-2 * Math.log(Math.max(rand(), 1e-12))) * Math.cos(2 * Math.PI * rand());
}
