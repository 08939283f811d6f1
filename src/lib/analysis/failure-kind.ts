/**
 * The kind of an SPI failure, from which measure broke its window. SPI files carry each pad's
 * measures and the machine's verdict (pass / warn / fail), not which limit failed it nor the
 * machine's limits, so the kind is derived here against the site's windows: the first measure,
 * in the order volume, height, area, offset X, offset Y, that lies outside its window. When none
 * does, the machine's own limits were tighter than these windows: the pad takes the kind of the
 * measure furthest from nominal (in half-widths of its window, ties in the same order) and is
 * counted as "within the windows", so the Pareto says how much of it rests on that ranking.
 */

export const FAILURE_KINDS = [
	'volume-low',
	'volume-high',
	'height-low',
	'height-high',
	'area-low',
	'area-high',
	'offset-x',
	'offset-y'
] as const;
export type FailureKind = (typeof FAILURE_KINDS)[number];

export const FAILURE_KIND_LABELS: Record<FailureKind, string> = {
	'volume-low': 'Volume low',
	'volume-high': 'Volume high',
	'height-low': 'Height low',
	'height-high': 'Height high',
	'area-low': 'Area low',
	'area-high': 'Area high',
	'offset-x': 'Offset X',
	'offset-y': 'Offset Y'
};

/** The site's acceptance windows the kinds are judged against. */
export interface FailureWindows {
	/** Volume, % of nominal. */
	volumePct: { low: number; high: number };
	/** Area, % of nominal. */
	areaPct: { low: number; high: number };
	/** Height, % of the foil thickness at the pad's stencil (not judged without a stencil). */
	heightPctOfFoil: { low: number; high: number };
	/** Largest |offset| in X or Y, µm. */
	offsetUm: number;
}

/**
 * Volume 50–150 %: REFERENCE-FACTS "SPI acceptance windows" (confirmed, trade practice). Area
 * and height (as % of the foil thickness) 50–150 % mirror it, as the SPC defaults do for area
 * (common practice, no source; height ≈ foil × volume ÷ area, so the same window keeps a low
 * deposit a volume failure first). Offset 100 µm: a quarter of a 0.4 mm pad (common practice,
 * no source).
 */
export const DEFAULT_FAILURE_WINDOWS: FailureWindows = {
	volumePct: { low: 50, high: 150 },
	areaPct: { low: 50, high: 150 },
	heightPctOfFoil: { low: 50, high: 150 },
	offsetUm: 100
};

/** One failed pad's measures (null when the file or the data have none). */
export interface PadMeasures {
	volumePct: number | null;
	areaPct: number;
	heightUm: number;
	offsetXUm: number;
	offsetYUm: number;
	/** Foil thickness of the board's stencil, µm (null: height not judged). */
	foilUm: number | null;
}

/** Distance from the window's centre in half-widths, signed (−1 = on the low limit). */
function reach(value: number, low: number, high: number): number {
	const centre = (low + high) / 2;
	return (value - centre) / ((high - low) / 2);
}

/**
 * The kind of a failed pad and how far out that measure is, in half-widths (≤ 1: the pad was
 * within every window).
 * @example failureKindOf({ volumePct: 42, areaPct: 95, heightUm: 110, offsetXUm: 5, offsetYUm: 0, foilUm: 120 })
 * // { kind: 'volume-low', reach: 1.16 }
 */
export function failureKindOf(
	m: PadMeasures,
	w: FailureWindows = DEFAULT_FAILURE_WINDOWS
): { kind: FailureKind; reach: number } {
	const candidates: [FailureKind, FailureKind, number][] = [];
	if (m.volumePct !== null)
		candidates.push([
			'volume-low',
			'volume-high',
			reach(m.volumePct, w.volumePct.low, w.volumePct.high)
		]);
	if (m.foilUm !== null && m.foilUm > 0)
		candidates.push([
			'height-low',
			'height-high',
			reach((100 * m.heightUm) / m.foilUm, w.heightPctOfFoil.low, w.heightPctOfFoil.high)
		]);
	candidates.push(['area-low', 'area-high', reach(m.areaPct, w.areaPct.low, w.areaPct.high)]);
	candidates.push(['offset-x', 'offset-x', Math.abs(m.offsetXUm) / w.offsetUm]);
	candidates.push(['offset-y', 'offset-y', Math.abs(m.offsetYUm) / w.offsetUm]);
	let best = candidates.find((c) => Math.abs(c[2]) > 1);
	if (!best) {
		best = candidates[0];
		for (const c of candidates) if (Math.abs(c[2]) > Math.abs(best[2])) best = c;
	}
	return { kind: best[2] < 0 ? best[0] : best[1], reach: Math.abs(best[2]) };
}

/** One row of a Pareto: count, share of the total and the running (cumulative) share. */
export interface ParetoRow<K extends string> {
	key: K;
	count: number;
	share: number;
	cumulativeShare: number;
}

/**
 * Counts sorted largest first (ties by key) with each share and the cumulative share, which
 * ends at exactly 1 (the last row's running sum is the total). Zero counts are left out.
 * @example pareto(new Map([['a', 1], ['b', 3]])) // [{ key: 'b', count: 3, share: 0.75, cumulativeShare: 0.75 }, { key: 'a', …, cumulativeShare: 1 }]
 */
export function pareto<K extends string>(counts: ReadonlyMap<K, number>): ParetoRow<K>[] {
	const rows = [...counts.entries()]
		.filter(([, n]) => n > 0)
		.sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]));
	const total = rows.reduce((s, [, n]) => s + n, 0);
	let running = 0;
	return rows.map(([key, count]) => {
		running += count;
		return { key, count, share: count / total, cumulativeShare: running / total };
	});
}
