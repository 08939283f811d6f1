import { and, asc, desc, eq, inArray } from 'drizzle-orm';
import type { Db } from '../db';
import { lines, printRuns, spcCharacteristics } from '../db/schema';
import { cfxDeviatingBoardValues } from '../cfx/board-points';
import { isSpiMeasure } from '$lib/spc/chart-measures';
import { loadSpiSubgroups } from './spi-source';

import { groupRuns, printParameterValue, valuesPerPoint } from '$lib/spc';
import type { CharacteristicRow, SourceSubgroup } from './source-types';

export type { CharacteristicRow, SourceSubgroup };

/**
 * The newest `limitSubgroups` subgroups of a characteristic, oldest first. Print parameters: one
 * value per run (runs without the parameter are skipped), grouped n at a time for consecutive
 * subgroups (an incomplete newest group waits). SPI measures: `loadSpiSubgroups`.
 * @example loadSubgroups(db, characteristic, 200).map((s) => s.values)
 */
export function loadSubgroups(
	db: Db,
	c: CharacteristicRow,
	limitSubgroups = 200
): SourceSubgroup[] {
	if (isSpiMeasure(c.measure)) return loadSpiSubgroups(db, c, limitSubgroups);
	const key = c.parameterKey ?? '';
	const per = valuesPerPoint(c);
	const where = and(
		eq(printRuns.productId, c.productId),
		c.lineIds.length ? inArray(printRuns.lineId, c.lineIds) : undefined
	);
	// Over-read a little: some runs may lack the parameter.
	const rows = db
		.select({
			id: printRuns.id,
			parameters: printRuns.parameters,
			ambientTempC: printRuns.ambientTempC,
			relativeHumidityPct: printRuns.relativeHumidityPct,
			startedAt: printRuns.startedAt,
			lineCode: lines.code
		})
		.from(printRuns)
		.innerJoin(lines, eq(lines.id, printRuns.lineId))
		.where(where)
		.orderBy(desc(printRuns.startedAt), desc(printRuns.id))
		.limit(Math.min(200_000, limitSubgroups * per * 2 + 50))
		.all()
		.reverse();
	const usable = rows
		.map((r) => ({
			id: r.id,
			startedAt: r.startedAt,
			lineCode: r.lineCode,
			value: printParameterValue(r, key)
		}))
		.filter((r): r is typeof r & { value: number } => r.value !== null);
	// Boards a printer reported over CFX outside the recipe window are points too, like runs.
	const boards = cfxDeviatingBoardValues(db, c.productId, c.lineIds, key, limitSubgroups * per);
	if (boards.length) {
		usable.push(...boards);
		usable.sort((a, b) => a.startedAt.getTime() - b.startedAt.getTime() || a.id - b.id);
	}
	return groupRuns(usable, per, limitSubgroups);
}

/** Characteristics whose data a print run of this product and line feeds (for evaluation). */
export function characteristicsFor(
	db: Db,
	productId: number,
	lineId: number | null
): CharacteristicRow[] {
	return db
		.select()
		.from(spcCharacteristics)
		.where(and(eq(spcCharacteristics.productId, productId), eq(spcCharacteristics.active, true)))
		.orderBy(asc(spcCharacteristics.id))
		.all()
		.filter((c) => lineId === null || c.lineIds.length === 0 || c.lineIds.includes(lineId));
}
