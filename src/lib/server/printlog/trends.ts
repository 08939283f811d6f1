import { and, asc, eq } from 'drizzle-orm';
import {
	AMBIENT_PARAMETER_KEYS,
	NUMERIC_PARAMETER_KEYS,
	NUMERIC_PARAMETERS,
	type NumericWindow,
	type WindowedParameterKey
} from '$lib/printlog';
import { individualsChart, type ControlLimits } from '$lib/spc';
import type { Db } from '../db';
import { printRuns } from '../db/schema';
import { resolveLineProduct } from './lookups';
import { currentRecipeFor } from './recipes';
import { refuseIfAny } from './request-error';

/** One parameter's individuals/moving-range series with its recipe window. */
export type ParameterTrend = {
	key: WindowedParameterKey;
	label: string;
	unit: string;
	decimals: number;
	/** The current recipe's window, or null when the recipe does not window it. */
	window: NumericWindow | null;
	points: { runId: number; startedAt: string; value: number; movingRange: number | null }[];
	/** I-MR limits (NIST/SEMATECH §6.3.2.2 via $lib/spc), or null with fewer than 2 values. */
	limits: { individuals: ControlLimits; movingRange: ControlLimits; sigma: number } | null;
};

/** Trends of every logged numeric parameter of one product on one line. */
export type RunTrends = {
	line: string;
	product: string;
	recipeVersion: number | null;
	runCount: number;
	parameters: ParameterTrend[];
};

/**
 * Build the I-MR series of each numeric parameter (and ambient condition) logged for a product
 * on a line, oldest run first, with the current recipe window for drawing. A parameter no run
 * logged is left out; one with a single value has no limits.
 * @throws PrintlogRequestError 422 for unknown line or product codes.
 */
export function runTrends(
	db: Db,
	codes: { line: string; product: string },
	options: { from?: Date; limit?: number } = {}
): RunTrends {
	const { line, product, errors } = resolveLineProduct(db, codes);
	refuseIfAny(errors);
	const rows = db
		.select({
			id: printRuns.id,
			startedAt: printRuns.startedAt,
			parameters: printRuns.parameters,
			ambientTempC: printRuns.ambientTempC,
			relativeHumidityPct: printRuns.relativeHumidityPct
		})
		.from(printRuns)
		.where(and(eq(printRuns.lineId, line!.id), eq(printRuns.productId, product!.id)))
		.orderBy(asc(printRuns.startedAt), asc(printRuns.id))
		.all()
		.filter((r) => !options.from || r.startedAt >= options.from)
		.slice(-(options.limit ?? 1000));
	const recipe = currentRecipeFor(db, line!.id, product!.id);
	const keys: WindowedParameterKey[] = [...NUMERIC_PARAMETER_KEYS, ...AMBIENT_PARAMETER_KEYS];
	const parameters: ParameterTrend[] = [];
	for (const key of keys) {
		const series = rows
			.map((r) => ({
				runId: r.id,
				startedAt: r.startedAt.toISOString(),
				value: key === 'ambientTempC' || key === 'relativeHumidityPct' ? r[key] : r.parameters[key]
			}))
			.filter(
				(p): p is { runId: number; startedAt: string; value: number } =>
					typeof p.value === 'number' && Number.isFinite(p.value)
			);
		if (series.length === 0) continue;
		const spec = NUMERIC_PARAMETERS[key];
		let limits: ParameterTrend['limits'] = null;
		let ranges: (number | null)[] = series.map(() => null);
		if (series.length >= 2) {
			const chart = individualsChart(series.map((p) => p.value));
			ranges = chart.points.map((p) => p.dispersion);
			limits = {
				individuals: chart.limits.location,
				movingRange: chart.limits.dispersion,
				sigma: chart.limits.sigmaWithin
			};
		}
		parameters.push({
			key,
			label: spec.label,
			unit: spec.unit,
			decimals: spec.decimals,
			window: (recipe?.parameters[key] as NumericWindow | undefined) ?? null,
			points: series.map((p, i) => ({ ...p, movingRange: ranges[i] })),
			limits
		});
	}
	return {
		line: line!.code,
		product: product!.code,
		recipeVersion: recipe?.version ?? null,
		runCount: rows.length,
		parameters
	};
}
