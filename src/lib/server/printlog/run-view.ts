import { eq } from 'drizzle-orm';
import type { Deviation } from '$lib/printlog';
import type { Db } from '../db';
import { lines, pasteLots, printRuns, products, stencils, users } from '../db/schema';

/** A deviation as stored with a run: the pure check's result plus the technician's reason. */
export type StoredDeviation = Deviation & { reason: string | null };

/** A deviation as the API answers it: `{ parameter, value, min, max }` (+ `expected` for text). */
export type ApiDeviation = {
	parameter: string;
	value: number | string;
	min: number | null;
	max: number | null;
	expected?: string;
};

/** A print run as pages and the API show it. */
export type RunView = {
	id: number;
	line: string;
	product: string;
	stencil: string | null;
	stencilRevision: string | null;
	stencilId: number | null;
	pasteLot: string | null;
	pasteLotId: number | null;
	bladeCode: string | null;
	/** Serial of the first board printed, as scanned (null when not logged). */
	boardSerial: string | null;
	recipeVersion: number | null;
	recipeId: number | null;
	parameters: Record<string, unknown>;
	ambientTempC: number | null;
	relativeHumidityPct: number | null;
	operator: string | null;
	startedAt: Date;
	endedAt: Date | null;
	boardsPrinted: number;
	deviations: StoredDeviation[];
	warnings: string[];
	overrideReason: string | null;
	corrections: number;
};

/** Filters of the run list and `GET /api/print-runs`. Codes as scanned; dates inclusive. */
export type RunFilters = {
	line?: string;
	product?: string;
	stencil?: string;
	lot?: string;
	from?: Date;
	to?: Date;
	open?: boolean;
	/** One stencil revision by id (the stencil life page). */
	stencilId?: number;
	limit?: number;
};

/** The joined select every run read starts from. */
export function runQuery(db: Db) {
	return db
		.select({
			run: printRuns,
			line: lines.code,
			product: products.code,
			stencil: stencils.name,
			stencilRevision: stencils.revision,
			pasteLot: pasteLots.lotNumber,
			operator: users.name
		})
		.from(printRuns)
		.innerJoin(lines, eq(lines.id, printRuns.lineId))
		.innerJoin(products, eq(products.id, printRuns.productId))
		.leftJoin(stencils, eq(stencils.id, printRuns.stencilId))
		.leftJoin(pasteLots, eq(pasteLots.id, printRuns.pasteLotId))
		.leftJoin(users, eq(users.id, printRuns.operatorUserId));
}

export type RunRow = Awaited<ReturnType<ReturnType<typeof runQuery>['all']>>[number];

/** A joined row as pages and the API show it. */
export function toView(row: RunRow): RunView {
	const r = row.run;
	return {
		id: r.id,
		line: row.line,
		product: row.product,
		stencil: row.stencil,
		stencilRevision: row.stencilRevision,
		stencilId: r.stencilId,
		pasteLot: row.pasteLot,
		pasteLotId: r.pasteLotId,
		bladeCode: r.bladeCode,
		boardSerial: r.boardSerial,
		recipeVersion: r.recipeVersion,
		recipeId: r.recipeId,
		parameters: r.parameters,
		ambientTempC: r.ambientTempC,
		relativeHumidityPct: r.relativeHumidityPct,
		operator: row.operator,
		startedAt: r.startedAt,
		endedAt: r.endedAt,
		boardsPrinted: r.boardsPrinted,
		deviations: r.deviations as StoredDeviation[],
		warnings: r.warnings,
		overrideReason: r.overrideReason,
		corrections: r.corrections
	};
}

/** The API shape of a deviation. */
export function apiDeviation(d: Deviation): ApiDeviation {
	if (d.kind === 'numeric')
		return { parameter: d.parameter, value: d.value, min: d.min, max: d.max };
	return { parameter: d.parameter, value: d.value, min: null, max: null, expected: d.expected };
}

/** A run as the audit log keeps it (times as ISO text). */
export function auditSnapshot(run: RunView): Record<string, unknown> {
	return {
		...run,
		startedAt: run.startedAt.toISOString(),
		endedAt: run.endedAt?.toISOString() ?? null
	};
}
