import { z } from 'zod';
import { capabilityJson } from './capability-json';
import type { ComputedChart } from './chart-detail';

/**
 * The JSON answers and queries of the chart and signal API (and the pages that show the same):
 * plain mappings from what the server loaded and computed, so every view reads one shape.
 */

/** What `chartJson` reads: the computed chart and the characteristic's names. */
export interface ChartJsonInput extends ComputedChart {
	characteristic: {
		id: number;
		name: string;
		productCode: string;
		lineCodes: string[];
		measure: string;
		parameterKey: string | null;
		chartKind: string;
		unit: string;
		lsl: number | null;
		target: number | null;
		usl: number | null;
		rules: string[];
	};
}

/** A stored signal with its chart's names, as `signalJson` reads it. */
export interface SignalJsonInput {
	id: number;
	characteristicId: number;
	characteristicName: string;
	productCode: string;
	lineCodes: string[];
	rule: string;
	chartPart: string;
	pointKey: string;
	pointKeys: string[];
	boardIds: number[];
	pointAt: Date | null;
	value: number | null;
	runId: number | null;
	limitVersionId: number;
	createdAt: Date;
	status: 'open' | 'acknowledged';
	ackCause: string | null;
	ackAction: string | null;
	ackNote: string | null;
	ackBy: string | null;
	ackAt: Date | null;
}

/** Filters of `GET /api/signals` and the signals page. */
export interface SignalQuery {
	status?: 'open' | 'acknowledged' | 'all';
	characteristicId?: number;
	rule?: string;
	limit?: number;
}

/** Query of `GET /api/charts/{id}`: newest `limit` subgroups (1..5000). */
export function chartQuery(url: URL): { limit: number } {
	const raw = url.searchParams.get('limit');
	const limit = raw === null ? 200 : Number(raw);
	return { limit: Number.isInteger(limit) && limit >= 1 && limit <= 5000 ? limit : 200 };
}

/** JSON of `GET /api/charts/{id}`: points, limits, violations, capability (numbers unrounded). */
export function chartJson(d: ChartJsonInput) {
	const c = d.characteristic;
	const cap = d.capability.result;
	return {
		id: c.id,
		name: c.name,
		product: c.productCode,
		lines: c.lineCodes,
		measure: c.measure,
		parameterKey: c.parameterKey,
		chartKind: c.chartKind,
		unit: c.unit,
		specs: { lsl: c.lsl, target: c.target, usl: c.usl },
		rules: c.rules,
		phase: d.chart?.phase ?? null,
		limitsVersion: d.chart?.limitsVersion ?? null,
		limits: d.chart
			? {
					location: d.chart.limits.location,
					dispersion: d.chart.limits.dispersion,
					movingRange: d.chart.limits.movingRange ?? null,
					sigmaWithin: d.chart.limits.sigmaWithin,
					subgroupSize: d.chart.limits.subgroupSize
				}
			: null,
		points: (d.chart?.points ?? []).map((p) => ({
			index: p.index,
			key: p.key,
			label: p.label,
			boardId: p.boardId,
			at: p.at,
			n: p.size,
			location: p.location,
			dispersion: p.dispersion,
			movingRange: p.movingRange ?? null,
			excluded: p.excluded
		})),
		violations: d.chart?.violations ?? [],
		capability: cap ? capabilityJson(cap, d.capability.assessment) : null,
		assessment: d.capability.assessment,
		message: d.message ?? d.capability.message
	};
}

/** JSON of one signal in `GET /api/signals` and the acknowledge answer. */
export function signalJson(s: SignalJsonInput) {
	return {
		id: s.id,
		chartId: s.characteristicId,
		chart: s.characteristicName,
		product: s.productCode,
		lines: s.lineCodes,
		rule: s.rule,
		chartPart: s.chartPart,
		pointKey: s.pointKey,
		pointKeys: s.pointKeys,
		boardIds: s.boardIds,
		pointAt: s.pointAt,
		value: s.value,
		runId: s.runId,
		limitVersionId: s.limitVersionId,
		createdAt: s.createdAt,
		status: s.status,
		acknowledgement: s.ackAt
			? { cause: s.ackCause, action: s.ackAction, note: s.ackNote, by: s.ackBy, at: s.ackAt }
			: null
	};
}

/** Body of `POST /api/signals/{id}/acknowledge`. */
export const acknowledgeBodySchema = z.object({
	cause: z.string().trim().min(1, 'choose an assignable cause').max(80),
	action: z.string().trim().min(1, 'choose a corrective action').max(80),
	note: z.string().max(2000).optional(),
	wholeRun: z.boolean().optional(),
	expectedCount: z.number().int().min(1).max(100_000).optional()
});

/** Query of `GET /api/signals`. */
export function signalQuery(url: URL): SignalQuery {
	const status = url.searchParams.get('status');
	const chart = Number(url.searchParams.get('chart'));
	const limit = Number(url.searchParams.get('limit'));
	return {
		status: status === 'open' || status === 'acknowledged' ? status : 'all',
		characteristicId: Number.isInteger(chart) && chart > 0 ? chart : undefined,
		rule: url.searchParams.get('rule') || undefined,
		limit: Number.isInteger(limit) && limit > 0 ? Math.min(limit, 1000) : 200
	};
}
