import { sql } from 'drizzle-orm';
import { index, integer, real, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { lines, products, users } from './foundation';
import { stencils } from './stencils';

/**
 * The print run core: what the SPI import links boards to (line + time window). The print-log
 * feature adds recipes, paste lots and their events beside it.
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
			.default(sql`(unixepoch('subsec') * 1000)`)
	},
	(t) => [index('print_runs_line_time_idx').on(t.lineId, t.startedAt)]
);
