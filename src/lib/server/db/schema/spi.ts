import { sql } from 'drizzle-orm';
import {
	index,
	integer,
	primaryKey,
	real,
	sqliteTable,
	text,
	uniqueIndex
} from 'drizzle-orm/sqlite-core';
import { lines, products, users } from './foundation';
import { printRuns } from './printlog';
import { apertures, stencils } from './stencils';

/**
 * SPI inspection data. Four tables:
 * - `spi_profiles`: mapping profiles (how to read one machine's export), chosen on import;
 * - `spi_imports`: one row per file that reached a verdict (imported, rejected, duplicate);
 * - `spi_boards`: one row per board inspection (serial + inspected_at) with per-board aggregates
 *   computed during ingest, so charts never rescan pads;
 * - `spi_pads` (pad dictionary per product) and `spi_pad_measurements` (one narrow row per pad
 *   deposit: board id + pad id + hundredths as integers, WITHOUT ROWID; see the migration).
 *
 * Measures are stored in canonical units: volume/area in % of nominal, height and offsets in µm.
 * Aggregate columns per measure: `<measure>_count/_mean/_sd/_min/_max/_range` (sd: sample, n−1;
 * null when undefined). Transfer efficiency (`te_*`, measured volume ÷ aperture volume, as a
 * fraction) is filled when the file carries `volume_um3` and the pads link to apertures.
 */

const createdAt = () =>
	integer('created_at', { mode: 'timestamp_ms' })
		.notNull()
		.default(sql`(unixepoch('subsec') * 1000)`);

/** An inspection machine's mapping profile (`MappingProfile` from `$lib/ingest` as JSON). */
export const spiProfiles = sqliteTable(
	'spi_profiles',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		name: text('name').notNull(),
		/** The inspection machine (or its export layout) the profile is for. */
		machine: text('machine').notNull(),
		/** The full `MappingProfile`, validated by `mappingProfileSchema`. */
		profile: text('profile', { mode: 'json' }).$type<Record<string, unknown>>().notNull(),
		createdAt: createdAt(),
		updatedAt: integer('updated_at', { mode: 'timestamp_ms' }),
		createdBy: text('created_by').notNull()
	},
	(t) => [uniqueIndex('spi_profiles_name_idx').on(t.name)]
);

/** One row per file: its verdict, or 'importing' while its rows are written (never listed). */
export const spiImports = sqliteTable(
	'spi_imports',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		/** upload | api | watch */
		source: text('source').notNull(),
		fileName: text('file_name').notNull(),
		/** Lower-case hex SHA-256 of the file's bytes; the archive is named after it. */
		sha256: text('sha256').notNull(),
		sizeBytes: integer('size_bytes').notNull(),
		/** imported | rejected | duplicate (importing: in progress or interrupted, never listed) */
		status: text('status').notNull(),
		/** For status duplicate: the earlier import with the same content. */
		duplicateOfImportId: integer('duplicate_of_import_id'),
		profileId: integer('profile_id').references(() => spiProfiles.id),
		profileName: text('profile_name'),
		/** "user:12", "token:3" or "system" (watched folder), as in the audit log. */
		createdBy: text('created_by').notNull(),
		userId: integer('user_id').references(() => users.id),
		/** For watched files: the path the file was found at. */
		sourcePath: text('source_path'),
		startedAt: integer('started_at', { mode: 'timestamp_ms' }).notNull(),
		finishedAt: integer('finished_at', { mode: 'timestamp_ms' }).notNull(),
		/** Records after the header. */
		dataRows: integer('data_rows').notNull().default(0),
		boards: integer('boards').notNull().default(0),
		pads: integer('pads').notNull().default(0),
		rejectedRows: integer('rejected_rows').notNull().default(0),
		/** Board inspections (serial + time) already stored by an earlier file, not stored again. */
		duplicateBoards: integer('duplicate_boards').notNull().default(0),
		errorCount: integer('error_count').notNull().default(0),
		/** First errors `[{ row, column, message }]` (rejected files; skipped rows when skipping). */
		errors: text('errors', { mode: 'json' })
			.$type<{ row: number; column: string | null; message: string }[]>()
			.notNull()
			.default(sql`'[]'`),
		warnings: text('warnings', { mode: 'json' })
			.$type<{ row: number; column: string | null; message: string }[]>()
			.notNull()
			.default(sql`'[]'`),
		/** Archive path of the original, relative to the database's folder. */
		archivePath: text('archive_path'),
		/**
		 * spi_boards ids reserved by this import while its status is 'importing' (first, last).
		 * Its pad rows are committed in short chunks against these ids before the board rows exist
		 * (readers reach pads through spi_boards, so they see none of them); an interrupted import
		 * is found by its status and its rows by this range (see ingest-service.ts).
		 */
		boardIdFrom: integer('board_id_from'),
		boardIdTo: integer('board_id_to')
	},
	(t) => [
		// Same content imported twice → the second is a duplicate (rejected files may be retried).
		uniqueIndex('spi_imports_sha256_imported_idx')
			.on(t.sha256)
			.where(sql`status = 'imported'`),
		index('spi_imports_started_idx').on(t.startedAt),
		index('spi_imports_source_path_idx').on(t.sourcePath)
	]
);

/** Columns of one aggregated measure: count, mean, sd, min, max, range. */
function measureColumns<P extends string>(prefix: P) {
	return {
		count: integer(`${prefix}_count`).notNull().default(0),
		mean: real(`${prefix}_mean`),
		sd: real(`${prefix}_sd`),
		min: real(`${prefix}_min`),
		max: real(`${prefix}_max`),
		range: real(`${prefix}_range`)
	};
}

const volume = measureColumns('volume_pct');
const area = measureColumns('area_pct');
const height = measureColumns('height_um');
const offsetX = measureColumns('offset_x_um');
const offsetY = measureColumns('offset_y_um');
const te = measureColumns('te');

/** One board inspection with its per-board figures. */
export const spiBoards = sqliteTable(
	'spi_boards',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		serial: text('serial').notNull(),
		inspectedAt: integer('inspected_at', { mode: 'timestamp_ms' }).notNull(),
		/** Line and product codes as in the file; ids when they match the factory model. */
		lineCode: text('line_code').notNull(),
		productCode: text('product_code').notNull(),
		lineId: integer('line_id').references(() => lines.id),
		productId: integer('product_id').references(() => products.id),
		importId: integer('import_id')
			.notNull()
			.references(() => spiImports.id),
		printRunId: integer('print_run_id').references(() => printRuns.id),
		stencilId: integer('stencil_id').references(() => stencils.id),
		/** Stencil and print run as written in the file (null when absent). */
		stencilName: text('stencil_name'),
		printRunRef: text('print_run_ref'),
		padCount: integer('pad_count').notNull(),
		passCount: integer('pass_count').notNull(),
		warnCount: integer('warn_count').notNull(),
		failCount: integer('fail_count').notNull(),
		volumePctCount: volume.count,
		volumePctMean: volume.mean,
		volumePctSd: volume.sd,
		volumePctMin: volume.min,
		volumePctMax: volume.max,
		volumePctRange: volume.range,
		areaPctCount: area.count,
		areaPctMean: area.mean,
		areaPctSd: area.sd,
		areaPctMin: area.min,
		areaPctMax: area.max,
		areaPctRange: area.range,
		heightUmCount: height.count,
		heightUmMean: height.mean,
		heightUmSd: height.sd,
		heightUmMin: height.min,
		heightUmMax: height.max,
		heightUmRange: height.range,
		offsetXUmCount: offsetX.count,
		offsetXUmMean: offsetX.mean,
		offsetXUmSd: offsetX.sd,
		offsetXUmMin: offsetX.min,
		offsetXUmMax: offsetX.max,
		offsetXUmRange: offsetX.range,
		offsetYUmCount: offsetY.count,
		offsetYUmMean: offsetY.mean,
		offsetYUmSd: offsetY.sd,
		offsetYUmMin: offsetY.min,
		offsetYUmMax: offsetY.max,
		offsetYUmRange: offsetY.range,
		/** Transfer efficiency as a fraction (1 = aperture volume); count 0 when unknown. */
		teCount: te.count,
		teMean: te.mean,
		teSd: te.sd,
		teMin: te.min,
		teMax: te.max,
		teRange: te.range
	},
	(t) => [
		// Also the serial search index (serial is its first column).
		uniqueIndex('spi_boards_serial_time_idx').on(t.serial, t.inspectedAt),
		index('spi_boards_product_time_idx').on(t.productCode, t.inspectedAt),
		index('spi_boards_line_time_idx').on(t.lineCode, t.inspectedAt),
		index('spi_boards_print_run_idx').on(t.printRunId),
		index('spi_boards_import_idx').on(t.importId)
	]
);

/**
 * Pad dictionary per product: (product, panel index, refdes, pad) → small integer id, so the
 * measurement rows carry 1–3 bytes instead of the names. `apertureId` is the aperture last
 * linked (for the board's own stencil, join `apertures` by the board's stencil + refdes + pad).
 */
export const spiPads = sqliteTable(
	'spi_pads',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		productCode: text('product_code').notNull(),
		panelIndex: integer('panel_index').notNull().default(0),
		refdes: text('refdes').notNull(),
		pad: text('pad').notNull(),
		apertureId: integer('aperture_id').references(() => apertures.id)
	},
	(t) => [uniqueIndex('spi_pads_key_idx').on(t.productCode, t.refdes, t.pad, t.panelIndex)]
);

/**
 * One measured deposit (no foreign keys: checking them per row would halve the insert rate; the
 * ingest service writes ids it has just read or created). WITHOUT ROWID (added by hand to the
 * generated 0005_spi.sql: drizzle has no option for it) with key (board_id, pad_id) and hundredths as integers
 * (`encodeCentis`), so a row is ~25 bytes on disk with no separate index. Values read back with
 * `decodeCentis` equal the imported ones (inputs with ≤ 2 decimals). `volume_um3` is whole µm³
 * (null when the file has none); result 0 pass, 1 warn, 2 fail.
 */
export const spiPadMeasurements = sqliteTable(
	'spi_pad_measurements',
	{
		boardId: integer('board_id').notNull(),
		padId: integer('pad_id').notNull(),
		volumeCentiPct: integer('volume_centi_pct'),
		areaCentiPct: integer('area_centi_pct').notNull(),
		heightCentiUm: integer('height_centi_um').notNull(),
		offsetXCentiUm: integer('offset_x_centi_um').notNull(),
		offsetYCentiUm: integer('offset_y_centi_um').notNull(),
		result: integer('result').notNull(),
		volumeUm3: integer('volume_um3')
	},
	(t) => [primaryKey({ columns: [t.boardId, t.padId] })]
);
