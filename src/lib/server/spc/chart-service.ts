import { and, asc, desc, eq, inArray, isNull } from 'drizzle-orm';
import {
	assessCapability,
	capabilityHistogram,
	countOutOfSpec,
	pointKeyWords,
	chartPoints,
	computeLimits,
	evaluateChart,
	processCapability,
	RULE_IDS,
	SpcInputError,
	type ChartKind,
	type ChartLimits,
	type CapabilityResult,
	type ChartPoint,
	type RuleId,
	type CapabilityThresholds,
	type ObservedOutOfSpec,
	type OpenSignalRef,
	type Violation
} from '$lib/spc';
import { parameterLabel } from '$lib/printlog';
import { countPadsOutOfSpec, samplePadValues } from './spi-source';
import { getCapabilityThresholds } from './capability-settings';
import { summaryCapability } from './summary-capability';
import type { Db } from '../db';
import {
	lines,
	products,
	spcCharacteristics,
	spcExclusions,
	spcLimitVersions,
	spcSignals,
	users
} from '../db/schema';
import { loadSubgroups, type CharacteristicRow, type SourceSubgroup } from './chart-source';
import { MEASURE_DEFAULTS, type Measure } from './measures';
import type { CapabilityView, ChartView } from './view-types';

/** A characteristic with the names the pages show. */
export interface CharacteristicSummary extends CharacteristicRow {
	productCode: string;
	lineCodes: string[];
	measureLabel: string;
}

/** One frozen limits version, for the history list. */
export interface LimitVersionSummary {
	id: number;
	version: number;
	createdAt: Date;
	createdBy: string | null;
	baselinePoints: number;
	baselineFrom: Date | null;
	baselineTo: Date | null;
	excluded: { key: string; reason: string }[];
	note: string;
	limits: ChartLimits;
}

/** Everything the chart page and `GET /api/charts/{id}` show. */
export interface ChartDetail {
	characteristic: CharacteristicSummary;
	chart: ChartView | null;
	capability: CapabilityView;
	/** Why there is no chart, or a caveat (too few points, zero variation, type changed). */
	message: string | null;
	versions: LimitVersionSummary[];
	exclusions: { key: string; reason: string }[];
}

/** Options of `chartDetail`. */
export interface ChartDetailOptions {
	/** Newest subgroups shown (1..5000); default 200. */
	limit?: number;
	/** Phase I baseline period: only points in [from, to] feed the computed limits. */
	baselineFrom?: Date | null;
	baselineTo?: Date | null;
}

export class NotFoundError extends Error {}

export function summarize(db: Db, rows: CharacteristicRow[]): CharacteristicSummary[] {
	if (rows.length === 0) return [];
	const productCodes = new Map(
		db
			.select({ id: products.id, code: products.code })
			.from(products)
			.all()
			.map((p) => [p.id, p.code])
	);
	const lineCodes = new Map(
		db
			.select({ id: lines.id, code: lines.code })
			.from(lines)
			.all()
			.map((l) => [l.id, l.code])
	);
	return rows.map((c) => ({
		...c,
		productCode: productCodes.get(c.productId) ?? `#${c.productId}`,
		lineCodes: c.lineIds.map((id) => lineCodes.get(id) ?? `#${id}`),
		measureLabel:
			c.measure === 'print-parameter'
				? `${parameterLabel(c.parameterKey ?? '')} (print log)`
				: (MEASURE_DEFAULTS[c.measure as Measure]?.label ?? c.measure)
	}));
}

export function getCharacteristic(db: Db, id: number): CharacteristicSummary {
	const row = db.select().from(spcCharacteristics).where(eq(spcCharacteristics.id, id)).get();
	if (!row) throw new NotFoundError(`No chart with id ${id}.`);
	return summarize(db, [row])[0];
}

export function listCharacteristics(db: Db): CharacteristicSummary[] {
	return summarize(
		db,
		db.select().from(spcCharacteristics).orderBy(asc(spcCharacteristics.name)).all()
	);
}

/** Newest frozen limits of a characteristic, or undefined in Phase I. */
export function latestLimitVersion(db: Db, characteristicId: number) {
	return db
		.select()
		.from(spcLimitVersions)
		.where(eq(spcLimitVersions.characteristicId, characteristicId))
		.orderBy(desc(spcLimitVersions.version))
		.limit(1)
		.get();
}

export function listLimitVersions(db: Db, characteristicId: number): LimitVersionSummary[] {
	return db
		.select({ v: spcLimitVersions, by: users.name })
		.from(spcLimitVersions)
		.leftJoin(users, eq(users.id, spcLimitVersions.createdByUserId))
		.where(eq(spcLimitVersions.characteristicId, characteristicId))
		.orderBy(desc(spcLimitVersions.version))
		.all()
		.map(({ v, by }) => ({
			id: v.id,
			version: v.version,
			createdAt: v.createdAt,
			createdBy: by,
			baselinePoints: v.baselinePoints,
			baselineFrom: v.baselineFrom,
			baselineTo: v.baselineTo,
			excluded: v.excluded,
			note: v.note,
			limits: v.limits as unknown as ChartLimits
		}));
}

export function listExclusions(db: Db, characteristicId: number) {
	return db
		.select({ key: spcExclusions.pointKey, reason: spcExclusions.reason })
		.from(spcExclusions)
		.where(eq(spcExclusions.characteristicId, characteristicId))
		.orderBy(asc(spcExclusions.id))
		.all();
}

/** Chart data of the source subgroups for the engine (`number[]` for I-MR). */
export function engineData(kind: ChartKind, subgroups: SourceSubgroup[]): number[] | number[][] {
	return kind === 'i-mr' ? subgroups.map((s) => s.values[0]) : subgroups.map((s) => s.values);
}

/** The most frequent subgroup size (board pad counts can differ by a few missing pads). */
function modalSize(sizes: number[]): number {
	const counts = new Map<number, number>();
	for (const n of sizes) counts.set(n, (counts.get(n) ?? 0) + 1);
	return [...counts].sort((a, b) => b[1] - a[1] || b[0] - a[0])[0][0];
}

/**
 * Chart points of the source subgroups: from the values through the engine, or, for per-board
 * aggregates, directly (x̄, and R for n ≤ 10 or s above; moving range of the means for
 * between/within). Aggregated boards whose pad counts differ are charted with the modal count
 * as n (a few missing pads barely move the constants at these sizes).
 * @throws SpcInputError as the engine's point builders.
 */
export function pointsFor(kind: ChartKind, subgroups: SourceSubgroup[]): ChartPoint[] {
	if (!subgroups.length || !subgroups[0].stats)
		return chartPoints(kind, engineData(kind, subgroups));
	const size = modalSize(subgroups.map((s) => s.stats?.n ?? 0));
	const useRange = kind === 'xbar-r' || (kind === 'between-within' && size <= 10);
	return subgroups.map((s, i) => {
		const st = s.stats ?? { n: 0, mean: NaN, sd: NaN, range: NaN };
		const point: ChartPoint = { location: st.mean, dispersion: useRange ? st.range : st.sd, size };
		if (kind === 'between-within') {
			point.movingRange =
				i === 0 ? null : Math.abs(st.mean - (subgroups[i - 1].stats?.mean ?? NaN));
		}
		return point;
	});
}

export const ruleList = (c: CharacteristicRow): RuleId[] =>
	c.rules.filter((r): r is RuleId => (RULE_IDS as readonly string[]).includes(r));

/** Phase I limits from the given points: baseline period and exclusions left out. */
export function phaseOneLimits(
	c: CharacteristicRow,
	subgroups: SourceSubgroup[],
	points: ChartPoint[],
	excludedKeys: Set<string>,
	from?: Date | null,
	to?: Date | null
): ChartLimits {
	const exclude: number[] = [];
	subgroups.forEach((s, i) => {
		const outside = (from && s.at && s.at < from) || (to && s.at && s.at > to) ? true : false;
		if (outside || excludedKeys.has(s.key)) exclude.push(i);
	});
	return computeLimits(c.chartKind as ChartKind, points, { exclude });
}

/** Open (unacknowledged) signals of a characteristic, named as the user knows the points. */
export function openSignalRefs(
	db: Db,
	characteristicId: number,
	labels: Map<string, string> = new Map()
): OpenSignalRef[] {
	return db
		.select({
			id: spcSignals.id,
			rule: spcSignals.rule,
			chartPart: spcSignals.chartPart,
			pointKey: spcSignals.pointKey
		})
		.from(spcSignals)
		.where(and(eq(spcSignals.characteristicId, characteristicId), isNull(spcSignals.ackAt)))
		.orderBy(asc(spcSignals.id))
		.limit(1000)
		.all()
		.map((s) => ({
			id: s.id,
			rule: s.rule,
			chartPart: s.chartPart,
			point: labels.get(s.pointKey) ?? pointKeyWords(s.pointKey)
		}));
}

interface AssessmentContext {
	openSignals: OpenSignalRef[];
	violations: Violation[];
	pointsShown: number;
	thresholds: CapabilityThresholds;
}

function noCapability(
	c: CharacteristicRow,
	message: string,
	ctx: AssessmentContext
): CapabilityView {
	const assessment = assessCapability({
		capability: null,
		capabilityMessage: message,
		lsl: c.lsl,
		usl: c.usl,
		observed: null,
		...ctx
	});
	return {
		result: null,
		histogram: null,
		lsl: c.lsl,
		usl: c.usl,
		target: c.target,
		message,
		assessment
	};
}

/**
 * The chart of a characteristic: its newest subgroups judged against the newest frozen limits
 * (Phase II) or against limits computed from the baseline (Phase I), the rule violations, and
 * capability of the shown values with within σ̂ from the limits.
 * @throws NotFoundError for an unknown id.
 */
export function chartDetail(db: Db, id: number, options: ChartDetailOptions = {}): ChartDetail {
	const c = getCharacteristic(db, id);
	const limit = Math.max(1, Math.min(5000, Math.floor(options.limit ?? 200)));
	const subgroups = loadSubgroups(db, c, limit);
	const exclusions = listExclusions(db, id);
	const versions = listLimitVersions(db, id);
	const base = { characteristic: c, versions, exclusions };
	const thresholds = getCapabilityThresholds(db);
	const labels = new Map(subgroups.map((s) => [s.key, s.label]));
	const openSignals = openSignalRefs(db, id, labels);
	const empty = { openSignals, violations: [], pointsShown: 0, thresholds };
	if (subgroups.length === 0) {
		const message =
			c.measure === 'print-parameter'
				? `No print runs of ${c.productCode} with ${parameterLabel(c.parameterKey ?? '').toLowerCase()} logged yet.`
				: 'No inspection data for this product and these lines yet.';
		return { ...base, chart: null, capability: noCapability(c, message, empty), message };
	}
	const kind = c.chartKind as ChartKind;
	let points: ChartPoint[];
	let limits: ChartLimits;
	let message: string | null = null;
	let phase: 'I' | 'II' = 'I';
	let version: number | null = null;
	try {
		points = pointsFor(kind, subgroups);
		const frozen = versions[0];
		const frozenLimits = frozen?.limits;
		if (
			frozenLimits &&
			frozenLimits.kind === kind &&
			frozenLimits.subgroupSize === points[0].size
		) {
			limits = frozenLimits;
			phase = 'II';
			version = frozen.version;
		} else {
			if (frozenLimits) {
				message = `The chart type or subgroup size changed since limits v${frozen.version}; these limits are computed (Phase I). Freeze a new version.`;
			}
			const excluded = new Set(exclusions.map((e) => e.key));
			limits = phaseOneLimits(
				c,
				subgroups,
				points,
				excluded,
				options.baselineFrom,
				options.baselineTo
			);
		}
	} catch (e) {
		if (!(e instanceof SpcInputError)) throw e;
		const msg = `Not enough usable data for a chart yet (${e.field}: ${e.reason}).`;
		return { ...base, chart: null, capability: noCapability(c, msg, empty), message: msg };
	}
	if (!(limits.sigmaWithin > 0)) {
		const msg =
			'Zero variation: every subgroup has the same values, so the limits collapse; check the gauge resolution or the data.';
		return { ...base, chart: null, capability: noCapability(c, msg, empty), message: msg };
	}
	const rules = ruleList(c);
	const excludedKeys = new Map(exclusions.map((e) => [e.key, e.reason]));
	const chart: ChartView = {
		kind,
		title: c.name,
		unit: c.unit,
		// Explicit fields, not object spread: spread is far slower here and this runs per point.
		points: points.map((p, index) => ({
			location: p.location,
			dispersion: p.dispersion,
			size: p.size,
			movingRange: p.movingRange,
			index,
			key: subgroups[index].key,
			label: subgroups[index].label,
			boardId: subgroups[index].boardId,
			at: subgroups[index].at,
			excluded: phase === 'I' && excludedKeys.has(subgroups[index].key),
			excludeReason: excludedKeys.get(subgroups[index].key) ?? null
		})),
		limits,
		violations: evaluateChart(points, limits, rules),
		rules,
		phase,
		limitsVersion: version
	};
	const capability = capabilityOf(db, c, subgroups, limits, {
		openSignals,
		violations: chart.violations,
		pointsShown: chart.points.length,
		thresholds
	});
	return { ...base, chart, capability, message };
}

/** Capability of the shown data: from the values, or from pooled per-board aggregates. */
function capabilityOf(
	db: Db,
	c: CharacteristicRow,
	subgroups: SourceSubgroup[],
	limits: ChartLimits,
	ctx: AssessmentContext
): CapabilityView {
	if (c.lsl == null && c.usl == null)
		return noCapability(c, 'Set LSL and/or USL to see capability.', ctx);
	try {
		let result: CapabilityResult;
		let values: number[];
		let observed: ObservedOutOfSpec | null;
		if (subgroups[0]?.stats) {
			result = summaryCapability({
				groups: subgroups.map((s) => s.stats ?? { n: 0, mean: 0, sd: 0 }),
				sigmaWithin: limits.sigmaWithin,
				lsl: c.lsl,
				usl: c.usl,
				target: c.target
			});
			// The histogram shows the pads of the newest boards; the indices use every shown board.
			values = samplePadValues(
				db,
				c,
				subgroups.map((s) => s.boardId ?? 0)
			);
			observed = countPadsOutOfSpec(
				db,
				c,
				subgroups.map((s) => s.boardId ?? 0),
				c.lsl,
				c.usl
			);
		} else {
			values = subgroups.flatMap((s) => s.values);
			result = processCapability({
				values,
				sigmaWithin: limits.sigmaWithin,
				lsl: c.lsl,
				usl: c.usl,
				target: c.target
			});
			observed = countOutOfSpec(values, c.lsl, c.usl);
		}
		const assessment = assessCapability({
			capability: result,
			lsl: c.lsl,
			usl: c.usl,
			observed,
			...ctx
		});
		return {
			result,
			histogram: values.length
				? capabilityHistogram(values, {
						mean: result.mean,
						sigmaOverall: result.sigmaOverall,
						sigmaWithin: result.sigmaWithin,
						lsl: c.lsl,
						usl: c.usl
					})
				: null,
			lsl: c.lsl,
			usl: c.usl,
			target: c.target,
			message: null,
			assessment
		};
	} catch (e) {
		if (!(e instanceof SpcInputError)) throw e;
		return noCapability(c, `Capability not computed: ${e.field}: ${e.reason}.`, ctx);
	}
}

/** Characteristic ids by id list (helper for signals and summary). */
export function characteristicsByIds(db: Db, ids: number[]): CharacteristicSummary[] {
	if (!ids.length) return [];
	return summarize(
		db,
		db.select().from(spcCharacteristics).where(inArray(spcCharacteristics.id, ids)).all()
	);
}
