/**
 * OEE per printer and shift, and changeover durations, read from what the CFX endpoint stored
 * (cfx_units, cfx_line_events, spi_boards). The computation is the pure `$lib/cfx/oee`.
 */
import {
	changeovers,
	computeOee,
	demonstratedBestCycle,
	DEMONSTRATED_LAST_UNITS,
	type Changeover,
	type OeeResult
} from '$lib/cfx';
import { shiftsOfDay as siteShiftsOfDay, type ShiftSettings } from '$lib/floor/shifts';
import type { Db } from '../db';
import { siteShiftSettings } from '../floor/shift-settings';
import { Refusal } from '$lib/errors';

/** Shift starts used when neither the request nor SHIFT_STARTS names any. */
export const DEFAULT_SHIFT_STARTS = ['06:00', '14:00', '22:00'];
/** Most boards read for one printer and shift, or one line's changeovers (counted first). */
export const MAX_BOARDS_READ = 200_000;

export interface PrinterShiftOee extends OeeResult {
	printer: string;
	line: string;
	shift: { start: string; end: string };
}

/**
 * The shifts of one day from their start times (`06:00`…), each up to the next start, on the
 * wall clock of `timeZone` (default UTC; see `$lib/floor/shifts`).
 */
export function shiftsOfDay(
	day: string,
	starts: readonly string[],
	timeZone = 'UTC'
): { startMs: number; endMs: number; key: string }[] {
	return siteShiftsOfDay(day, { starts, timeZone });
}

/** A request OEE cannot answer (a shift with more boards than it reads): 422. */
export class OeeRequestError extends Refusal {
	readonly status = 422;
}

function countBoards(
	db: Db,
	endpointOrLine: 'endpoint_id' | 'line_id',
	id: number,
	fromMs: number,
	toMs: number
): number {
	return db.$client
		.prepare(
			`select count(*) from cfx_units where ${endpointOrLine} = ? and processed_at >= ? and processed_at < ?`
		)
		.pluck()
		.get(id, fromMs, toMs) as number;
}

/**
 * OEE of every printer (or the printers of one line) for each shift of a UTC day.
 * @throws OeeRequestError when a shift holds more boards than MAX_BOARDS_READ
 */
export function printerOee(
	db: Db,
	options: {
		/** A site-local day (the shifts starting on it). */
		day: string;
		/** Default: the site's (SHIFT_STARTS, SITE_TIME_ZONE). */
		shiftStarts?: readonly string[];
		timeZone?: string;
		line?: string | null;
		idleAfterMs?: number;
	}
): PrinterShiftOee[] {
	const site: ShiftSettings = siteShiftSettings();
	const settings: ShiftSettings = {
		starts: options.shiftStarts ?? site.starts,
		timeZone: options.timeZone ?? site.timeZone
	};
	const printers = db.$client
		.prepare(
			`select e.id, e.handle, e.line_id as lineId, l.code as line from cfx_endpoints e join lines l on l.id = e.line_id
			  where e.kind = 'printer' ${options.line ? 'and upper(l.code) = upper(?)' : ''} order by l.code, e.handle`
		)
		.all(...(options.line ? [options.line] : [])) as {
		id: number;
		handle: string;
		lineId: number;
		line: string;
	}[];
	const shifts = siteShiftsOfDay(options.day, settings);
	const boardsOf = db.$client.prepare(
		`select u.unit_identifier as serial, u.processed_at as atMs, p.code as product, u.product_id as productId, u.cycle_time_ms as cycleTimeMs
		   from cfx_units u left join products p on p.id = u.product_id
		  where u.line_id = ? and u.endpoint_id = ? and u.processed_at >= ? and u.processed_at < ? order by u.processed_at`
	);
	const firstInspection = db.$client
		.prepare(`select fail_count from spi_boards where serial = ? order by inspected_at limit 1`)
		.pluck();
	const faultsOf = db.$client.prepare(
		`select f.at as occurredAtMs, json_extract(f.detail, '$.faultId') as faultId,
		        (select min(c.at) from cfx_line_events c where c.endpoint_id = f.endpoint_id and c.kind = 'fault-cleared'
		            and json_extract(c.detail, '$.faultId') = json_extract(f.detail, '$.faultId') and c.at >= f.at) as clearedAtMs
		   from cfx_line_events f where f.endpoint_id = ? and f.kind = 'fault' and f.at < ?`
	);
	// The printer's last units of a product before the shift's end, newest first (walks the
	// line/time index backwards from the shift's end).
	const recentCyclesOf = db.$client
		.prepare(
			`select u.cycle_time_ms from cfx_units u where u.line_id = ? and u.endpoint_id = ? and u.product_id = ?
			    and u.processed_at < ? and u.cycle_time_ms > 0
			  order by u.processed_at desc limit ${DEMONSTRATED_LAST_UNITS}`
		)
		.pluck();
	const recipeIdealOf = db.$client
		.prepare(
			`select ideal_cycle_time_ms from print_recipes where line_id = ? and product_id = ?
			  order by version desc limit 1`
		)
		.pluck();
	const out: PrinterShiftOee[] = [];
	for (const printer of printers) {
		for (const shift of shifts) {
			if (
				countBoards(db, 'endpoint_id', printer.id, shift.startMs, shift.endMs) > MAX_BOARDS_READ
			) {
				throw new OeeRequestError(
					`${printer.handle} printed more than ${MAX_BOARDS_READ} boards in one shift`
				);
			}
			const rows = boardsOf.all(printer.lineId, printer.id, shift.startMs, shift.endMs) as {
				serial: string;
				atMs: number;
				product: string | null;
				productId: number | null;
				cycleTimeMs: number | null;
			}[];
			// Ideal per product: the current recipe's, else the printer's demonstrated best.
			const ideal: Record<string, number> = {};
			const demonstrated: Record<string, number> = {};
			const demonstratedHow: Record<string, string> = {};
			for (const r of rows) {
				if (r.product === null || r.productId === null) continue;
				if (r.product in ideal || r.product in demonstrated) continue;
				const recipeIdeal = recipeIdealOf.get(printer.lineId, r.productId) as number | null;
				if (recipeIdeal && recipeIdeal > 0) {
					ideal[r.product] = recipeIdeal;
					continue;
				}
				const best = demonstratedBestCycle(
					recentCyclesOf.all(printer.lineId, printer.id, r.productId, shift.endMs) as number[],
					r.product
				);
				if (best) {
					demonstrated[r.product] = best.valueMs;
					demonstratedHow[r.product] = best.how;
				}
			}
			const faults = (
				faultsOf.all(printer.id, shift.endMs) as {
					occurredAtMs: number;
					faultId: string | null;
					clearedAtMs: number | null;
				}[]
			)
				// An uncleared fault with no id cannot be matched: it counts up to the shift's end.
				.filter((f) => f.clearedAtMs === null || f.clearedAtMs > shift.startMs);
			const result = computeOee({
				shift,
				boards: rows.map((r) => {
					const fails = firstInspection.get(r.serial) as number | undefined;
					return {
						atMs: r.atMs,
						product: r.product,
						cycleTimeMs: r.cycleTimeMs,
						firstPassed: fails === undefined ? null : fails === 0
					};
				}),
				faults,
				idealCycleMs: ideal,
				demonstratedCycleMs: demonstrated,
				demonstratedHow,
				idleAfterMs: options.idleAfterMs
			});
			out.push({
				printer: printer.handle,
				line: printer.line,
				shift: {
					start: new Date(shift.startMs).toISOString(),
					end: new Date(shift.endMs).toISOString()
				},
				...result
			});
		}
	}
	return out;
}

/** Stencil and product changeovers of each line (or one) between two times. */
export function lineChangeovers(
	db: Db,
	options: { fromMs: number; toMs: number; line?: string | null }
): (Changeover & { line: string })[] {
	const lines = db.$client
		.prepare(
			`select distinct l.id, l.code from cfx_endpoints e join lines l on l.id = e.line_id
			  ${options.line ? 'where upper(l.code) = upper(?)' : ''} order by l.code`
		)
		.all(...(options.line ? [options.line] : [])) as { id: number; code: string }[];
	const out: (Changeover & { line: string })[] = [];
	for (const line of lines) {
		if (countBoards(db, 'line_id', line.id, options.fromMs, options.toMs) > MAX_BOARDS_READ) {
			throw new OeeRequestError(
				`line ${line.code} printed more than ${MAX_BOARDS_READ} boards in the period: ask for a shorter one`
			);
		}
		const boards = db.$client
			.prepare(
				`select u.processed_at as atMs, p.code as product from cfx_units u left join products p on p.id = u.product_id
				  join cfx_endpoints e on e.id = u.endpoint_id
				  where u.line_id = ? and e.kind = 'printer' and u.processed_at >= ? and u.processed_at < ?`
			)
			.all(line.id, options.fromMs, options.toMs) as { atMs: number; product: string | null }[];
		const stencilChanges = db.$client
			.prepare(
				`select at as atMs, json_extract(detail, '$.oldName') as "from", json_extract(detail, '$.newName') as "to"
					   from cfx_line_events where line_id = ? and kind = 'stencil-changed' and at >= ? and at < ?`
			)
			.all(line.id, options.fromMs, options.toMs) as {
			atMs: number;
			from: string | null;
			to: string | null;
		}[];
		for (const c of changeovers(boards, stencilChanges)) out.push({ ...c, line: line.code });
	}
	return out;
}
