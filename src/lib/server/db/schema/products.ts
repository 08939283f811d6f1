import { sql } from 'drizzle-orm';
import { index, integer, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { products, users } from './foundation';

const createdAt = () =>
	integer('created_at', { mode: 'timestamp_ms' })
		.notNull()
		.default(sql`(unixepoch('subsec') * 1000)`);

/**
 * Which stencils are approved for a product, and for which side of the board. Kept by stencil
 * name (what the label and the scanner read), so every revision of an approved stencil is
 * approved; a product with no row here has no stencil rule yet (runs are warned, not refused).
 */
export const productStencilApprovals = sqliteTable(
	'product_stencil_approvals',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		productId: integer('product_id')
			.notNull()
			.references(() => products.id),
		stencilName: text('stencil_name').notNull(),
		/** top | bottom */
		side: text('side').notNull(),
		createdAt: createdAt(),
		createdByUserId: integer('created_by_user_id').references(() => users.id)
	},
	(t) => [
		uniqueIndex('product_stencil_approvals_idx').on(t.productId, t.stencilName, t.side),
		index('product_stencil_approvals_stencil_idx').on(t.stencilName)
	]
);

/**
 * The pastes a product allows: one row per allowed alloy (`kind` alloy, value as written, e.g.
 * SAC305) or powder type (`kind` powder-type, value the IPC J-STD-005 type number as text). A
 * product with no row of a kind does not restrict that kind yet.
 */
export const productPasteAllowances = sqliteTable(
	'product_paste_allowances',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		productId: integer('product_id')
			.notNull()
			.references(() => products.id),
		/** alloy | powder-type */
		kind: text('kind').notNull(),
		value: text('value').notNull(),
		createdAt: createdAt(),
		createdByUserId: integer('created_by_user_id').references(() => users.id)
	},
	(t) => [uniqueIndex('product_paste_allowances_idx').on(t.productId, t.kind, t.value)]
);
