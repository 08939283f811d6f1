import { decodeCentis, type IngestIssue, type MeasureSummary } from '$lib/ingest';
import { SPI_MEASURES } from '$lib/spi/measures';
import type { ApertureInput } from '$lib/stencil';
import type { Db } from '../db';
import { checkStoredStencil } from '../stencils/evaluation';

/** One import as the list, the detail page and `GET /api/spi/imports/{id}` show it. */
export interface SpiImportRecord {
	id: number;
	source: string;
	fileName: string;
	sha256: string;
	sizeBytes: number;
	status: string;
	duplicateOfImportId: number | null;
	profileId: number | null;
	profileName: string | null;
	createdBy: string;
	userName: string | null;
	sourcePath: string | null;
	startedAt: Date;
	finishedAt: Date;
	dataRows: number;
	boards: number;
	pads: number;
	rejectedRows: number;
	duplicateBoards: number;
	errorCount: number;
	errors: IngestIssue[];
	warnings: IngestIssue[];
	archivePath: string | null;
}

const IMPORT_COLUMNS = `i.id, i.source, i.file_name, i.sha256, i.size_bytes, i.status,
	i.duplicate_of_import_id, i.profile_id, i.profile_name, i.created_by, u.name as user_name,
	i.source_path, i.started_at, i.finished_at, i.data_rows, i.boards, i.pads, i.rejected_rows,
	i.duplicate_boards, i.error_count, i.errors, i.warnings, i.archive_path`;

function importFromRow(r: Record<string, unknown>, withIssues: boolean): SpiImportRecord {
	return {
		id: r.id as number,
		source: r.source as string,
		fileName: r.file_name as string,
		sha256: r.sha256 as string,
		sizeBytes: r.size_bytes as number,
		status: r.status as string,
		duplicateOfImportId: r.duplicate_of_import_id as number | null,
		profileId: r.profile_id as number | null,
		profileName: r.profile_name as string | null,
		createdBy: r.created_by as string,
		userName: r.user_name as string | null,
		sourcePath: r.source_path as string | null,
		startedAt: new Date(r.started_at as number),
		finishedAt: new Date(r.finished_at as number),
		dataRows: r.data_rows as number,
		boards: r.boards as number,
		pads: r.pads as number,
		rejectedRows: r.rejected_rows as number,
		duplicateBoards: r.duplicate_boards as number,
		errorCount: r.error_count as number,
		errors: withIssues ? (JSON.parse(r.errors as string) as IngestIssue[]) : [],
		warnings: withIssues ? (JSON.parse(r.warnings as string) as IngestIssue[]) : [],
		archivePath: r.archive_path as string | null
	};
}

/**
 * Imports, newest first, `limit` per page (max 200), older than import id `before` when given;
 * optionally one status. Error lists are left out (see `getImport`).
 */
export function listImports(
	db: Db,
	options: { limit?: number; before?: number | null; status?: string | null } = {}
): SpiImportRecord[] {
	const limit = Math.min(Math.max(1, options.limit ?? 50), 200);
	const rows = db.$client
		.prepare(
			`select ${IMPORT_COLUMNS} from spi_imports i left join users u on u.id = i.user_id
			 where i.status != 'importing' and (? is null or i.id < ?) and (? is null or i.status = ?)
			 order by i.id desc limit ?`
		)
		.all(
			options.before ?? null,
			options.before ?? null,
			options.status ?? null,
			options.status ?? null,
			limit
		) as Record<string, unknown>[];
	return rows.map((r) => importFromRow(r, false));
}

/** One import with its first errors and warnings, or undefined. */
export function getImport(db: Db, id: number): SpiImportRecord | undefined {
	const row = db.$client
		.prepare(
			`select ${IMPORT_COLUMNS} from spi_imports i left join users u on u.id = i.user_id
			 where i.id = ? and i.status != 'importing'`
		)
		.get(id) as Record<string, unknown> | undefined;
	return row ? importFromRow(row, true) : undefined;
}

/** A board inspection with its per-board figures (values in %, µm; TE as a fraction). */
export interface SpiBoardRecord extends Record<SpiMeasureKey, MeasureSummary> {
	id: number;
	serial: string;
	inspectedAt: Date;
	line: string;
	product: string;
	lineId: number | null;
	productId: number | null;
	importId: number;
	printRunId: number | null;
	stencilId: number | null;
	stencilName: string | null;
	padCount: number;
	passCount: number;
	warnCount: number;
	failCount: number;
}

/** Per-board figures of each SPI measure (pad measures and transfer efficiency), by key. */
type SpiMeasureKey = (typeof SPI_MEASURES)[number]['key'];

function boardFromRow(r: Record<string, unknown>): SpiBoardRecord {
	const measure = (p: string): MeasureSummary => ({
		count: r[`${p}_count`] as number,
		mean: r[`${p}_mean`] as number | null,
		sd: r[`${p}_sd`] as number | null,
		min: r[`${p}_min`] as number | null,
		max: r[`${p}_max`] as number | null,
		range: r[`${p}_range`] as number | null
	});
	return {
		id: r.id as number,
		serial: r.serial as string,
		inspectedAt: new Date(r.inspected_at as number),
		line: r.line_code as string,
		product: r.product_code as string,
		lineId: r.line_id as number | null,
		productId: r.product_id as number | null,
		importId: r.import_id as number,
		printRunId: r.print_run_id as number | null,
		stencilId: r.stencil_id as number | null,
		stencilName: r.stencil_name as string | null,
		padCount: r.pad_count as number,
		passCount: r.pass_count as number,
		warnCount: r.warn_count as number,
		failCount: r.fail_count as number,
		...(Object.fromEntries(SPI_MEASURES.map((m) => [m.key, measure(m.column)])) as Record<
			SpiMeasureKey,
			MeasureSummary
		>)
	};
}

/**
 * Boards by serial: exact serial, or every serial starting with `serial` when `prefix` is set
 * (both use the (serial, inspected_at) index: a range scan, instant with millions of boards).
 * Also by import, or the latest boards when no filter is given. Newest inspection first.
 */
export function searchBoards(
	db: Db,
	options: { serial?: string | null; prefix?: boolean; importId?: number | null; limit?: number }
): SpiBoardRecord[] {
	const limit = Math.min(Math.max(1, options.limit ?? 100), 500);
	const serial = options.serial?.trim() ?? '';
	let rows: Record<string, unknown>[];
	if (serial !== '' && options.prefix) {
		rows = db.$client
			.prepare(
				`select * from spi_boards where serial >= ? and serial < ?
				 order by serial, inspected_at desc limit ?`
			)
			.all(serial, serial + '\uffff', limit) as Record<string, unknown>[];
	} else if (serial !== '') {
		rows = db.$client
			.prepare(`select * from spi_boards where serial = ? order by inspected_at desc limit ?`)
			.all(serial, limit) as Record<string, unknown>[];
	} else if (options.importId) {
		rows = db.$client
			.prepare(`select * from spi_boards where import_id = ? order by id limit ?`)
			.all(options.importId, limit) as Record<string, unknown>[];
	} else {
		rows = db.$client
			.prepare(`select * from spi_boards order by id desc limit ?`)
			.all(limit) as Record<string, unknown>[];
	}
	return rows.map(boardFromRow);
}

/** One measured pad as read back (values as imported). */
export interface SpiPadRecord {
	refdes: string;
	pad: string;
	panelIndex: number;
	volumePct: number | null;
	areaPct: number;
	heightUm: number;
	offsetXUm: number;
	offsetYUm: number;
	volumeUm3: number | null;
	result: 'pass' | 'warn' | 'fail';
	/** Aperture on the board's stencil (refdes + pad), with its area ratio; null when unknown. */
	apertureId: number | null;
	areaRatio: number | null;
	/** Measured ÷ aperture volume: from volume_um3 when present, else volume % / 100. */
	transferEfficiency: number | null;
}

/** Aperture outline data for the board map (µm), for pads that link to the stencil. */
export interface BoardMapAperture {
	aperture: ApertureInput;
	volumePct: number | null;
	result: SpiPadRecord['result'] | null;
}

const RESULT_WORDS = ['pass', 'warn', 'fail'] as const;

/**
 * A board with all its pads (sorted by refdes, pad, panel) and, when its stencil is known, the
 * stencil's apertures for the map. Undefined when there is no such board.
 */
export function getBoard(
	db: Db,
	id: number
): { board: SpiBoardRecord; pads: SpiPadRecord[]; map: BoardMapAperture[] | null } | undefined {
	const row = db.$client.prepare(`select * from spi_boards where id = ?`).get(id) as
		Record<string, unknown> | undefined;
	if (!row) return undefined;
	const board = boardFromRow(row);
	const raw = db.$client
		.prepare(
			`select p.refdes, p.pad, p.panel_index, m.volume_centi_pct, m.area_centi_pct,
			 m.height_centi_um, m.offset_x_centi_um, m.offset_y_centi_um, m.result, m.volume_um3
			 from spi_pad_measurements m join spi_pads p on p.id = m.pad_id
			 where m.board_id = ? order by p.refdes, p.pad, p.panel_index`
		)
		.raw()
		.all(id) as (string | number | null)[][];
	let apertures: Map<
		string,
		{ a: ApertureInput & { id: number }; areaRatio: number; volumeUm3: number }
	> | null = null;
	if (board.stencilId !== null) {
		try {
			const check = checkStoredStencil(db, board.stencilId);
			apertures = new Map(
				check.apertures.map((a) => [
					`${a.refdes}\u0001${a.pad}`,
					{ a, areaRatio: a.areaRatio, volumeUm3: a.volumeUm3 }
				])
			);
		} catch {
			apertures = null;
		}
	}
	const pads: SpiPadRecord[] = raw.map((r) => {
		const ap = apertures?.get(`${r[0]}\u0001${r[1]}`);
		const volumePct = r[3] === null ? null : decodeCentis(r[3] as number);
		const volumeUm3 = r[9] as number | null;
		let te: number | null = null;
		if (ap && volumeUm3 !== null && ap.volumeUm3 > 0) te = volumeUm3 / ap.volumeUm3;
		else if (ap && volumePct !== null) te = volumePct / 100;
		return {
			refdes: r[0] as string,
			pad: r[1] as string,
			panelIndex: r[2] as number,
			volumePct,
			areaPct: decodeCentis(r[4] as number),
			heightUm: decodeCentis(r[5] as number),
			offsetXUm: decodeCentis(r[6] as number),
			offsetYUm: decodeCentis(r[7] as number),
			volumeUm3,
			result: RESULT_WORDS[r[8] as number],
			apertureId: ap?.a.id ?? null,
			areaRatio: ap?.areaRatio ?? null,
			transferEfficiency: te
		};
	});
	let map: BoardMapAperture[] | null = null;
	if (apertures) {
		// Panel 0 only on the map: the stencil's apertures describe one board image.
		const byKey = new Map<string, SpiPadRecord>();
		for (const p of pads) if (p.panelIndex === 0) byKey.set(`${p.refdes}\u0001${p.pad}`, p);
		map = [...apertures.values()].map(({ a }) => {
			const p = byKey.get(`${a.refdes}\u0001${a.pad}`);
			const { id: _id, ...aperture } = a;
			void _id;
			return { aperture, volumePct: p?.volumePct ?? null, result: p?.result ?? null };
		});
	}
	return { board, pads, map };
}

/** Failing pads of a product in a period, most frequent first. */
export interface ParetoEntry {
	refdes: string;
	pad: string;
	fails: number;
	warns: number;
}

/**
 * Pareto of failing pads (and, summed, refdes) for a product between two instants: counts of
 * result = fail (and warn) per pad over the boards inspected in the period. Reads the pad rows
 * of those boards through the (board_id, pad_id) key, so its cost is the period's pad rows.
 */
export function failurePareto(
	db: Db,
	options: { product: string; from: Date; to: Date; limit?: number }
): {
	pads: ParetoEntry[];
	refdes: { refdes: string; fails: number; warns: number }[];
	boards: number;
	/** Failures of every pad, shown or not: the base of the cumulative percentage. */
	totalFails: number;
} {
	const limit = Math.min(Math.max(1, options.limit ?? 25), 200);
	const from = options.from.getTime();
	const to = options.to.getTime();
	const boards = db.$client
		.prepare(
			`select count(*) from spi_boards where product_code = ? and inspected_at between ? and ?`
		)
		.pluck()
		.get(options.product, from, to) as number;
	const rows = db.$client
		.prepare(
			`select p.refdes, p.pad, sum(m.result = 2) as fails, sum(m.result = 1) as warns
			 from spi_boards b join spi_pad_measurements m on m.board_id = b.id
			 join spi_pads p on p.id = m.pad_id
			 where b.product_code = ? and b.inspected_at between ? and ? and m.result > 0
			 group by m.pad_id order by fails desc, warns desc, p.refdes, p.pad`
		)
		.all(options.product, from, to) as ParetoEntry[];
	const byRefdes = new Map<string, { refdes: string; fails: number; warns: number }>();
	for (const r of rows) {
		const e = byRefdes.get(r.refdes) ?? { refdes: r.refdes, fails: 0, warns: 0 };
		e.fails += r.fails;
		e.warns += r.warns;
		byRefdes.set(r.refdes, e);
	}
	return {
		pads: rows.filter((r) => r.fails > 0).slice(0, limit),
		refdes: [...byRefdes.values()]
			.filter((r) => r.fails > 0)
			.sort((a, b) => b.fails - a.fails || a.refdes.localeCompare(b.refdes))
			.slice(0, limit),
		boards,
		totalFails: rows.reduce((s, r) => s + r.fails, 0)
	};
}

/** Product codes that have inspections, for the Pareto's picker. */
export function inspectedProducts(db: Db): string[] {
	return db.$client
		.prepare(`select distinct product_code from spi_boards order by product_code`)
		.pluck()
		.all() as string[];
}
