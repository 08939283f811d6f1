/**
 * A small seeded random source (mulberry32) with standard-normal draws (Box–Muller), so
 * simulations and synthetic test data repeat exactly. Not for anything secret.
 */
export interface SeededRandom {
	/** Uniform on [0, 1). */
	uniform(): number;
	/** Standard normal. */
	normal(): number;
}

/** @example const r = seededRandom(42); r.normal() */
export function seededRandom(seed: number): SeededRandom {
	let state = seed >>> 0;
	let spare: number | null = null;
	const uniform = () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
	const normal = () => {
		if (spare !== null) {
			const s = spare;
			spare = null;
			return s;
		}
		let u = 0;
		while (u === 0) u = uniform();
		const v = uniform();
		const r = Math.sqrt(-2 * Math.log(u));
		spare = r * Math.sin(2 * Math.PI * v);
		return r * Math.cos(2 * Math.PI * v);
	};
	return { uniform, normal };
}
