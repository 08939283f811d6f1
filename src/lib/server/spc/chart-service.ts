import { and, asc, desc, eq, inArray, isNull } from 'drizzle-orm';
import {
	computeChart,
	needsPadEvidence,
	pointKeyWords,
	type CapabilityThresholds,
	type ChartLimits,
	type ComputedChart,
	type OpenSignalRef
} from '$lib/spc';
import { parameterLabel } from '$lib/printlog';
import { Refusal } from '$lib/errors';
import { padEvidence } from './spi-source';
import { getCapabilityThresholds } from './capability-settings';
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
import { loadSubgroups, type CharacteristicRow } from './chart-source';
import { MEASURE_DEFAULTS, type Measure } from '$lib/spc/chart-measures';

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
export interface ChartDetail extends ComputedChart {
	characteristic: CharacteristicSummary;
	versions: LimitVersionSummary[];
	exclusions: { key: string; reason: string }[];
	/** The open signals (oldest first), loaded once for the assessment and the page's list. */
	openSignals: OpenChartSignal[];
}

/** Options of `chartDetail`. */
export interface ChartDetailOptions {
	/** Newest subgroups shown (1..5000); default 200. */
	limit?: number;
	/** Phase I baseline period: only points in [from, to] feed the computed limits. */
	baselineFrom?: Date | null;
	baselineTo?: Date | null;
	/** The site's verdict thresholds when already read (a list of charts reads them once). */
	thresholds?: CapabilityThresholds;
}

/** A chart (characteristic) that does not exist: 404. */
export class NotFoundError extends Refusal {
	readonly status = 404;
}

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

/** An open signal of the chart: what the assessment names and the page lists. */
export interface OpenChartSignal extends OpenSignalRef {
	pointKey: string;
	pointAt: Date | null;
}

/** Open (unacknowledged) signals of a characteristic, oldest first, named as the user knows the points. */
export function openSignalRefs(
	db: Db,
	characteristicId: number,
	labels: Map<string, string> = new Map()
): OpenChartSignal[] {
	return db
		.select({
			id: spcSignals.id,
			rule: spcSignals.rule,
			chartPart: spcSignals.chartPart,
			pointKey: spcSignals.pointKey,
			pointAt: spcSignals.pointAt
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
			point: labels.get(s.pointKey) ?? pointKeyWords(s.pointKey),
			pointKey: s.pointKey,
			pointAt: s.pointAt
		}));
}

/**
 * The chart of a characteristic, the one path of the chart page and `GET /api/charts/{id}`: every
 * input is loaded once (subgroups, limits versions, exclusions, open signals, thresholds and, for
 * per-board aggregates, the pads of the histogram and the out-of-spec count), then
 * `computeChart` computes once.
 * @throws NotFoundError for an unknown id.
 */
export function chartDetail(db: Db, id: number, options: ChartDetailOptions = {}): ChartDetail {
	const c = getCharacteristic(db, id);
	const limit = Math.max(1, Math.min(5000, Math.floor(options.limit ?? 200)));
	const subgroups = loadSubgroups(db, c, limit);
	const exclusions = listExclusions(db, id);
	const versions = listLimitVersions(db, id);
	const labels = new Map(subgroups.map((s) => [s.key, s.label]));
	const openSignals = openSignalRefs(db, id, labels);
	const computed = computeChart({
		characteristic: c,
		subgroups,
		frozen: versions[0] ?? null,
		exclusions,
		baselineFrom: options.baselineFrom,
		baselineTo: options.baselineTo,
		// The assessment names the signals only (its JSON is part of the API answer).
		openSignals: openSignals.map(({ id, rule, chartPart, point }) => ({
			id,
			rule,
			chartPart,
			point
		})),
		thresholds: options.thresholds ?? getCapabilityThresholds(db),
		pads: needsPadEvidence(c, subgroups) ? padEvidence(db, c, subgroups) : null
	});
	return { characteristic: c, versions, exclusions, openSignals, ...computed };
}

/** Characteristic ids by id list (helper for signals and summary). */
export function characteristicsByIds(db: Db, ids: number[]): CharacteristicSummary[] {
	if (!ids.length) return [];
	return summarize(
		db,
		db.select().from(spcCharacteristics).where(inArray(spcCharacteristics.id, ids)).all()
	);
}
