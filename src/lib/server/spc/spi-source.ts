import { and, eq, getTableColumns, inArray, isNotNull } from 'drizzle-orm';
import { SPI_MEASURES, type SpiMeasureId } from '$lib/spi/measures';
import type { ApertureInput } from '$lib/stencil';
import {
	groupBoards,
	inAreaRatioBand,
	valuesPerPoint,
	type BoardValues,
	type ObservedOutOfSpec,
	type PadEvidence,
	type SourceSubgroup
} from '$lib/spc';
import type { Db } from '../db';
import {
	apertures,
	products,
	spiBoards,
	spiPadMeasurements,
	spiPads,
	stencils
} from '../db/schema';
import type { CharacteristicRow } from './source-types';

type SpiMeasure = SpiMeasureId;

const padMeasurementColumns = Object.values(getTableColumns(spiPadMeasurements));

/**
 * Per SPI measure (from the catalogue): its pad-measurement column, or null (transfer efficiency
 * has none: pad-level TE needs aperture volumes, so all pads only), and the factor from stored
 * board figures to charted values (TE is stored as a fraction, charted in %).
 */
const COLUMNS = Object.fromEntries(
	SPI_MEASURES.map((m) => [
		m.id,
		{
			pad: (padMeasurementColumns.find((c) => c.name === m.padColumn) ?? null) as
				typeof spiPadMeasurements.volumeCentiPct | null,
			scale: m.chartScale
		}
	])
) as Record<SpiMeasure, { pad: typeof spiPadMeasurements.volumeCentiPct | null; scale: number }>;

/** SQL column prefix of each measure's aggregates in spi_boards. */
const PREFIX = Object.fromEntries(SPI_MEASURES.map((m) => [m.id, m.column])) as Record<
	SpiMeasure,
	string
>;

/** Pad-measurement column (hundredths) of each measure; TE has none. */
const PAD_COLUMN = Object.fromEntries(SPI_MEASURES.map((m) => [m.id, m.padColumn])) as Record<
	SpiMeasure,
	string | null
>;

type BoardRow = {
	id: number;
	serial: string;
	at: Date;
	lineCode: string;
	count: number;
	mean: number | null;
	sd: number | null;
	range: number | null;
	min: number | null;
	max: number | null;
};

// Prepared once per database, measure and number of lines: this query is the chart's hot path
// (an index range scan on product + time, newest first).
const statements = new WeakMap<object, Map<string, import('better-sqlite3').Statement>>();

/** The product code the SPI rows carry: the chart's own when loaded with it, else read once. */
function productCodeOf(db: Db, c: CharacteristicRow & { productCode?: string }): string {
	if (c.productCode !== undefined) return c.productCode;
	const product = db
		.select({ code: products.code })
		.from(products)
		.where(eq(products.id, c.productId))
		.get();
	return product?.code ?? '';
}

function newestBoards(
	db: Db,
	c: CharacteristicRow,
	productCode: string,
	measure: SpiMeasure,
	minCount: number,
	limit: number
): BoardRow[] {
	const p = PREFIX[measure];
	const key = `${p}:${c.lineIds.length}`;
	let cache = statements.get(db.$client);
	if (!cache) statements.set(db.$client, (cache = new Map()));
	let stmt = cache.get(key);
	if (!stmt) {
		const lineFilter = c.lineIds.length
			? `and line_id in (${c.lineIds.map(() => '?').join(', ')})`
			: '';
		stmt = db.$client.prepare(
			`select id, serial, inspected_at as at, line_code as lineCode, ${p}_count as count, ${p}_mean as mean,
			 ${p}_sd as sd, ${p}_range as range, ${p}_min as min, ${p}_max as max from spi_boards
			 where product_code = ? ${lineFilter} and ${p}_count >= ?
			 order by inspected_at desc, id desc limit ?`
		);
		cache.set(key, stmt);
	}
	const rows = stmt.all(productCode, ...c.lineIds, minCount, limit) as (Omit<BoardRow, 'at'> & {
		at: number;
	})[];
	const out: BoardRow[] = new Array(rows.length);
	for (let i = 0; i < rows.length; i++) {
		const r = rows[i];
		out[rows.length - 1 - i] = {
			id: r.id,
			serial: r.serial,
			at: new Date(r.at),
			lineCode: r.lineCode,
			count: r.count,
			mean: r.mean,
			sd: r.sd,
			range: r.range,
			min: r.min,
			max: r.max
		};
	}
	return out;
}

/** Pad ids of the characteristic's pad selection (null = all pads). */
export function selectedPadIds(
	db: Db,
	c: CharacteristicRow,
	code = productCodeOf(db, c)
): number[] | null {
	const sel = c.padSelection;
	if (sel.kind === 'all') return null;
	if (sel.kind === 'refdes') {
		return db
			.select({ id: spiPads.id })
			.from(spiPads)
			.where(and(eq(spiPads.productCode, code), inArray(spiPads.refdes, sel.refdes)))
			.all()
			.map((p) => p.id);
	}
	const rows = db
		.select({ id: spiPads.id, a: apertures, thicknessUm: stencils.thicknessUm })
		.from(spiPads)
		.innerJoin(apertures, eq(apertures.id, spiPads.apertureId))
		.innerJoin(stencils, eq(stencils.id, apertures.stencilId))
		.where(and(eq(spiPads.productCode, code), isNotNull(spiPads.apertureId)))
		.all();
	return rows
		.filter((r) => inAreaRatioBand(r.a as unknown as ApertureInput, r.thicknessUm, sel))
		.map((r) => r.id);
}

/**
 * The newest boards of a characteristic as subgroups. All pads: from the per-board aggregates
 * (no pad rows read); a refdes list or area-ratio band: the selected pads' measurements. For
 * I-MR, and for n consecutive boards, each board contributes one value: its mean.
 */
export function loadSpiSubgroups(
	db: Db,
	c: CharacteristicRow,
	limitSubgroups: number
): SourceSubgroup[] {
	const col = COLUMNS[c.measure as SpiMeasure];
	if (!col) return [];
	const perPoint = valuesPerPoint(c);
	// The product code once for the pad selection and the board query.
	const code = productCodeOf(db, c);
	const padIds = selectedPadIds(db, c, code);
	const boards = newestBoards(
		db,
		c,
		code,
		c.measure as SpiMeasure,
		padIds ? 1 : 2,
		Math.min(200_000, limitSubgroups * perPoint)
	);
	if (boards.length === 0) return [];
	const s = col.scale;
	let perBoard: BoardValues[];
	if (padIds === null) {
		perBoard = boards
			.filter((b) => b.mean !== null)
			.map((b) => ({
				id: b.id,
				serial: b.serial,
				at: b.at,
				lineCode: b.lineCode,
				values: [],
				stats: {
					n: b.count,
					mean: (b.mean ?? 0) * s,
					sd: (b.sd ?? 0) * s,
					range: (b.range ?? 0) * s,
					min: b.min === null ? null : b.min * s,
					max: b.max === null ? null : b.max * s
				}
			}));
	} else {
		if (!col.pad || padIds.length === 0) return [];
		const padCol = col.pad;
		const byBoard = new Map<number, number[]>();
		const ids = boards.map((b) => b.id);
		for (let i = 0; i < ids.length; i += 500) {
			const rows = db
				.select({ boardId: spiPadMeasurements.boardId, v: padCol })
				.from(spiPadMeasurements)
				.where(
					and(
						inArray(spiPadMeasurements.boardId, ids.slice(i, i + 500)),
						inArray(spiPadMeasurements.padId, padIds)
					)
				)
				.all();
			for (const r of rows) {
				if (r.v === null) continue;
				const list = byBoard.get(r.boardId) ?? [];
				list.push(r.v / 100);
				byBoard.set(r.boardId, list);
			}
		}
		perBoard = boards
			.filter((b) => (byBoard.get(b.id)?.length ?? 0) > 0)
			.map((b) => ({
				id: b.id,
				serial: b.serial,
				at: b.at,
				lineCode: b.lineCode,
				values: byBoard.get(b.id) ?? [],
				stats: undefined
			}));
	}
	return groupBoards(perBoard, c, limitSubgroups);
}

function padStatement(db: Db, sql: string) {
	let cache = statements.get(db.$client);
	if (!cache) statements.set(db.$client, (cache = new Map()));
	let stmt = cache.get(sql);
	if (!stmt) cache.set(sql, (stmt = db.$client.prepare(sql)));
	return stmt;
}

/**
 * The pads behind per-board aggregated subgroups (all pads), read once per chart request: pad
 * values of the newest boards (at most 50 boards, `maxValues` values) for the histogram, and the
 * pads of every shown board outside the spec for the observed ppm beside the expected one. Boards
 * whose stored minimum and maximum lie inside the spec are counted from the aggregates alone;
 * only the others have their pad rows counted. `observed` is null for measures without pad values
 * (transfer efficiency).
 */
export function padEvidence(
	db: Db,
	c: CharacteristicRow,
	subgroups: readonly SourceSubgroup[],
	maxValues = 5_000
): PadEvidence {
	const measure = c.measure as SpiMeasure;
	const column = PAD_COLUMN[measure];
	const boards = subgroups.filter((s) => s.stats && s.boardId !== null && s.boardId > 0);
	if (!column || c.padSelection.kind !== 'all' || boards.length === 0)
		return { values: [], observed: null };
	// Raw prepared statements: this runs on every chart view and reads thousands of rows.
	const sample = padStatement(
		db,
		`select ${column} from spi_pad_measurements where board_id = ? and ${column} is not null limit ?`
	);
	const values: number[] = [];
	// Newest boards first until enough values: the histogram shows the current state.
	for (
		let i = boards.length - 1;
		i >= 0 && values.length < maxValues && boards.length - i <= 50;
		i--
	) {
		const rows = sample.raw(true).all(boards[i].boardId, maxValues - values.length) as [number][];
		for (const [v] of rows) values.push(v / 100);
	}
	return { values, observed: padsOutOfSpec(db, column, boards, c.lsl, c.usl) };
}

function padsOutOfSpec(
	db: Db,
	column: string,
	boards: readonly SourceSubgroup[],
	lsl: number | null,
	usl: number | null
): ObservedOutOfSpec {
	// Pad values are stored in hundredths: compare in hundredths, as the aggregates were made.
	const lslCenti = lsl === null ? null : lsl * 100;
	const uslCenti = usl === null ? null : usl * 100;
	const count = padStatement(
		db,
		`select sum(case when ? is not null and ${column} < ? then 1 else 0 end) as below,
		 sum(case when ? is not null and ${column} > ? then 1 else 0 end) as above
		 from spi_pad_measurements where board_id = ? and ${column} is not null`
	);
	let n = 0;
	let below = 0;
	let above = 0;
	for (const b of boards) {
		const st = b.stats!;
		n += st.n ?? 0;
		const min = st.min ?? null;
		const max = st.max ?? null;
		const outside =
			(lsl !== null && min !== null && min < lsl) || (usl !== null && max !== null && max > usl);
		if (!outside) continue;
		const counted = count.get(lslCenti, lslCenti, uslCenti, uslCenti, b.boardId) as {
			below: number | null;
			above: number | null;
		};
		below += counted.below ?? 0;
		above += counted.above ?? 0;
	}
	return { n, belowLsl: below, aboveUsl: above };
}

/** Product and line of stored boards, to find the characteristics an import feeds. */
export function boardScopes(
	db: Db,
	boardIds: number[]
): { productId: number; lineId: number | null }[] {
	const scopes = new Map<string, { productId: number; lineId: number | null }>();
	for (let i = 0; i < boardIds.length; i += 500) {
		const rows = db
			.selectDistinct({ productId: spiBoards.productId, lineId: spiBoards.lineId })
			.from(spiBoards)
			.where(inArray(spiBoards.id, boardIds.slice(i, i + 500)))
			.all();
		for (const r of rows) {
			if (r.productId !== null)
				scopes.set(`${r.productId}:${r.lineId}`, { productId: r.productId, lineId: r.lineId });
		}
	}
	return [...scopes.values()];
}
