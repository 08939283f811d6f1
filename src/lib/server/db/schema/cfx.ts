import { sql } from 'drizzle-orm';
import { blob, index, integer, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { lines, products, users } from './foundation';
import { printRuns } from './printlog';
import { spiImports } from './spi';

/**
 * IPC-CFX (IPC-2591) machine messages received over AMQP 1.0 (src/lib/server/cfx):
 * - `cfx_endpoints`: each machine's CFX handle → its line and kind (printer / inspection);
 * - `cfx_messages`: one row per AMQP message settled (its id), so a redelivery is stored once;
 * - `cfx_quarantine`: messages that could not be mapped, with the reason and the body;
 * - `cfx_units`: boards seen by a printer (arrived, work started, printed with its parameters,
 *   completed, departed);
 * - `cfx_pending_inspections`: inspected units whose product could not be told, until assigned;
 * - `cfx_line_events`: faults, stencil/squeegee changes and cleaning, station states (the line's
 *   event log, and what OEE and changeover times are computed from).
 */

const createdAt = () =>
	integer('created_at', { mode: 'timestamp_ms' })
		.notNull()
		.default(sql`(unixepoch('subsec') * 1000)`);

export const cfxEndpoints = sqliteTable(
	'cfx_endpoints',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		/** The machine's CFX handle, as sent in the envelope's `Source`. */
		handle: text('handle').notNull(),
		lineId: integer('line_id')
			.notNull()
			.references(() => lines.id),
		/** printer | inspection */
		kind: text('kind').notNull(),
		createdAt: createdAt(),
		createdByUserId: integer('created_by_user_id').references(() => users.id)
	},
	(t) => [uniqueIndex('cfx_endpoints_handle_idx').on(t.handle)]
);

export const cfxMessages = sqliteTable(
	'cfx_messages',
	{
		/** AMQP message-id, else the envelopes' UniqueIDs, else the body's SHA-256 (see receiver). */
		messageKey: text('message_key').primaryKey(),
		receivedAt: integer('received_at', { mode: 'timestamp_ms' }).notNull(),
		/** stored | quarantined | ignored */
		outcome: text('outcome').notNull(),
		handle: text('handle'),
		messageNames: text('message_names').notNull().default(''),
		/** Envelope TimeStamp of the (first) envelope, for the ingest lag. */
		sentAt: integer('sent_at', { mode: 'timestamp_ms' })
	},
	(t) => [index('cfx_messages_received_idx').on(t.receivedAt)]
);

export const cfxQuarantine = sqliteTable(
	'cfx_quarantine',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		messageKey: text('message_key').notNull(),
		receivedAt: integer('received_at', { mode: 'timestamp_ms' }).notNull(),
		handle: text('handle'),
		messageName: text('message_name'),
		reason: text('reason').notNull(),
		/** The body as received (bounded by the receiver's size limit). */
		body: blob('body', { mode: 'buffer' }),
		contentEncoding: text('content_encoding'),
		/** held | retried | discarded */
		status: text('status').notNull().default('held'),
		resolvedAt: integer('resolved_at', { mode: 'timestamp_ms' }),
		resolvedByUserId: integer('resolved_by_user_id').references(() => users.id)
	},
	(t) => [index('cfx_quarantine_status_idx').on(t.status, t.receivedAt)]
);

export const cfxUnits = sqliteTable(
	'cfx_units',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		endpointId: integer('endpoint_id')
			.notNull()
			.references(() => cfxEndpoints.id),
		lineId: integer('line_id')
			.notNull()
			.references(() => lines.id),
		unitIdentifier: text('unit_identifier').notNull(),
		positionNumber: integer('position_number').notNull(),
		transactionId: text('transaction_id'),
		printRunId: integer('print_run_id').references(() => printRuns.id),
		/** Null until the product is known (listed for assignment). */
		productId: integer('product_id').references(() => products.id),
		recipeName: text('recipe_name'),
		arrivedAt: integer('arrived_at', { mode: 'timestamp_ms' }),
		startedAt: integer('started_at', { mode: 'timestamp_ms' }),
		processedAt: integer('processed_at', { mode: 'timestamp_ms' }),
		completedAt: integer('completed_at', { mode: 'timestamp_ms' }),
		departedAt: integer('departed_at', { mode: 'timestamp_ms' }),
		result: text('result'),
		/** Print parameters keyed like the recipe (squeegeePressureKg, …). */
		parameters: text('parameters', { mode: 'json' }).$type<Record<string, unknown>>(),
		/** Deviations from the recipe window found when the parameters arrived. */
		deviations: text('deviations', { mode: 'json' })
			.$type<unknown[]>()
			.notNull()
			.default(sql`'[]'`),
		cycleTimeMs: integer('cycle_time_ms'),
		createdAt: createdAt()
	},
	(t) => [
		index('cfx_units_unit_idx').on(t.endpointId, t.unitIdentifier, t.positionNumber),
		index('cfx_units_line_time_idx').on(t.lineId, t.processedAt),
		index('cfx_units_run_idx').on(t.printRunId),
		// Boards printed outside the recipe window, read as print-parameter chart points (few).
		index('cfx_units_deviating_idx')
			.on(t.productId, t.processedAt)
			.where(sql`${t.deviations} != '[]'`)
	]
);

export const cfxPendingInspections = sqliteTable(
	'cfx_pending_inspections',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		messageKey: text('message_key').notNull(),
		endpointId: integer('endpoint_id')
			.notNull()
			.references(() => cfxEndpoints.id),
		lineId: integer('line_id')
			.notNull()
			.references(() => lines.id),
		unitIdentifier: text('unit_identifier').notNull(),
		inspectedAt: integer('inspected_at', { mode: 'timestamp_ms' }).notNull(),
		recipeName: text('recipe_name'),
		/** The mapped units of this serial (`InspectedUnit[]` from `$lib/cfx`). */
		units: text('units', { mode: 'json' }).$type<unknown[]>().notNull(),
		padCount: integer('pad_count').notNull(),
		/** pending | assigned */
		status: text('status').notNull().default('pending'),
		productId: integer('product_id').references(() => products.id),
		importId: integer('import_id').references(() => spiImports.id),
		createdAt: createdAt()
	},
	(t) => [index('cfx_pending_status_idx').on(t.status, t.inspectedAt)]
);

export const cfxLineEvents = sqliteTable(
	'cfx_line_events',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		lineId: integer('line_id')
			.notNull()
			.references(() => lines.id),
		endpointId: integer('endpoint_id')
			.notNull()
			.references(() => cfxEndpoints.id),
		/** fault | fault-cleared | stencil-changed | squeegee-changed | stencil-cleaned | … */
		kind: text('kind').notNull(),
		at: integer('at', { mode: 'timestamp_ms' }).notNull(),
		/** The message's own fields (fault code, tool names, durations…). */
		detail: text('detail', { mode: 'json' }).$type<Record<string, unknown>>().notNull(),
		messageKey: text('message_key').notNull()
	},
	(t) => [index('cfx_line_events_line_at_idx').on(t.lineId, t.at)]
);
