/**
 * OEE of a printer over one shift, and changeover durations, from its CFX messages (pure).
 *
 * OEE = availability × performance × quality (Nakajima's definition, the common one):
 * - availability = (planned time − unavailable time) / planned time; unavailable time is the union
 *   of fault intervals (FaultOccurred → FaultCleared, an uncleared fault runs to the shift's end)
 *   and idle gaps (no board for longer than `idleAfterMs`: the part of the gap beyond it), clipped
 *   to the shift;
 * - performance = Σ ideal cycle time of the boards printed / run time (planned − unavailable);
 * - quality = SPI first-pass yield: boards whose first inspection had no failing pad / boards
 *   of the shift that were inspected.
 * Every factor comes back with the figures it was computed from and a sentence saying how.
 */

export interface Interval {
	startMs: number;
	endMs: number;
}

export interface OeeInput {
	shift: Interval;
	/** Boards the printer printed (processed) with their own cycle time, when sent. */
	boards: {
		atMs: number;
		product: string | null;
		cycleTimeMs: number | null;
		firstPassed: boolean | null;
	}[];
	faults: { faultId: string | null; occurredAtMs: number; clearedAtMs: number | null }[];
	/** Ideal cycle time per product (ms); a product without one uses the demonstrated best. */
	idealCycleMs: Record<string, number>;
	/** Demonstrated best cycle time per product (ms), e.g. `demonstratedBestCycle(…).valueMs`. */
	demonstratedCycleMs: Record<string, number>;
	/** How each product's demonstrated best was found (shown in the sentence), e.g. `demonstratedBestCycle(…).how`. */
	demonstratedHow?: Record<string, string>;
	/** A gap between boards longer than this is idle beyond it (default 5 min). */
	idleAfterMs?: number;
}

export interface OeeFactor {
	value: number | null;
	how: string;
}

export interface OeeResult {
	plannedMs: number;
	faultMs: number;
	idleMs: number;
	unavailableMs: number;
	runMs: number;
	boards: number;
	inspected: number;
	firstPassed: number;
	availability: OeeFactor;
	performance: OeeFactor;
	quality: OeeFactor;
	oee: OeeFactor;
}

export const DEFAULT_IDLE_AFTER_MS = 5 * 60_000;

/** Union of intervals clipped to `window`, as sorted disjoint intervals. */
export function unionWithin(intervals: readonly Interval[], window: Interval): Interval[] {
	const clipped = intervals
		.map((i) => ({
			startMs: Math.max(i.startMs, window.startMs),
			endMs: Math.min(i.endMs, window.endMs)
		}))
		.filter((i) => i.endMs > i.startMs)
		.sort((a, b) => a.startMs - b.startMs);
	const out: Interval[] = [];
	for (const i of clipped) {
		const last = out[out.length - 1];
		if (last && i.startMs <= last.endMs) last.endMs = Math.max(last.endMs, i.endMs);
		else out.push({ ...i });
	}
	return out;
}

const total = (intervals: readonly Interval[]) =>
	intervals.reduce((s, i) => s + (i.endMs - i.startMs), 0);
const pct = (v: number) => `${(v * 100).toFixed(1)} %`;
const min = (ms: number) => `${(ms / 60_000).toFixed(1)} min`;

/**
 * The OEE of one printer over one shift.
 * @example computeOee({ shift: { startMs: 0, endMs: 8 * 3600e3 }, boards: [...], faults: [], idealCycleMs: { P: 20000 }, demonstratedCycleMs: {} })
 */
export function computeOee(input: OeeInput): OeeResult {
	const { shift } = input;
	const idleAfterMs = input.idleAfterMs ?? DEFAULT_IDLE_AFTER_MS;
	const plannedMs = Math.max(0, shift.endMs - shift.startMs);
	const boards = input.boards
		.filter((b) => b.atMs >= shift.startMs && b.atMs < shift.endMs)
		.sort((a, b) => a.atMs - b.atMs);
	const faultIntervals = input.faults.map((f) => ({
		startMs: f.occurredAtMs,
		endMs: f.clearedAtMs ?? shift.endMs
	}));
	// Idle: from `idleAfterMs` after a board (or the shift's start) to the next board (or the end).
	const idleIntervals: Interval[] = [];
	let previous = shift.startMs;
	for (const b of [...boards.map((x) => x.atMs), shift.endMs]) {
		if (b - previous > idleAfterMs)
			idleIntervals.push({ startMs: previous + idleAfterMs, endMs: b });
		previous = b;
	}
	const faults = unionWithin(faultIntervals, shift);
	const unavailable = unionWithin([...faultIntervals, ...idleIntervals], shift);
	const faultMs = total(faults);
	const unavailableMs = total(unavailable);
	const idleMs = unavailableMs - faultMs;
	const runMs = plannedMs - unavailableMs;

	const availability: OeeFactor =
		plannedMs > 0
			? {
					value: runMs / plannedMs,
					how: `(${min(plannedMs)} planned − ${min(faultMs)} in faults − ${min(idleMs)} idle beyond ${min(idleAfterMs)} without a board) / ${min(plannedMs)} = ${pct(runMs / plannedMs)}`
				}
			: { value: null, how: 'the shift has no length' };

	let idealMs = 0;
	let withoutIdeal = 0;
	const sources = new Set<string>();
	for (const b of boards) {
		const product = b.product ?? '';
		const ideal = input.idealCycleMs[product] ?? input.demonstratedCycleMs[product];
		if (ideal === undefined) {
			withoutIdeal++;
			continue;
		}
		sources.add(
			input.idealCycleMs[product] !== undefined
				? 'the recipe'
				: `the printer's demonstrated best (${input.demonstratedHow?.[product] ?? 'from its reported cycle times'})`
		);
		idealMs += ideal;
	}
	const counted = boards.length - withoutIdeal;
	const performance: OeeFactor =
		runMs > 0 && counted > 0
			? {
					value: idealMs / runMs,
					how: `${counted} boards × ideal cycle time (from ${[...sources].join(' and ')}) = ${min(idealMs)} / ${min(runMs)} run time = ${pct(idealMs / runMs)}${withoutIdeal ? `; ${withoutIdeal} boards without a known ideal left out` : ''}`
				}
			: {
					value: null,
					how: runMs > 0 ? 'no board with a known ideal cycle time' : 'no run time in the shift'
				};

	const inspected = boards.filter((b) => b.firstPassed !== null);
	const firstPassed = inspected.filter((b) => b.firstPassed).length;
	const quality: OeeFactor =
		inspected.length > 0
			? {
					value: firstPassed / inspected.length,
					how: `${firstPassed} of ${inspected.length} inspected boards passed SPI at their first inspection = ${pct(firstPassed / inspected.length)}`
				}
			: { value: null, how: 'no board of the shift was inspected' };

	const factors = [availability.value, performance.value, quality.value];
	const oee: OeeFactor = factors.every((v) => v !== null)
		? {
				value: factors.reduce((a, b) => a! * b!, 1)!,
				how: `availability × performance × quality = ${factors.map((v) => pct(v!)).join(' × ')} = ${pct(factors.reduce((a, b) => a! * b!, 1)!)}`
			}
		: { value: null, how: 'a factor is unknown (see its note)' };

	return {
		plannedMs,
		faultMs,
		idleMs,
		unavailableMs,
		runMs,
		boards: boards.length,
		inspected: inspected.length,
		firstPassed,
		availability,
		performance,
		quality,
		oee
	};
}

/** Demonstrated best cycle time: this percentile of the last units' reported cycle times. */
export const DEMONSTRATED_PERCENTILE = 5;
/** How many of the printer's most recent units (of the product) the demonstrated best looks at. */
export const DEMONSTRATED_LAST_UNITS = 500;

/**
 * The demonstrated best cycle time of a printer for one product: the `percentile`-th percentile
 * (nearest rank) of the cycle times it reported for its last `lastUnits` units, a stand-in for
 * an ideal when the recipe gives none (a low percentile, not the minimum, so one odd reading
 * does not set the bar). Returns the value and the sentence that says how it was found.
 * @param recentCycleMs cycle times, newest first (more than `lastUnits` are cut)
 * @example demonstratedBestCycle([22000, 20000, 25000], 'P1').how
 * // '5th percentile of the last 3 reported cycle times for P1 = 20.0 s'
 */
export function demonstratedBestCycle(
	recentCycleMs: readonly number[],
	product: string,
	percentile = DEMONSTRATED_PERCENTILE,
	lastUnits = DEMONSTRATED_LAST_UNITS
): { valueMs: number; units: number; how: string } | undefined {
	const recent = recentCycleMs.slice(0, lastUnits).filter((v) => Number.isFinite(v) && v > 0);
	const valueMs = nearestRank(recent, percentile);
	if (valueMs === undefined) return undefined;
	return {
		valueMs,
		units: recent.length,
		how: `${ordinal(percentile)} percentile of the last ${recent.length} reported cycle times for ${product} = ${(valueMs / 1000).toFixed(1)} s`
	};
}

function ordinal(n: number): string {
	const tens = n % 100;
	if (tens >= 11 && tens <= 13) return `${n}th`;
	return `${n}${({ 1: 'st', 2: 'nd', 3: 'rd' } as Record<number, string>)[n % 10] ?? 'th'}`;
}

/** The p-th percentile (nearest rank) of positive numbers, or undefined. */
export function nearestRank(values: readonly number[], p: number): number | undefined {
	const sorted = values.filter((v) => v > 0).sort((a, b) => a - b);
	if (sorted.length === 0) return undefined;
	return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
}

export interface Changeover {
	kind: 'stencil' | 'product';
	/** The event (stencil change) or the first board of the new product. */
	atMs: number;
	from: string | null;
	to: string | null;
	/** Last board before → first board after; null while no board followed. */
	lastBoardBeforeMs: number | null;
	firstBoardAfterMs: number | null;
	durationMs: number | null;
}

/**
 * Changeovers of one line: each stencil change (from the last board printed before it to the
 * first board printed after it) and each product change (from the last board of one product to
 * the first of the next). Boards with an unknown product do not start or end a product change.
 */
export function changeovers(
	boards: readonly { atMs: number; product: string | null }[],
	stencilChanges: readonly { atMs: number; from: string | null; to: string | null }[]
): Changeover[] {
	const sorted = [...boards].sort((a, b) => a.atMs - b.atMs);
	const out: Changeover[] = [];
	for (const change of stencilChanges) {
		let before: number | null = null;
		let after: number | null = null;
		for (const b of sorted) {
			if (b.atMs <= change.atMs) before = b.atMs;
			else {
				after = b.atMs;
				break;
			}
		}
		out.push({
			kind: 'stencil',
			atMs: change.atMs,
			from: change.from,
			to: change.to,
			lastBoardBeforeMs: before,
			firstBoardAfterMs: after,
			durationMs: before !== null && after !== null ? after - before : null
		});
	}
	let last: { atMs: number; product: string } | null = null;
	for (const b of sorted) {
		if (b.product === null) continue;
		if (last && b.product !== last.product) {
			out.push({
				kind: 'product',
				atMs: b.atMs,
				from: last.product,
				to: b.product,
				lastBoardBeforeMs: last.atMs,
				firstBoardAfterMs: b.atMs,
				durationMs: b.atMs - last.atMs
			});
		}
		last = { atMs: b.atMs, product: b.product };
	}
	return out.sort((a, b) => a.atMs - b.atMs);
}
