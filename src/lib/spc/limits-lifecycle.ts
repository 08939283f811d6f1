import type { ChartCharacteristic, SourceSubgroup } from './chart-input';
import { phaseOneLimits, pointsFor } from './chart-detail';
import type { ChartKind, ChartLimits } from './chart-types';
import { SpcInputError } from './spc-input-error';
import { Refusal, type FieldProblem } from '../errors';

/** A refused lifecycle step, with the field and the reason (HTTP 422 / form error). */
export class LimitsError extends Refusal {
	readonly status = 422;
	constructor(
		readonly field: string,
		message: string
	) {
		super(message);
	}

	override get fieldProblems(): FieldProblem[] {
		return [{ field: this.field, message: this.message }];
	}
}

/**
 * Fewest subgroups a baseline needs before limits may be frozen: 20 by default (Montgomery, ISQC
 * §6.2: trial limits from 20–25 subgroups; from memory). Sites may set 10–200.
 */
export const DEFAULT_MIN_BASELINE_SUBGROUPS = 20;

/** Whether a site setting for the fewest baseline subgroups is acceptable (a whole 10–200). */
export const isMinBaselineSubgroups = (n: unknown): n is number =>
	typeof n === 'number' && Number.isInteger(n) && n >= 10 && n <= 200;

/** Limits to freeze and the baseline they came from, before they are stored. */
export interface BaselineLimits {
	limits: ChartLimits;
	baselinePoints: number;
	baselineFrom: Date | null;
	baselineTo: Date | null;
	/** The exclusions that left shown points out (exclusions of older points are not recorded). */
	excluded: { key: string; reason: string }[];
}

/**
 * Phase I → II: limits from the baseline (the period, minus excluded points).
 * @throws LimitsError when the baseline has fewer subgroups than `minSubgroups`, too little data
 *   or no variation.
 */
export function baselineLimits(
	c: Pick<ChartCharacteristic, 'chartKind'>,
	subgroups: SourceSubgroup[],
	exclusions: { key: string; reason: string }[],
	period: { baselineFrom?: Date | null; baselineTo?: Date | null },
	minSubgroups: number
): BaselineLimits {
	const excludedKeys = new Set(exclusions.map((e) => e.key));
	let limits: ChartLimits;
	try {
		const points = pointsFor(c.chartKind as ChartKind, subgroups);
		limits = phaseOneLimits(
			c,
			subgroups,
			points,
			excludedKeys,
			period.baselineFrom,
			period.baselineTo
		);
	} catch (e) {
		if (!(e instanceof SpcInputError)) throw e;
		throw new LimitsError(
			'baseline',
			`Cannot compute limits from this baseline: ${e.field}: ${e.reason}.`
		);
	}
	if (!(limits.sigmaWithin > 0) || !Number.isFinite(limits.location.ucl)) {
		throw new LimitsError(
			'baseline',
			'Zero variation in the baseline: the limits would collapse onto the centre line.'
		);
	}
	const used = limits.baselineIndices.map((i) => subgroups[i]);
	if (used.length < minSubgroups) {
		const left = subgroups.length - used.length;
		throw new LimitsError(
			'baseline',
			`The baseline has ${used.length} subgroup${used.length === 1 ? '' : 's'}${left ? ` (${left} left out: excluded or outside the period)` : ''}; at least ${minSubgroups} are needed for limits to hold. Widen the period or wait for more data.`
		);
	}
	const times = used.map((s) => s.at?.getTime()).filter((t): t is number => t !== undefined);
	return {
		limits,
		baselinePoints: used.length,
		baselineFrom: times.length ? new Date(Math.min(...times)) : null,
		baselineTo: times.length ? new Date(Math.max(...times)) : null,
		excluded: exclusions.filter((e) => subgroups.some((s) => s.key === e.key))
	};
}

/**
 * The reason of a point exclusion, trimmed (stored up to 500 characters).
 * @throws LimitsError without a reason or for a key that names no chart point.
 */
export function exclusionReason(pointKey: string, reason: string): string {
	const why = reason.trim();
	if (!why)
		throw new LimitsError('reason', 'Say why the point is excluded (the assignable cause).');
	if (!/^(run|board):\d+$/.test(pointKey))
		throw new LimitsError('pointKey', `"${pointKey}" is not a point of this chart.`);
	return why;
}
