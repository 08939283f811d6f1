import type { CapabilityResult } from './capability';
import { chiSquareQuantile } from './chi-square-quantile';
import type { Violation } from './evaluate-chart';
import { expectedOutOfSpec } from './expected-out-of-spec';
import { inverseNormalCdf } from './inverse-normal-cdf';
import { RULE_DESCRIPTIONS, type RuleId } from './run-rules';

/**
 * The one capability assessment every screen, report, API answer and e-mail shows. Stability
 * comes first: a process that is out of control (open signals, or run rules flagging points of
 * the data shown, in Phase I too) gets no capability verdict, because Cpk/Ppk predict nothing
 * for an unpredictable process (Montgomery, Introduction to Statistical Quality Control,
 * §8.3: capability ratios assume a stable process; AIAG SPC manual, "process capability" is
 * judged only in statistical control — both from memory). When stable, the verdict rests on
 * the one-sided lower confidence bound of the index that applies (Cpk, or Ppk when the
 * within-subgroup σ is unknown), so a small sample cannot make a process look capable.
 */

/** Verdict of an assessment. */
export type CapabilityVerdict =
	'not-stable' | 'capable' | 'marginal' | 'not-capable' | 'not-assessed';

/** Verdict thresholds on the lower confidence bound; the site may change them. */
export interface CapabilityThresholds {
	/** Lower bound at or above this: capable (default 1.33). */
	capable: number;
	/** Lower bound at or above this (and below `capable`): marginal (default 1.00). */
	marginal: number;
	/** One-sided confidence level of the lower bounds (default 0.95). */
	confidenceLevel: number;
}

/**
 * 1.33 is Montgomery's recommended minimum Cpk for an existing process (ISQC, Table 8.5, from
 * memory) and common customer practice; 1.00 is the index at which the spec width equals the
 * natural ±3σ spread. Sites with customer-specific minimums change them in the settings.
 */
export const DEFAULT_CAPABILITY_THRESHOLDS: CapabilityThresholds = {
	capable: 1.33,
	marginal: 1.0,
	confidenceLevel: 0.95
};

/** Where the default thresholds come from, shown beside the verdict. */
export const THRESHOLD_SOURCE =
	"1.33 is the common minimum (Montgomery's recommended minimum for an existing process); your customer's requirement rules.";

/**
 * Check thresholds: finite, 0 < marginal < capable ≤ 5, confidence level in [0.8, 0.999].
 * @returns an error message per bad field (empty when fine).
 */
export function thresholdErrors(
	t: CapabilityThresholds
): { field: keyof CapabilityThresholds; message: string }[] {
	const errors: { field: keyof CapabilityThresholds; message: string }[] = [];
	if (!Number.isFinite(t.marginal) || t.marginal <= 0)
		errors.push({ field: 'marginal', message: 'must be a number above 0' });
	if (!Number.isFinite(t.capable) || t.capable > 5)
		errors.push({ field: 'capable', message: 'must be a number up to 5' });
	else if (Number.isFinite(t.marginal) && t.capable <= t.marginal) {
		errors.push({
			field: 'capable',
			message: `must be above the marginal threshold ${t.marginal}`
		});
	}
	if (!Number.isFinite(t.confidenceLevel) || t.confidenceLevel < 0.8 || t.confidenceLevel > 0.999) {
		errors.push({
			field: 'confidenceLevel',
			message: 'must be between 80 % and 99.9 % (e.g. 95 %)'
		});
	}
	return errors;
}

/**
 * Thresholds from a stored setting: each valid number kept, a missing one defaulted; a set that
 * no longer passes `thresholdErrors` falls back to the defaults as a whole.
 * @example thresholdsFromStored({ capable: 1.67 }).marginal // 1
 */
export function thresholdsFromStored(value: unknown): CapabilityThresholds {
	const v = (value ?? {}) as Partial<Record<keyof CapabilityThresholds, unknown>>;
	const pick = (k: keyof CapabilityThresholds) =>
		typeof v[k] === 'number' && Number.isFinite(v[k])
			? (v[k] as number)
			: DEFAULT_CAPABILITY_THRESHOLDS[k];
	const t = {
		capable: pick('capable'),
		marginal: pick('marginal'),
		confidenceLevel: pick('confidenceLevel')
	};
	return thresholdErrors(t).length ? { ...DEFAULT_CAPABILITY_THRESHOLDS } : t;
}

function checkBoundArgs(n: number, confidenceLevel: number, fn: string): void {
	if (!(confidenceLevel > 0.5 && confidenceLevel < 1)) {
		throw new RangeError(`${fn}: confidence level must be in (0.5, 1), got ${confidenceLevel}`);
	}
	if (!Number.isInteger(n) || n < 2)
		throw new RangeError(`${fn}: sample size must be an integer ≥ 2, got ${n}`);
}

/**
 * One-sided lower confidence bound of Cp (or Pp) from the chi-square distribution with n − 1
 * degrees of freedom: Ĉp·√(χ²_{1−γ}/(n − 1)), χ²_p the lower p-quantile (Montgomery, ISQC §8.3.5,
 * Eq. for the one-sided bound; check values in reference/spc/capability-bounds.json).
 * @example cpLowerBound(2.2857, 20, 0.95) // ≈ 1.668 (χ²_{0.05,19} = 10.117)
 */
export function cpLowerBound(cp: number, n: number, confidenceLevel = 0.95): number {
	checkBoundArgs(n, confidenceLevel, 'cpLowerBound');
	return cp * Math.sqrt(chiSquareQuantile(1 - confidenceLevel, n - 1) / (n - 1));
}

/**
 * One-sided lower confidence bound of Cpk (or Ppk), Bissell's (1990) normal approximation:
 * Ĉpk − z_γ·√(1/(9n) + Ĉpk²/(2(n − 1))) (Montgomery, ISQC §8.3.5, Example 8.6 prints the two-sided
 * form; check values in reference/spc/capability-bounds.json).
 * @example cpkLowerBound(1.33, 20, 0.95) // ≈ 0.955
 */
export function cpkLowerBound(cpk: number, n: number, confidenceLevel = 0.95): number {
	checkBoundArgs(n, confidenceLevel, 'cpkLowerBound');
	const z = inverseNormalCdf(confidenceLevel);
	return cpk - z * Math.sqrt(1 / (9 * n) + (cpk * cpk) / (2 * (n - 1)));
}

/** An open (not yet acknowledged) stored signal, as the assessment lists it. */
export interface OpenSignalRef {
	id: number;
	rule: string;
	chartPart: string;
	/** What the user knows the point by (board serial, run, time). */
	point: string;
}

/** Pieces measured out of specification in the shown data. */
export interface ObservedOutOfSpec {
	/** Values (or pads) looked at. */
	n: number;
	belowLsl: number;
	aboveUsl: number;
}

/** Input of `assessCapability`. */
export interface AssessmentInput {
	/** Indices of the shown data, or null when they could not be computed. */
	capability: CapabilityResult | null;
	/** Why there are no indices (no specs, too few values…), shown when `capability` is null. */
	capabilityMessage?: string | null;
	lsl: number | null;
	usl: number | null;
	/** Open stored signals of the chart (Phase II). */
	openSignals: readonly OpenSignalRef[];
	/** Run-rule violations in the data shown (Phase I and II alike). */
	violations: readonly Violation[];
	/** Number of plotted points the violations refer to. */
	pointsShown: number;
	/** Out-of-spec counts of the shown data, or null when the values are not at hand. */
	observed: ObservedOutOfSpec | null;
	thresholds?: Partial<CapabilityThresholds>;
}

/** A capability index with its one-sided lower confidence bound. */
export interface IndexWithBound {
	value: number | null;
	lowerBound: number | null;
}

/** Out-of-spec parts per million, by side. */
export interface PpmBySide {
	belowLsl: number | null;
	aboveUsl: number | null;
	total: number;
}

/** The assessment: verdict, the reasons, the indices side by side, observed and expected ppm. */
export interface CapabilityAssessment {
	verdict: CapabilityVerdict;
	/** Null when there was no data to judge stability on. */
	stable: boolean | null;
	/** One line, e.g. "Not stable, capability not assessed". */
	headline: string;
	/** The why, in plain words (lists open signals and flagged points). */
	detail: string;
	stability: {
		openSignals: OpenSignalRef[];
		/** Distinct plotted points flagged by a run rule in the data shown. */
		flaggedPoints: number;
		pointsShown: number;
		/** Rules that fired in the data shown, each once. */
		rules: string[];
	};
	/** The index the verdict rests on, or null when no verdict was given. */
	basis: { index: 'Cpk' | 'Ppk'; value: number; lowerBound: number } | null;
	/** Within (Cp, Cpk) and overall (Pp, Ppk) side by side, with lower bounds. */
	indices: {
		cp: IndexWithBound;
		cpk: IndexWithBound;
		pp: IndexWithBound;
		ppk: IndexWithBound;
		n: number;
	} | null;
	observed: (PpmBySide & { n: number; count: number }) | null;
	/** Expected from the normal model: within σ̂ when stable, overall s otherwise. */
	expected: (PpmBySide & { spread: 'within' | 'overall' }) | null;
	thresholds: CapabilityThresholds & { source: string };
}

const fmt = (v: number) => v.toFixed(2);

function bounds(value: number | null, n: number, level: number, kind: 'p' | 'pk'): IndexWithBound {
	if (value === null || !Number.isFinite(value) || n < 2) return { value, lowerBound: null };
	return {
		value,
		lowerBound: kind === 'p' ? cpLowerBound(value, n, level) : cpkLowerBound(value, n, level)
	};
}

function ruleName(rule: string): string {
	return RULE_DESCRIPTIONS[rule as RuleId] ?? rule;
}

/**
 * Judge a chart's capability: stability first, then the verdict on the lower confidence bound of
 * Cpk (Ppk when within σ is unknown) against the thresholds. Observed out-of-spec ppm from the
 * counts; expected ppm from within σ̂ when stable, from the overall s when not (an unstable
 * process's within σ̂ understates its spread).
 * @example assessCapability({ capability, lsl: 30, usl: 60, openSignals: [], violations: [], pointsShown: 20, observed: null }).verdict
 */
export function assessCapability(input: AssessmentInput): CapabilityAssessment {
	const t: CapabilityThresholds = { ...DEFAULT_CAPABILITY_THRESHOLDS, ...input.thresholds };
	const thresholds = { ...t, source: THRESHOLD_SOURCE };
	const cap = input.capability;
	const flagged = new Set(input.violations.flatMap((v) => v.points));
	const rules = [...new Set(input.violations.map((v) => v.rule))];
	const stability = {
		openSignals: [...input.openSignals],
		flaggedPoints: flagged.size,
		pointsShown: input.pointsShown,
		rules
	};
	const unstable = input.openSignals.length > 0 || flagged.size > 0;
	const stable = unstable ? false : input.pointsShown === 0 ? null : true;
	const level = t.confidenceLevel;
	const n = cap?.n ?? 0;
	const indices = cap
		? {
				cp: bounds(cap.cp, n, level, 'p'),
				cpk: bounds(cap.cpk, n, level, 'pk'),
				pp: bounds(cap.pp, n, level, 'p'),
				ppk: bounds(cap.ppk, n, level, 'pk'),
				n
			}
		: null;
	const observed =
		input.observed && input.observed.n > 0
			? {
					n: input.observed.n,
					count: input.observed.belowLsl + input.observed.aboveUsl,
					belowLsl: input.lsl === null ? null : (1e6 * input.observed.belowLsl) / input.observed.n,
					aboveUsl: input.usl === null ? null : (1e6 * input.observed.aboveUsl) / input.observed.n,
					total: (1e6 * (input.observed.belowLsl + input.observed.aboveUsl)) / input.observed.n
				}
			: null;
	const spread: 'within' | 'overall' = stable && cap?.sigmaWithin ? 'within' : 'overall';
	const sigma = spread === 'within' ? cap?.sigmaWithin : cap?.sigmaOverall;
	const model = cap && sigma ? expectedOutOfSpec(cap.mean, sigma, input.lsl, input.usl) : null;
	const expected = model
		? { belowLsl: model.ppmBelowLsl, aboveUsl: model.ppmAboveUsl, total: model.ppmTotal, spread }
		: null;
	const base = { stable, stability, indices, observed, expected, thresholds };

	if (stable === false) {
		const parts: string[] = [];
		if (input.openSignals.length) {
			const listed = input.openSignals
				.slice(0, 5)
				.map((s) => `${ruleName(s.rule)} at ${s.point}`)
				.join('; ');
			const more = input.openSignals.length > 5 ? `; and ${input.openSignals.length - 5} more` : '';
			parts.push(
				`${input.openSignals.length} open signal${input.openSignals.length === 1 ? '' : 's'}: ${listed}${more}`
			);
		}
		if (flagged.size) {
			parts.push(
				`the run rules flag ${flagged.size} of the ${input.pointsShown} points shown (${rules.map(ruleName).join('; ')})`
			);
		}
		return {
			...base,
			verdict: 'not-stable',
			headline: 'Not stable, capability not assessed',
			detail: `The process is out of control: ${parts.join('; ')}. Capability predicts only a stable process: find and remove the causes first. Pp/Ppk describe the spread so far.`,
			basis: null
		};
	}
	if (!cap || !indices) {
		return {
			...base,
			verdict: 'not-assessed',
			headline: 'Capability not assessed',
			detail:
				input.capabilityMessage ?? 'Capability needs data and at least one specification limit.',
			basis: null
		};
	}
	const applies: { index: 'Cpk' | 'Ppk'; b: IndexWithBound } =
		indices.cpk.value !== null
			? { index: 'Cpk', b: indices.cpk }
			: { index: 'Ppk', b: indices.ppk };
	if (applies.b.value === null || applies.b.lowerBound === null) {
		return {
			...base,
			verdict: 'not-assessed',
			headline: 'Capability not assessed',
			detail: cap.notes.join(' ') || 'The capability indices could not be computed.',
			basis: null
		};
	}
	const lower = applies.b.lowerBound;
	const basis = { index: applies.index, value: applies.b.value, lowerBound: lower };
	const pct = `${Math.round(level * 1000) / 10} %`;
	const said = `${applies.index} ${fmt(applies.b.value)}, ${pct} lower bound ${fmt(lower)}`;
	const stableWords = stable === null ? '' : 'Stable (no open signals, no rule flags). ';
	if (lower >= t.capable) {
		return {
			...base,
			verdict: 'capable',
			headline: 'Capable',
			detail: `${stableWords}${said}: at or above ${fmt(t.capable)}.`,
			basis
		};
	}
	if (lower >= t.marginal) {
		return {
			...base,
			verdict: 'marginal',
			headline: 'Marginal',
			detail: `${stableWords}${said}: between ${fmt(t.marginal)} and ${fmt(t.capable)}; little margin for drift.`,
			basis
		};
	}
	return {
		...base,
		verdict: 'not-capable',
		headline: 'Not capable',
		detail: `${stableWords}${said}: below ${fmt(t.marginal)}; out-of-spec parts are expected. Reduce the spread or re-centre.`,
		basis
	};
}

/** The words each verdict is shown with (lists, badges, e-mails). */
export const VERDICT_WORDS: Record<CapabilityVerdict, string> = {
	'not-stable': 'Not stable, capability not assessed',
	capable: 'Capable',
	marginal: 'Marginal',
	'not-capable': 'Not capable',
	'not-assessed': 'Not assessed'
};

/**
 * Count values outside the specification (a value on a limit is inside).
 * @example countOutOfSpec([1, 5, 9], 2, 8) // { n: 3, belowLsl: 1, aboveUsl: 1 }
 */
export function countOutOfSpec(
	values: readonly number[],
	lsl: number | null,
	usl: number | null
): ObservedOutOfSpec {
	let below = 0;
	let above = 0;
	for (const v of values) {
		if (lsl !== null && v < lsl) below++;
		else if (usl !== null && v > usl) above++;
	}
	return { n: values.length, belowLsl: below, aboveUsl: above };
}
