import { sql } from 'drizzle-orm';
import { index, integer, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { products, users } from './foundation';

const createdAt = () =>
	integer('created_at', { mode: 'timestamp_ms' })
		.notNull()
		.default(sql`(unixepoch('subsec') * 1000)`);

/** Which pads feed an SPI characteristic. */
export type PadSelection =
	| { kind: 'all' }
	| { kind: 'refdes'; refdes: string[] }
	| { kind: 'area-ratio'; min: number | null; max: number | null };

/**
 * What is charted: a product on some lines, one measure (an SPI measure or a logged print
 * parameter), the pads, how points are formed, the chart, the specs and the rules.
 */
export const spcCharacteristics = sqliteTable(
	'spc_characteristics',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		name: text('name').notNull(),
		productId: integer('product_id')
			.notNull()
			.references(() => products.id),
		/** Line ids; empty = every line. */
		lineIds: text('line_ids', { mode: 'json' }).$type<number[]>().notNull(),
		/** volume-pct | height-um | area-pct | offset-x-um | offset-y-um | transfer-efficiency-pct | print-parameter */
		measure: text('measure').notNull(),
		/** Key in print_runs.parameters when measure = print-parameter (e.g. squeegeeSpeedMmS). */
		parameterKey: text('parameter_key'),
		padSelection: text('pad_selection', { mode: 'json' }).$type<PadSelection>().notNull(),
		/** board: one subgroup per board (or run); consecutive: n consecutive boards' values. */
		subgroupMode: text('subgroup_mode').notNull().default('board'),
		subgroupSize: integer('subgroup_size').notNull().default(1),
		/** xbar-r | xbar-s | i-mr | between-within */
		chartKind: text('chart_kind').notNull(),
		lsl: real('lsl'),
		target: real('target'),
		usl: real('usl'),
		unit: text('unit').notNull().default(''),
		rules: text('rules', { mode: 'json' }).$type<string[]>().notNull(),
		active: integer('active', { mode: 'boolean' }).notNull().default(true),
		createdAt: createdAt(),
		createdByUserId: integer('created_by_user_id').references(() => users.id)
	},
	(t) => [index('spc_char_product_idx').on(t.productId)]
);

/** One excluded point: its key (e.g. "run:12", "board:88") and why. */
export type ExcludedPoint = { key: string; reason: string };

/**
 * Frozen control limits, numbered per characteristic (Phase II judges new data against the
 * newest). Never updated: recalculation inserts the next version.
 */
export const spcLimitVersions = sqliteTable(
	'spc_limit_versions',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		characteristicId: integer('characteristic_id')
			.notNull()
			.references(() => spcCharacteristics.id),
		version: integer('version').notNull(),
		/** The engine's ChartLimits as computed from the baseline. */
		limits: text('limits', { mode: 'json' }).$type<Record<string, unknown>>().notNull(),
		baselineFrom: integer('baseline_from', { mode: 'timestamp_ms' }),
		baselineTo: integer('baseline_to', { mode: 'timestamp_ms' }),
		baselinePoints: integer('baseline_points').notNull(),
		excluded: text('excluded', { mode: 'json' }).$type<ExcludedPoint[]>().notNull(),
		note: text('note').notNull().default(''),
		createdAt: createdAt(),
		createdByUserId: integer('created_by_user_id').references(() => users.id)
	},
	(t) => [uniqueIndex('spc_limit_versions_char_version_idx').on(t.characteristicId, t.version)]
);

/** Points left out of the next baseline (Phase I), with the reason; cleared by nothing. */
export const spcExclusions = sqliteTable(
	'spc_exclusions',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		characteristicId: integer('characteristic_id')
			.notNull()
			.references(() => spcCharacteristics.id),
		pointKey: text('point_key').notNull(),
		reason: text('reason').notNull(),
		createdAt: createdAt(),
		createdByUserId: integer('created_by_user_id').references(() => users.id)
	},
	(t) => [uniqueIndex('spc_exclusions_char_key_idx').on(t.characteristicId, t.pointKey)]
);

/**
 * A stored rule violation (Phase II, against a frozen limits version). `runId` groups the
 * signals of one pattern episode (one mail per run); acknowledgement fields stay null while open.
 */
export const spcSignals = sqliteTable(
	'spc_signals',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		characteristicId: integer('characteristic_id')
			.notNull()
			.references(() => spcCharacteristics.id),
		limitVersionId: integer('limit_version_id')
			.notNull()
			.references(() => spcLimitVersions.id),
		rule: text('rule').notNull(),
		/** location | dispersion | moving-range */
		chartPart: text('chart_part').notNull(),
		/** Key of the point that completed the pattern. */
		pointKey: text('point_key').notNull(),
		pointKeys: text('point_keys', { mode: 'json' }).$type<string[]>().notNull(),
		boardIds: text('board_ids', { mode: 'json' }).$type<number[]>().notNull(),
		/** Time of the completing point. */
		pointAt: integer('point_at', { mode: 'timestamp_ms' }),
		value: real('value'),
		runId: integer('run_id'),
		createdAt: createdAt(),
		ackCause: text('ack_cause'),
		ackAction: text('ack_action'),
		ackNote: text('ack_note'),
		ackByUserId: integer('ack_by_user_id').references(() => users.id),
		ackBy: text('ack_by'),
		ackAt: integer('ack_at', { mode: 'timestamp_ms' }),
		/** Who owns the signal on the floor (assigned, audited); null: nobody yet. */
		assigneeUserId: integer('assignee_user_id').references(() => users.id),
		assignedAt: integer('assigned_at', { mode: 'timestamp_ms' }),
		/** When the open signal was escalated by mail (SIGNAL_ESCALATE_MINUTES); once per signal. */
		escalatedAt: integer('escalated_at', { mode: 'timestamp_ms' })
	},
	(t) => [
		uniqueIndex('spc_signals_unique_idx').on(
			t.characteristicId,
			t.limitVersionId,
			t.rule,
			t.chartPart,
			t.pointKey
		),
		index('spc_signals_open_idx').on(t.ackAt, t.characteristicId)
	]
);

/** Engineers who get e-mail about a chart's new signals. */
export const spcFollowers = sqliteTable(
	'spc_followers',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		characteristicId: integer('characteristic_id')
			.notNull()
			.references(() => spcCharacteristics.id),
		userId: integer('user_id')
			.notNull()
			.references(() => users.id),
		createdAt: createdAt()
	},
	(t) => [uniqueIndex('spc_followers_char_user_idx').on(t.characteristicId, t.userId)]
);

/** Signal runs waiting for a digest mail (when many arrive within a few minutes). */
export const spcMailQueue = sqliteTable(
	'spc_mail_queue',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		userId: integer('user_id')
			.notNull()
			.references(() => users.id),
		signalId: integer('signal_id')
			.notNull()
			.references(() => spcSignals.id),
		createdAt: createdAt()
	},
	(t) => [index('spc_mail_queue_user_idx').on(t.userId)]
);
