import { sql } from 'drizzle-orm';
import { index, integer, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { lines, products, users } from './foundation';
import { stencils } from './stencils';

const createdAt = () =>
	integer('created_at', { mode: 'timestamp_ms' })
		.notNull()
		.default(sql`(unixepoch('subsec') * 1000)`);

/**
 * Recipe versions: one row per version of the recipe for a product on a line. Rows are never
 * changed; an edit inserts the next version, so every run can name the version it ran against.
 */
export const printRecipes = sqliteTable(
	'print_recipes',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		lineId: integer('line_id')
			.notNull()
			.references(() => lines.id),
		productId: integer('product_id')
			.notNull()
			.references(() => products.id),
		version: integer('version').notNull(),
		/** Windows { min, target, max } per numeric key, canonical text per categorical key. */
		parameters: text('parameters', { mode: 'json' }).$type<Record<string, unknown>>().notNull(),
		/** Ideal cycle time of one board on this line (ms), for OEE performance; null: not set. */
		idealCycleTimeMs: integer('ideal_cycle_time_ms'),
		note: text('note').notNull().default(''),
		createdAt: createdAt(),
		createdByUserId: integer('created_by_user_id').references(() => users.id)
	},
	(t) => [
		uniqueIndex('print_recipes_line_product_version_idx').on(t.lineId, t.productId, t.version)
	]
);

/** Solder paste lots with the handling limits of their paste (minutes, from the data sheet). */
export const pasteLots = sqliteTable('paste_lots', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	lotNumber: text('lot_number').notNull().unique(),
	alloy: text('alloy').notNull(),
	powderType: integer('powder_type').notNull(),
	fluxClass: text('flux_class'),
	containerGrams: real('container_grams'),
	/** ISO dates as entered (`2026-06-30`) or date-times with a zone. */
	receivedOn: text('received_on'),
	expiresOn: text('expires_on').notNull(),
	warmUpMinutes: integer('warm_up_minutes').notNull(),
	maxOnStencilMinutes: integer('max_on_stencil_minutes').notNull(),
	maxOutOfColdMinutes: integer('max_out_of_cold_minutes').notNull(),
	createdAt: createdAt(),
	createdByUserId: integer('created_by_user_id').references(() => users.id)
});

/** Handling events of a paste lot (out of cold storage, opened, on stencil, returned, discarded). */
export const pasteEvents = sqliteTable(
	'paste_events',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		lotId: integer('lot_id')
			.notNull()
			.references(() => pasteLots.id),
		event: text('event').notNull(),
		at: integer('at', { mode: 'timestamp_ms' }).notNull(),
		note: text('note').notNull().default(''),
		userId: integer('user_id').references(() => users.id),
		actor: text('actor').notNull(),
		createdAt: createdAt()
	},
	(t) => [index('paste_events_lot_at_idx').on(t.lotId, t.at)]
);

/**
 * Stencil life log: state changes, tension readings (N/cm), cleaning and inspection entries.
 * The stencil's current state stays in `stencils.state`; this table is its history.
 */
export const stencilEvents = sqliteTable(
	'stencil_events',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		stencilId: integer('stencil_id')
			.notNull()
			.references(() => stencils.id),
		/** state | tension | cleaning | inspection */
		kind: text('kind').notNull(),
		at: integer('at', { mode: 'timestamp_ms' }).notNull(),
		fromState: text('from_state'),
		toState: text('to_state'),
		readingsNPerCm: text('readings_n_per_cm', { mode: 'json' }).$type<number[]>(),
		/** Cleaning method or inspection result, free text. */
		detail: text('detail').notNull().default(''),
		note: text('note').notNull().default(''),
		userId: integer('user_id').references(() => users.id),
		actor: text('actor').notNull(),
		createdAt: createdAt()
	},
	(t) => [index('stencil_events_stencil_at_idx').on(t.stencilId, t.at)]
);

/**
 * The print run core: what the SPI import links boards to (line + time window). Recipe version,
 * paste lot, blade and deviations were added by the print-log feature.
 */
export const printRuns = sqliteTable(
	'print_runs',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		lineId: integer('line_id')
			.notNull()
			.references(() => lines.id),
		productId: integer('product_id')
			.notNull()
			.references(() => products.id),
		stencilId: integer('stencil_id').references(() => stencils.id),
		/** Actual print parameters as logged, keyed like the recipe (squeegeeAngleDeg, …). */
		parameters: text('parameters', { mode: 'json' }).$type<Record<string, unknown>>().notNull(),
		ambientTempC: real('ambient_temp_c'),
		relativeHumidityPct: real('relative_humidity_pct'),
		operatorUserId: integer('operator_user_id').references(() => users.id),
		startedAt: integer('started_at', { mode: 'timestamp_ms' }).notNull(),
		/** Null while the run is open; one open run per line at a time. */
		endedAt: integer('ended_at', { mode: 'timestamp_ms' }),
		boardsPrinted: integer('boards_printed').notNull().default(0),
		createdAt: integer('created_at', { mode: 'timestamp_ms' })
			.notNull()
			.default(sql`(unixepoch('subsec') * 1000)`),
		/** The recipe version the run was checked against (null: no recipe existed). */
		recipeId: integer('recipe_id').references(() => printRecipes.id),
		recipeVersion: integer('recipe_version'),
		pasteLotId: integer('paste_lot_id').references(() => pasteLots.id),
		bladeCode: text('blade_code'),
		/** Serial of the first board printed in the run, as scanned (optional). */
		boardSerial: text('board_serial'),
		/** Deviations found when the run was saved (or last corrected), as the pure check returns them. */
		deviations: text('deviations', { mode: 'json' })
			.$type<unknown[]>()
			.notNull()
			.default(sql`'[]'`),
		deviationReasons: text('deviation_reasons', { mode: 'json' })
			.$type<Record<string, string>>()
			.notNull()
			.default(sql`'{}'`),
		/** Warnings shown when the run was logged (paste lot, stencil life), kept with the run. */
		warnings: text('warnings', { mode: 'json' })
			.$type<string[]>()
			.notNull()
			.default(sql`'[]'`),
		/** An engineer's reason for using a quarantined or life-expired stencil. */
		overrideReason: text('override_reason'),
		overrideByUserId: integer('override_by_user_id').references(() => users.id),
		/** How many audited corrections the run has had. */
		corrections: integer('corrections').notNull().default(0)
	},
	(t) => [
		index('print_runs_line_time_idx').on(t.lineId, t.startedAt),
		// The database backs up the service's check: one open run per line.
		uniqueIndex('print_runs_one_open_per_line_idx')
			.on(t.lineId)
			.where(sql`ended_at is null`),
		index('print_runs_stencil_idx').on(t.stencilId),
		index('print_runs_lot_idx').on(t.pasteLotId)
	]
);
