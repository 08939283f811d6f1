import { and, asc, desc, eq, gte, inArray, isNull, lte, type SQL } from 'drizzle-orm';
import { matchScannedCode } from '$lib/printlog';
import type { Db } from '../db';
import { lines, printRuns, spiBoards } from '../db/schema';
import { listStencilRefs, resolveLineProduct } from './lookups';
import { getPasteLot } from './paste-lots';
import { PrintlogRequestError } from './request-error';
import { runQuery, toView, type RunFilters, type RunView } from './run-view';

/** Runs matching the filters, newest first (at most `limit`, default 500). */
export function listRuns(db: Db, filters: RunFilters = {}): RunView[] {
	const where: SQL[] = [];
	const { line, product } = resolveLineProduct(db, {
		line: filters.line ?? '',
		product: filters.product ?? ''
	});
	// An unknown code filters everything out rather than being ignored.
	if (filters.line) where.push(eq(printRuns.lineId, line?.id ?? -1));
	if (filters.product) where.push(eq(printRuns.productId, product?.id ?? -1));
	if (filters.stencil) {
		const ids = listStencilRefs(db)
			.filter((s) => matchScannedCode(filters.stencil!, [{ code: s.name, label: '' }]).match)
			.map((s) => s.id);
		where.push(inArray(printRuns.stencilId, ids.length ? ids : [-1]));
	}
	if (filters.lot) {
		const lot = getPasteLot(db, filters.lot);
		where.push(eq(printRuns.pasteLotId, lot?.id ?? -1));
	}
	if (filters.from) where.push(gte(printRuns.startedAt, filters.from));
	if (filters.to) where.push(lte(printRuns.startedAt, filters.to));
	if (filters.open) where.push(isNull(printRuns.endedAt));
	if (filters.stencilId !== undefined) where.push(eq(printRuns.stencilId, filters.stencilId));
	return runQuery(db)
		.where(and(...where))
		.orderBy(desc(printRuns.startedAt), desc(printRuns.id))
		.limit(Math.min(filters.limit ?? 500, 5000))
		.all()
		.map(toView);
}

/** One run by id. */
export function getRun(db: Db, id: number): RunView | undefined {
	const row = runQuery(db).where(eq(printRuns.id, id)).get();
	return row && toView(row);
}

/** The newest run on a line (any product), to pre-fill the next one. */
export function lastRunOnLine(db: Db, lineId: number, productId?: number): RunView | undefined {
	const where = [eq(printRuns.lineId, lineId)];
	if (productId !== undefined) where.push(eq(printRuns.productId, productId));
	const row = runQuery(db)
		.where(and(...where))
		.orderBy(desc(printRuns.startedAt), desc(printRuns.id))
		.get();
	return row && toView(row);
}

/** Open runs (one per line at most), by line code. */
export function openRuns(db: Db): RunView[] {
	return runQuery(db).where(isNull(printRuns.endedAt)).orderBy(asc(lines.code)).all().map(toView);
}

/**
 * The product an SPI inspection file named for this exact board serial (newest inspection), or
 * undefined when SPI has not seen the board. One lookup on the serial index.
 */
export function inspectedProductOfSerial(
	db: Db,
	serial: string
): { productCode: string; inspectedAt: Date } | undefined {
	return db
		.select({ productCode: spiBoards.productCode, inspectedAt: spiBoards.inspectedAt })
		.from(spiBoards)
		.where(eq(spiBoards.serial, serial))
		.orderBy(desc(spiBoards.inspectedAt))
		.limit(1)
		.get();
}

/** One run by id, or a 404 refusal. */
export function requireRun(db: Db, id: number): RunView {
	const run = getRun(db, id);
	if (!run) throw new PrintlogRequestError(404, [{ field: 'id', message: `no print run #${id}` }]);
	return run;
}
