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

interface Position {
	side: -1 | 0 | 1;
	level: number;
	valid: boolean;
}

type Detector = (values: readonly number[], pos: readonly Position[], e: number) => number[] | null;

function windowIndices(e: number, m: number): number[] {
	return Array.from({ length: m }, (_, i) => e - m + 1 + i);
}

function allValid(pos: readonly Position[], e: number, m: number): boolean {
	for (let j = e - m + 1; j <= e; j++) if (!pos[j].valid) return false;
	return true;
}

/** k of the last m points beyond the `level` line on the same side, the last one included. */
function kOfM(k: number, m: number, level: number): Detector {
	return (_values, pos, e) => {
		if (e < m - 1 || !allValid(pos, e, m)) return null;
		const side = pos[e].side;
		if (side === 0 || pos[e].level < level) return null;
		const hits = windowIndices(e, m).filter((j) => pos[j].side === side && pos[j].level >= level);
		return hits.length >= k ? hits : null;
	};
}

function sameSide(m: number): Detector {
	return (_values, pos, e) => {
		if (e < m - 1 || !allValid(pos, e, m) || pos[e].side === 0) return null;
		const idx = windowIndices(e, m);
		return idx.every((j) => pos[j].side === pos[e].side) ? idx : null;
	};
}

function trend(m: number): Detector {
	return (values, pos, e) => {
		if (e < m - 1 || !allValid(pos, e, m)) return null;
		let up = true;
		let down = true;
		for (let j = e - m + 2; j <= e; j++) {
			if (!(values[j] > values[j - 1])) up = false;
			if (!(values[j] < values[j - 1])) down = false;
		}
		return up || down ? windowIndices(e, m) : null;
	};
}

function alternating(m: number): Detector {
	return (values, pos, e) => {
		if (e < m - 1 || !allValid(pos, e, m)) return null;
		let previous = 0;
		for (let j = e - m + 2; j <= e; j++) {
			const sign = Math.sign(values[j] - values[j - 1]);
			if (sign === 0 || sign === previous) return null;
			previous = sign;
		}
		return windowIndices(e, m);
	};
}

function allInZoneC(m: number): Detector {
	return (_values, pos, e) => {
		if (e < m - 1 || !allValid(pos, e, m)) return null;
		const idx = windowIndices(e, m);
		return idx.every((j) => pos[j].level === 0) ? idx : null;
	};
}

function noneInZoneCBothSides(m: number): Detector {
	return (_values, pos, e) => {
		if (e < m - 1 || !allValid(pos, e, m)) return null;
		const idx = windowIndices(e, m);
		if (!idx.every((j) => pos[j].level >= 1)) return null;
		const sides = new Set(idx.map((j) => pos[j].side));
		return sides.has(1) && sides.has(-1) ? idx : null;
	};
}

const beyondLimits: Detector = (_values, pos, e) => (pos[e].valid && pos[e].level >= 3 ? [e] : null);

const DETECTORS: Record<RuleId, Detector> = {
	'we-1': beyondLimits,
	'we-2': kOfM(2, 3, 2),
	'we-3': kOfM(4, 5, 1),
	'we-4': sameSide(8),
	'nelson-1': beyondLimits,
	'nelson-2': sameSide(9),
	'nelson-3': trend(6),
	'nelson-4': alternating(14),
	'nelson-5': kOfM(2, 3, 2),
	'nelson-6': kOfM(4, 5, 1),
	'nelson-7': allInZoneC(15),
	'nelson-8': noneInZoneCBothSides(8)
};

/**
 * Apply run rules to a series judged against fixed limits (Phase I or Phase II).
 *
 * Used on the location chart (X̄ or individuals); dispersion charts get only the
 * beyond-limit rules (see `evaluateChart`). Non-finite values never signal and break every
 * window that contains them. Output is ordered by index, then by the order of `rules`.
 * @throws RangeError for an unknown rule id.
 * @example detectRunRules([0, 4, 0], { lcl: -3, cl: 0, ucl: 3 }, ['we-1']) // [{ rule: 'we-1', index: 1, points: [1] }]
 */
export function detectRunRules(
	values: readonly number[],
	limits: ControlLimits,
	rules: readonly RuleId[] = DEFAULT_RULES,
	lclClipped = false
): RuleHit[] {
	const zones = zoneBoundaries(limits, lclClipped);
	const pos: Position[] = values.map((v) => ({ ...zonePosition(v, zones), valid: Number.isFinite(v) }));
	const unique = [...new Set(rules)];
	const detectors = unique.map((rule) => {
		const detect = DETECTORS[rule];
		if (!detect) throw new RangeError(`detectRunRules: unknown rule "${String(rule)}"`);
		return { rule, detect };
	});
	const hits: RuleHit[] = [];
	for (let e = 0; e < values.length; e++) {
		for (const { rule, detect } of detectors) {
			const points = detect(values, pos, e);
			if (points) hits.push({ rule, index: e, points });
		}
	}
	return hits;
}
