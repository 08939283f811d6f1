import type { ControlLimits } from './chart-types';
import { zoneBoundaries, zonePosition } from './zones';

/**
 * Run rules (tests for special causes) on one chart's series.
 *
 * Rule definitions: Western Electric Statistical Quality Control Handbook (1956) rules
 * we-1..we-4; Nelson, L.S. (1984) "The Shewhart Control Chart—Tests for Special Causes",
 * J. Quality Technology 16(4) tests nelson-1..nelson-8. Conventions fixed here (the sources
 * leave them open; see reference/spc/run-rules.md):
 * - zones come from the chart's limits: σ = (UCL − CL)/3 above, (CL − LCL)/3 below
 *   (upper σ on both sides when the LCL was clipped to 0);
 * - a value exactly on a zone line or control limit is not beyond it (strict >, <);
 * - a value exactly on the centre line breaks a same-side run and belongs to Zone C;
 * - equal consecutive values break a trend (nelson-3) and an alternation (nelson-4);
 * - "6 in a row increasing" means 6 points (5 rises); "14 alternating" means 14 points;
 * - only full windows count (no signal from the first m − 1 points of an m-point rule);
 * - a violation is reported at every point that completes the pattern (so a run of 10
 *   above the centre fires we-4 at the 8th, 9th and 10th point), listing the indices
 *   of the points that make the pattern; for k-of-m rules the completing point must itself
 *   be one of the k, and `points` lists the qualifying points in the window;
 * - nelson-7 (15 in Zone C) needs no points on both sides; nelson-8 (8 outside Zone C) does.
 */

/** All rule ids. */
export const RULE_IDS = [
	'we-1',
	'we-2',
	'we-3',
	'we-4',
	'nelson-1',
	'nelson-2',
	'nelson-3',
	'nelson-4',
	'nelson-5',
	'nelson-6',
	'nelson-7',
	'nelson-8'
] as const;

/** One rule id, e.g. `'we-2'` or `'nelson-3'`. */
export type RuleId = (typeof RULE_IDS)[number];

/** Default rule set: the four Western Electric rules. */
export const DEFAULT_RULES: readonly RuleId[] = ['we-1', 'we-2', 'we-3', 'we-4'];

/** Rules that only test a single point beyond the control limits. */
export const BEYOND_LIMIT_RULES: readonly RuleId[] = ['we-1', 'nelson-1'];

/** Plain-language text of each rule, for the UI. */
export const RULE_DESCRIPTIONS: Record<RuleId, string> = {
	'we-1': '1 point beyond a control limit',
	'we-2': '2 of 3 points in a row beyond 2σ on the same side',
	'we-3': '4 of 5 points in a row beyond 1σ on the same side',
	'we-4': '8 points in a row on the same side of the centre line',
	'nelson-1': '1 point beyond a control limit',
	'nelson-2': '9 points in a row on the same side of the centre line',
	'nelson-3': '6 points in a row steadily increasing or decreasing',
	'nelson-4': '14 points in a row alternating up and down',
	'nelson-5': '2 of 3 points in a row beyond 2σ on the same side',
	'nelson-6': '4 of 5 points in a row beyond 1σ on the same side',
	'nelson-7': '15 points in a row within 1σ of the centre line',
	'nelson-8': '8 points in a row beyond 1σ, on both sides, none within 1σ'
};

/** One signal: which rule fired at which point, and the points making the pattern. */
export interface RuleHit {
	rule: RuleId;
	index: number;
	points: number[];
}

/**
 * Per-point facts computed once in O(N), so each rule is O(1) per point (a 1,000-point chart
 * with all twelve rules takes well under a millisecond).
 */
interface SeriesFacts {
	values: readonly number[];
	valid: boolean[];
	side: number[];
	level: number[];
	/** Length of the run of valid points on the same side ending here (0 on the CL). */
	sameSide: number[];
	/** Length of the run of valid Zone-C points ending here. */
	zoneC: number[];
	/** Length of the run of valid points beyond 1σ ending here. */
	outsideC: number[];
	/** Last index ≤ i above / below the centre line (−1 if none). */
	lastAbove: number[];
	lastBelow: number[];
	/** Points in the strictly increasing / decreasing run ending here. */
	rising: number[];
	falling: number[];
	/** Points in the alternating run ending here. */
	alternating: number[];
}

function seriesFacts(
	values: readonly number[],
	limits: ControlLimits,
	lclClipped: boolean
): SeriesFacts {
	const zones = zoneBoundaries(limits, lclClipped);
	const n = values.length;
	const f: SeriesFacts = {
		values,
		valid: new Array(n),
		side: new Array(n),
		level: new Array(n),
		sameSide: new Array(n),
		zoneC: new Array(n),
		outsideC: new Array(n),
		lastAbove: new Array(n),
		lastBelow: new Array(n),
		rising: new Array(n),
		falling: new Array(n),
		alternating: new Array(n)
	};
	for (let i = 0; i < n; i++) {
		const v = values[i];
		const ok = Number.isFinite(v);
		const { side, level } = zonePosition(v, zones);
		const prevOk = i > 0 && f.valid[i - 1];
		f.valid[i] = ok;
		f.side[i] = side;
		f.level[i] = level;
		const continues = prevOk && f.side[i - 1] === side;
		f.sameSide[i] = !ok || side === 0 ? 0 : continues ? f.sameSide[i - 1] + 1 : 1;
		f.zoneC[i] = ok && level === 0 ? (i > 0 ? f.zoneC[i - 1] : 0) + 1 : 0;
		f.outsideC[i] = ok && level >= 1 ? (i > 0 ? f.outsideC[i - 1] : 0) + 1 : 0;
		f.lastAbove[i] = ok && side === 1 ? i : i > 0 ? f.lastAbove[i - 1] : -1;
		f.lastBelow[i] = ok && side === -1 ? i : i > 0 ? f.lastBelow[i - 1] : -1;
		const step = ok && prevOk ? Math.sign(v - values[i - 1]) : NaN;
		const base = ok ? 1 : 0;
		f.rising[i] = step === 1 ? f.rising[i - 1] + 1 : base;
		f.falling[i] = step === -1 ? f.falling[i - 1] + 1 : base;
		if (step === 1 || step === -1) {
			const prevStep = f.alternating[i - 1] >= 2 ? Math.sign(values[i - 1] - values[i - 2]) : 0;
			f.alternating[i] = prevStep === -step ? f.alternating[i - 1] + 1 : 2;
		} else f.alternating[i] = base;
	}
	return f;
}

type Detector = (f: SeriesFacts, e: number) => number[] | null;

function windowIndices(e: number, m: number): number[] {
	return Array.from({ length: m }, (_, i) => e - m + 1 + i);
}

/** k of the last m points beyond the `level` line on the same side, the last one included. */
function kOfM(k: number, m: number, level: number): Detector {
	return (f, e) => {
		if (e < m - 1 || f.side[e] === 0 || f.level[e] < level || !f.valid[e]) return null;
		const hits: number[] = [];
		for (let j = e - m + 1; j <= e; j++) {
			if (!f.valid[j]) return null;
			if (f.side[j] === f.side[e] && f.level[j] >= level) hits.push(j);
		}
		return hits.length >= k ? hits : null;
	};
}

/** The rule fires when the run counted in `run` reaches m points. */
function runOf(m: number, run: (f: SeriesFacts) => number[]): Detector {
	return (f, e) => (run(f)[e] >= m ? windowIndices(e, m) : null);
}

function noneInZoneCBothSides(m: number): Detector {
	return (f, e) =>
		f.outsideC[e] >= m && f.lastAbove[e] > e - m && f.lastBelow[e] > e - m
			? windowIndices(e, m)
			: null;
}

const beyondLimits: Detector = (f, e) => (f.valid[e] && f.level[e] >= 3 ? [e] : null);
const trend =
	(m: number): Detector =>
	(f, e) =>
		f.rising[e] >= m || f.falling[e] >= m ? windowIndices(e, m) : null;

const DETECTORS: Record<RuleId, Detector> = {
	'we-1': beyondLimits,
	'we-2': kOfM(2, 3, 2),
	'we-3': kOfM(4, 5, 1),
	'we-4': runOf(8, (f) => f.sameSide),
	'nelson-1': beyondLimits,
	'nelson-2': runOf(9, (f) => f.sameSide),
	'nelson-3': trend(6),
	'nelson-4': runOf(14, (f) => f.alternating),
	'nelson-5': kOfM(2, 3, 2),
	'nelson-6': kOfM(4, 5, 1),
	'nelson-7': runOf(15, (f) => f.zoneC),
	'nelson-8': noneInZoneCBothSides(8)
};

/**
 * Apply run rules to a series judged against fixed limits (Phase I or Phase II).
 *
 * Used on the location chart (X̄ or individuals); dispersion charts get only the
 * beyond-limit rules (see `evaluateChart`). Non-finite values never signal and break every
 * window that contains them. Output is ordered by index, then by the order of `rules`.
 * @throws RangeError for an unknown rule id.
 * @example
 * detectRunRules([0, 4, 0], { lcl: -3, cl: 0, ucl: 3 }, ['we-1'])
 * // [{ rule: 'we-1', index: 1, points: [1] }]
 */
export function detectRunRules(
	values: readonly number[],
	limits: ControlLimits,
	rules: readonly RuleId[] = DEFAULT_RULES,
	lclClipped = false
): RuleHit[] {
	const facts = seriesFacts(values, limits, lclClipped);
	const unique = [...new Set(rules)];
	const detectors = unique.map((rule) => {
		const detect = DETECTORS[rule];
		if (!detect) throw new RangeError(`detectRunRules: unknown rule "${String(rule)}"`);
		return { rule, detect };
	});
	const hits: RuleHit[] = [];
	for (let e = 0; e < values.length; e++) {
		for (const { rule, detect } of detectors) {
			const points = detect(facts, e);
			if (points) hits.push({ rule, index: e, points });
		}
	}
	return hits;
}
