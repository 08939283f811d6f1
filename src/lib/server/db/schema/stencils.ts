import { sql } from 'drizzle-orm';
import {
	index,
	integer,
	real,
	sqliteTable,
	text,
	uniqueIndex,
	type AnySQLiteColumn
} from 'drizzle-orm/sqlite-core';
import { sites, users } from './foundation';

/**
 * Stencils and their apertures. A stencil's revisions are rows with the same name and a different
 * revision; nothing is overwritten, so history stays. Geometry is stored as entered (µm);
 * area ratio and the other figures are computed by $lib/stencil when read.
 */
export const stencils = sqliteTable(
	'stencils',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		siteId: integer('site_id').references(() => sites.id),
		/** What the label and the scanner read, e.g. "ST-PB100-T". */
		name: text('name').notNull(),
		revision: text('revision').notNull(),
		thicknessUm: real('thickness_um').notNull(),
		/** laser-stainless | electroformed | laser-nano-coated | step (see $lib/stencil thresholds). */
		technology: text('technology').notNull(),
		ratedLifePrints: integer('rated_life_prints'),
		notes: text('notes').notNull().default(''),
		/** Stencil life state: available | in-use | out-for-cleaning | quarantined | retired. */
		state: text('state').notNull().default('available'),
		createdAt: integer('created_at', { mode: 'timestamp_ms' })
			.notNull()
			.default(sql`(unixepoch('subsec') * 1000)`),
		createdByUserId: integer('created_by_user_id').references(() => users.id),
		/** The revision this one was started from (its apertures were copied), if any. */
		basedOnStencilId: integer('based_on_stencil_id').references((): AnySQLiteColumn => stencils.id)
	},
	(t) => [uniqueIndex('stencils_name_revision_idx').on(t.name, t.revision)]
);

export const stencilStepRegions = sqliteTable('stencil_step_regions', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	stencilId: integer('stencil_id')
		.notNull()
		.references(() => stencils.id),
	xMinUm: real('x_min_um').notNull(),
	yMinUm: real('y_min_um').notNull(),
	xMaxUm: real('x_max_um').notNull(),
	yMaxUm: real('y_max_um').notNull(),
	thicknessUm: real('thickness_um').notNull()
});

export const apertures = sqliteTable(
	'apertures',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		stencilId: integer('stencil_id')
			.notNull()
			.references(() => stencils.id),
		refdes: text('refdes').notNull(),
		pad: text('pad').notNull(),
		/** rectangle | rounded-rectangle | circle | polygon */
		shape: text('shape').notNull(),
		lengthUm: real('length_um'),
		widthUm: real('width_um'),
		cornerRadiusUm: real('corner_radius_um'),
		diameterUm: real('diameter_um'),
		/** Polygon vertices [[x, y], …] in µm relative to (x, y), before rotation. */
		verticesUm: text('vertices_um', { mode: 'json' }).$type<[number, number][]>(),
		xUm: real('x_um').notNull().default(0),
		yUm: real('y_um').notNull().default(0),
		rotationDeg: real('rotation_deg').notNull().default(0),
		/** 1 when the opening was painted with Gerber draws and united into a polygon. */
		drawn: integer('drawn', { mode: 'boolean' }).notNull().default(false)
	},
	(t) => [index('apertures_stencil_refdes_idx').on(t.stencilId, t.refdes, t.pad)]
);

/**
 * One aperture import into a stencil (JSON, CSV, Gerber, a typed aperture or a revision copy):
 * what came in, from where, and the warnings the engineer saw. Written in the same transaction
 * as the apertures, so the record and the data never disagree.
 */
export const apertureImports = sqliteTable(
	'aperture_imports',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		stencilId: integer('stencil_id')
			.notNull()
			.references(() => stencils.id),
		/** json | csv | gerber | form | revision-copy */
		source: text('source').notNull(),
		fileName: text('file_name'),
		/** Length unit of a CSV or Gerber file (um, mm, mil, inch); null for JSON (always µm). */
		unit: text('unit'),
		/** append | replace */
		mode: text('mode').notNull(),
		apertureCount: integer('aperture_count').notNull(),
		warnings: text('warnings', { mode: 'json' }).$type<string[]>().notNull(),
		createdAt: integer('created_at', { mode: 'timestamp_ms' })
			.notNull()
			.default(sql`(unixepoch('subsec') * 1000)`),
		/** "user:12", "token:3" or "system", as in the audit log. */
		createdBy: text('created_by').notNull()
	},
	(t) => [index('aperture_imports_stencil_idx').on(t.stencilId)]
);
