import {
	analyseTransferEfficiency,
	areaRatioBin,
	TE_BUCKET_MAX,
	TE_BUCKET_WIDTH
} from '$lib/analysis';
import type { TeAnalysis, TeHistogramRow } from '$lib/analysis';
import type { Db } from '../db';
import { checkStoredStencil } from '../stencils/evaluation';

/** Filters of `GET /api/analysis/transfer-efficiency` (all optional but floor). */
export interface TeFilters {
	technology: string | null;
	/** Paste alloy of the run's paste lot, e.g. SAC305 (exact). */
	paste: string | null;
	/** J-STD-005 powder type of the run's paste lot. */
	powder: number | null;
	fromMs: number | null;
	toMs: number | null;
	floor: number;
}

/**
 * Heavy-work bounds. SQLite is synchronous, so the pad scan runs in slices of PADS_PER_SLICE pads
 * with the event loop free between them, and it is capped: when the matching boards hold more
 * pads, the most recent boards up to the cap are used and the answer says so (`boardsUsed` <
 * `boardsMatched`). bench:analysis prints the time.
 */
export const MAX_PADS_SCANNED = 2_000_000;
export const MAX_STENCILS = 200;
/** Pads aggregated per synchronous slice (about 0.13 s measured); other requests run between. */
export const PADS_PER_SLICE = 100_000;
let requestCounter = 0;

export interface TeAnswer extends TeAnalysis {
	boardsMatched: number;
	boardsUsed: number;
	stencils: number;
	/** Measured pads without an absolute volume (volume_um3) or an aperture: not in the TE. */
	padsWithoutVolume: number;
	note: string | null;
}

interface BoardRow {
	id: number;
	stencil_id: number;
	product_code: string;
	te_count: number;
}

/**
 * Transfer efficiency against area ratio from the site's own SPI data.
 *
 * Per pad TE = volume_um3 ÷ aperture volume (opening area × the foil thickness at the aperture,
 * step regions included, as the stencil check computes it). Only the absolute volume is used:
 * SPI's volume % is relative to the machine's own nominal, which need not be the aperture's.
 * A pad is matched to the aperture of the board's stencil with the same refdes and pad (as the
 * ingest links them; every panel of a panelised board uses the same aperture).
 *
 * The pad scan is one SQL aggregate over temporary tables (boards used, pad → aperture AR bin and
 * 1/volume), grouped by AR bin and TE bucket, so the answer is built from a few thousand rows.
 */
export async function transferEfficiency(
	db: Db,
	filters: TeFilters,
	options: { padsPerSlice?: number } = {}
): Promise<TeAnswer> {
	const padsPerSlice = options.padsPerSlice ?? PADS_PER_SLICE;
	const conn = db.$client;
	const where: string[] = ['b.stencil_id is not null', 'b.te_count > 0'];
	const params: (string | number)[] = [];
	if (filters.technology !== null) {
		where.push('s.technology = ?');
		params.push(filters.technology);
	}
	if (filters.paste !== null) {
		where.push('l.alloy = ?');
		params.push(filters.paste);
	}
	if (filters.powder !== null) {
		where.push('l.powder_type = ?');
		params.push(filters.powder);
	}
	if (filters.fromMs !== null) {
		where.push('b.inspected_at >= ?');
		params.push(filters.fromMs);
	}
	if (filters.toMs !== null) {
		where.push('b.inspected_at < ?');
		params.push(filters.toMs);
	}
	// Count the work first: boards and pads matching, newest first, stopping at the cap.
	const boards = conn
		.prepare(
			`select b.id, b.stencil_id, b.product_code, b.te_count from spi_boards b
			 join stencils s on s.id = b.stencil_id
			 left join print_runs r on r.id = b.print_run_id
			 left join paste_lots l on l.id = r.paste_lot_id
			 where ${where.join(' and ')}
			 order by b.inspected_at desc`
		)
		.all(...params) as BoardRow[];
	const used: BoardRow[] = [];
	let pads = 0;
	for (const b of boards) {
		if (pads + b.te_count > MAX_PADS_SCANNED) break;
		pads += b.te_count;
		used.push(b);
	}
	const stencilIds = [...new Set(used.map((b) => b.stencil_id))].slice(0, MAX_STENCILS);
	const stencilSet = new Set(stencilIds);
	const boardsUsed = used.filter((b) => stencilSet.has(b.stencil_id));

	// Per-request temporary tables (this connection is shared by concurrent requests, and the scan
	// yields between slices).
	const tag = ++requestCounter;
	const boardsTable = `temp.analysis_te_boards_${tag}`;
	const padsTable = `temp.analysis_te_pads_${tag}`;
	conn.exec(
		`create table ${boardsTable} (board_id integer primary key, stencil_id integer not null)`
	);
	conn.exec(`create table ${padsTable} (
		stencil_id integer not null, pad_id integer not null, bin integer not null,
		area_ratio real not null, inv_volume real not null,
		primary key (stencil_id, pad_id)) without rowid`);
	try {
		const insertBoard = conn.prepare(`insert into ${boardsTable} values (?, ?)`);
		const insertPad = conn.prepare(`insert or ignore into ${padsTable} values (?, ?, ?, ?, ?)`);
		const padsOf = conn.prepare(`select id, refdes, pad from spi_pads where product_code = ?`);
		conn.transaction(() => {
			const products = new Map<number, Set<string>>();
			for (const b of boardsUsed) {
				let set = products.get(b.stencil_id);
				if (!set) products.set(b.stencil_id, (set = new Set()));
				set.add(b.product_code);
			}
			for (const [stencilId, productCodes] of products) {
				let apertures;
				try {
					apertures = checkStoredStencil(db, stencilId).apertures;
				} catch {
					continue; // a stencil that cannot be evaluated contributes nothing
				}
				const byKey = new Map<string, { ar: number; vol: number }>();
				for (const a of apertures)
					if (a.volumeUm3 > 0 && Number.isFinite(a.areaRatio))
						byKey.set(`${a.refdes}\u0001${a.pad}`, { ar: a.areaRatio, vol: a.volumeUm3 });
				for (const code of productCodes)
					for (const p of padsOf.all(code) as { id: number; refdes: string; pad: string }[]) {
						const a = byKey.get(`${p.refdes}\u0001${p.pad}`);
						if (a) insertPad.run(stencilId, p.id, areaRatioBin(a.ar), a.ar, 1 / a.vol);
					}
			}
		})();
		const aggregate = conn.prepare(
			`select p.bin as bin,
			   min(cast(m.volume_um3 * p.inv_volume / ${TE_BUCKET_WIDTH} as integer), ${TE_BUCKET_MAX}) as bucket,
			   count(*) as count, sum(m.volume_um3 * p.inv_volume) as teSum,
			   sum(p.area_ratio) as areaRatioSum
			 from ${boardsTable} tb
			 cross join spi_pad_measurements m on m.board_id = tb.board_id
			 cross join ${padsTable} p on p.stencil_id = tb.stencil_id and p.pad_id = m.pad_id
			 where m.volume_um3 is not null
			 group by 1, 2`
		);
		const padCount = conn
			.prepare(
				`select coalesce(sum(b.pad_count), 0) from ${boardsTable} tb join spi_boards b on b.id = tb.board_id`
			)
			.pluck();
		// Slices of about PADS_PER_SLICE pads, merged here; the event loop runs between slices.
		// CROSS JOIN fixes the loop order (SQLite keeps it as written): the slice's boards outside,
		// their pads by the measurement key, then the pad map; otherwise the planner, without
		// statistics on the temporary tables, may scan every measurement for each slice.
		const cells = new Map<number, TeHistogramRow>();
		let allPads = 0;
		for (let i = 0; i < boardsUsed.length;) {
			let slicePads = 0;
			const slice: BoardRow[] = [];
			while (
				i < boardsUsed.length &&
				(slice.length === 0 || slicePads + boardsUsed[i].te_count <= padsPerSlice)
			) {
				slicePads += boardsUsed[i].te_count;
				slice.push(boardsUsed[i++]);
			}
			conn.exec(`delete from ${boardsTable}`);
			conn.transaction(() => {
				for (const b of slice) insertBoard.run(b.id, b.stencil_id);
			})();
			for (const r of aggregate.all() as TeHistogramRow[]) {
				const key = r.bin * (TE_BUCKET_MAX + 1) + r.bucket;
				const cell = cells.get(key);
				if (!cell) cells.set(key, { ...r });
				else {
					cell.count += r.count;
					cell.teSum += r.teSum;
					cell.areaRatioSum += r.areaRatioSum;
				}
			}
			allPads += padCount.get() as number;
			if (i < boardsUsed.length) await new Promise((resolve) => setImmediate(resolve));
		}
		const rows = [...cells.values()];
		const analysis = analyseTransferEfficiency(rows, filters.floor);
		const padsInTe = rows.reduce((s, r) => s + r.count, 0);
		return {
			...analysis,
			boardsMatched: boards.length,
			boardsUsed: boardsUsed.length,
			stencils: stencilIds.length,
			padsWithoutVolume: allPads - padsInTe,
			note:
				boardsUsed.length < boards.length
					? `Only the newest ${boardsUsed.length} of ${boards.length} boards were used (at most ${MAX_PADS_SCANNED} pads and ${MAX_STENCILS} stencils per request): narrow the dates for older data.`
					: null
		};
	} finally {
		conn.exec(`drop table if exists ${boardsTable}; drop table if exists ${padsTable};`);
	}
}
