import { and, asc, desc, eq, inArray } from 'drizzle-orm';
import type { Db } from '../db';
import { lines, printRuns, spcCharacteristics } from '../db/schema';
import { isSpiMeasure } from './measures';
import { loadSpiSubgroups } from './spi-source';

import type { CharacteristicRow, SourceSubgroup } from './source-types';

export type { CharacteristicRow, SourceSubgroup };

/** Values per plotted point: n for consecutive subgroups, else 1 (print log) or the pads. */
export const valuesPerPoint = (c: CharacteristicRow) =>
	c.subgroupMode === 'consecutive' ? Math.max(1, c.subgroupSize) : 1;

function printParameterValue(
	run: {
		parameters: Record<string, unknown>;
		ambientTempC: number | null;
		relativeHumidityPct: number | null;
	},
	key: string
): number | null {
	const raw =
		run.parameters?.[key] ??
		(key === 'ambientTempC'
			? run.ambientTempC
			: key === 'relativeHumidityPct'
				? run.relativeHumidityPct
				: null);
	const v =
		typeof raw === 'number' ? raw : typeof raw === 'string' && raw.trim() ? Number(raw) : NaN;
	return Number.isFinite(v) ? v : null;
}

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
	const out: SourceSubgroup[] = [];
	const full = usable.length - (usable.length % per);
	for (let i = 0; i < full; i += per) {
		const group = usable.slice(i, i + per);
		const first = group[0];
		const last = group[group.length - 1];
		out.push({
			key: `run:${first.id}`,
			label:
				per === 1
					? `run ${first.id} · ${first.lineCode}`
					: `runs ${first.id}–${last.id} · ${first.lineCode}`,
			boardId: null,
			boardIds: [],
			at: last.startedAt,
			values: group.map((g) => g.value)
		});
	}
	return out.slice(-limitSubgroups);
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
