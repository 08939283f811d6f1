/**
 * Boards a printer reported over CFX with print parameters outside the recipe window, as points
 * of the print-parameter charts (`../spc/chart-source`): a board out of the window is judged by
 * the same rules, raises signals and mails followers the way a typed print run's value does.
 * Only deviating boards are read (a partial index holds just those), so charts of lines without
 * machines, or machines printing inside the window, read nothing more.
 */
import type { Db } from '../db';

/** A chart value of one deviating board (shaped like a print run's, with its own point key). */
export interface BoardPointValue {
	id: number;
	startedAt: Date;
	lineCode: string;
	value: number;
	point: { key: string; label: string };
}

/** The point key of a CFX board: `cfx-unit:<cfx_units.id>`. */
export const cfxUnitPointKey = (unitId: number) => `cfx-unit:${unitId}`;

/**
 * The newest `limit` boards of a product (on `lineIds`, or every line when empty) whose reported
 * value of `parameterKey` deviated from the recipe window, oldest first.
 */
export function cfxDeviatingBoardValues(
	db: Db,
	productId: number,
	lineIds: readonly number[],
	parameterKey: string,
	limit: number
): BoardPointValue[] {
	if (!/^[A-Za-z]{1,60}$/.test(parameterKey)) return [];
	const lines = lineIds.filter((id) => Number.isSafeInteger(id)).slice(0, 500);
	const rows = db.$client
		.prepare(
			`select u.id, u.unit_identifier as serial, u.processed_at as atMs, l.code as lineCode,
			        json_extract(u.parameters, '$.${parameterKey}') as value
			   from cfx_units u join lines l on l.id = u.line_id
			  where u.product_id = ? and u.deviations != '[]'
			    ${lines.length ? `and u.line_id in (${lines.map(() => '?').join(',')})` : ''}
			    and u.processed_at is not null
			    and exists (select 1 from json_each(u.deviations) d
			                 where json_extract(d.value, '$.parameter') = ? and json_extract(d.value, '$.kind') = 'numeric')
			  order by u.processed_at desc, u.id desc limit ?`
		)
		.all(productId, ...lines, parameterKey, Math.max(1, Math.min(200_000, limit))) as {
		id: number;
		serial: string;
		atMs: number;
		lineCode: string;
		value: unknown;
	}[];
	return rows
		.filter(
			(r): r is typeof r & { value: number } =>
				typeof r.value === 'number' && Number.isFinite(r.value)
		)
		.reverse()
		.map((r) => ({
			id: r.id,
			startedAt: new Date(r.atMs),
			lineCode: r.lineCode,
			value: r.value,
			point: { key: cfxUnitPointKey(r.id), label: `board ${r.serial} (printer)` }
		}));
}
