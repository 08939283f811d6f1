import { desc, eq, sql } from 'drizzle-orm';
import type { Db } from '../db';
import { apertureImports, apertures } from '../db/schema';
import { actorLabel, recordAudit } from '../audit';
import type { Actor } from '$lib/access';
import {
	checkAperture,
	formatProblem,
	type ApertureInput,
	type InputProblem,
	type PointUm
} from '$lib/stencil';
import { getStencil } from './stencils';
import { DEFAULT_STENCIL_LIMITS, formatCount, type StencilLimits } from '$lib/stencil/limits';
import { stencilLimitsFromEnv } from './limits-env';

/** Largest number of apertures one stencil may hold (the same cap as one import). */
export const MAX_APERTURES_PER_STENCIL = DEFAULT_STENCIL_LIMITS.maxAperturesPerStencil;

/** A stored aperture: its row id and the input fields (µm, degrees). */
export interface StoredAperture extends ApertureInput {
	id: number;
}

/** Where apertures came from; also the `source` of an import record. */
export type ApertureSource = 'json' | 'csv' | 'gerber' | 'form' | 'revision-copy';

/** append adds to what the stencil holds; replace removes the old apertures first. */
export type ImportMode = 'append' | 'replace';

/** The answer to an import: what was stored and what the engineer should know. */
export interface ImportSummary {
	importId: number;
	stencilId: number;
	source: ApertureSource;
	fileName: string | null;
	unit: string | null;
	mode: ImportMode;
	count: number;
	totalApertures: number;
	warnings: string[];
	createdAt: Date;
}

/** An import refused as a whole; `problems` name the aperture and field. */
export class ApertureImportError extends Error {
	constructor(readonly problems: InputProblem[]) {
		super(problems.map(formatProblem).join('; '));
	}
}

/**
 * Rows stored before rotations were limited to ±360° (e.g. 450°, or 1e308 through the old API)
 * are read as the same turn inside the range, so such a stencil stays readable.
 */
function foldLegacyRotation(deg: number): number {
	if (Math.abs(deg) <= 360 || !Number.isFinite(deg)) return deg;
	const r = deg % 360;
	return r === 0 ? 0 : r;
}

/**
 * The stored apertures of a stencil in import order, as `ApertureInput` plus the row id.
 * Columns that do not apply to a shape are left out (not null), so JSON stays clean.
 */
export function loadApertures(db: Db, stencilId: number): StoredAperture[] {
	// Raw statement: drizzle's row mapping costs more than the query at 20,000 rows.
	const rows = db.$client
		.prepare(
			`select id, refdes, pad, shape, length_um, width_um, corner_radius_um, diameter_um,
			 vertices_um, x_um, y_um, rotation_deg, drawn from apertures where stencil_id = ?
			 order by id`
		)
		.raw()
		.all(stencilId) as (string | number | null)[][];
	return rows.map((r) => {
		const a: StoredAperture = {
			id: r[0] as number,
			refdes: r[1] as string,
			pad: r[2] as string,
			shape: r[3] as ApertureInput['shape'],
			xUm: r[9] as number,
			yUm: r[10] as number,
			rotationDeg: foldLegacyRotation(r[11] as number)
		};
		if (r[4] !== null) a.lengthUm = r[4] as number;
		if (r[5] !== null) a.widthUm = r[5] as number;
		if (r[6] !== null) a.cornerRadiusUm = r[6] as number;
		if (r[7] !== null) a.diameterUm = r[7] as number;
		if (r[8] !== null) a.verticesUm = JSON.parse(r[8] as string) as PointUm[];
		if (r[12] === 1) a.drawn = true;
		return a;
	});
}

/** Polygon vertices a stencil holds, all apertures together (counted in SQLite). */
export function storedVertexCount(db: Db, stencilId: number): number {
	const row = db.$client
		.prepare(
			`select coalesce(sum(json_array_length(vertices_um)), 0) as n from apertures
			 where stencil_id = ? and vertices_um is not null`
		)
		.get(stencilId) as { n: number };
	return row.n;
}

/** What an import is, besides its apertures. */
export interface ImportMeta {
	source: ApertureSource;
	mode: ImportMode;
	fileName?: string | null;
	unit?: string | null;
	warnings?: string[];
}

/**
 * Store apertures in one transaction, all or nothing, with an import record and an audit entry.
 * Every aperture is checked again here (whatever parsed it), so nothing invalid is ever stored.
 * @throws StencilNotFoundError; ApertureImportError naming `apertures[i]` and the field when an
 * aperture is invalid, the list is empty, the stencil would exceed 50,000 apertures, or the
 * polygon vertices of the import or the stencil would exceed their budgets (`limits.ts`).
 * @example importApertures(db, 4, parsed.apertures, { source: 'csv', mode: 'append', unit: 'mm' }, actor)
 */
export function importApertures(
	db: Db,
	stencilId: number,
	list: readonly ApertureInput[],
	meta: ImportMeta,
	actor: Actor | null,
	limits: StencilLimits = stencilLimitsFromEnv()
): ImportSummary {
	const problems: InputProblem[] = [];
	if (list.length === 0)
		problems.push({ where: 'import', field: 'apertures', message: 'holds no apertures' });
	if (list.length > limits.maxAperturesPerStencil)
		throw new ApertureImportError([
			{
				where: 'import',
				field: 'apertures',
				message:
					`the import holds ${formatCount(list.length)} apertures; ` +
					`at most ${formatCount(limits.maxAperturesPerStencil)} are allowed`
			}
		]);
	// Vertices counted before any polygon is checked: they are what make checks and reads cost.
	let vertices = 0;
	for (const a of list) vertices += Array.isArray(a.verticesUm) ? a.verticesUm.length : 0;
	if (vertices > limits.maxVerticesPerImport)
		throw new ApertureImportError([
			{
				where: 'import',
				field: 'verticesUm',
				message:
					`the polygons hold ${formatCount(vertices)} vertices; ` +
					`the limit is ${formatCount(limits.maxVerticesPerImport)} per import`
			}
		]);
	for (let i = 0; i < list.length && problems.length < 100; i++)
		problems.push(...checkAperture(list[i], i, limits.maxOutlineVertices));
	if (problems.length > 0) throw new ApertureImportError(problems.slice(0, 100));
	return db.transaction((tx) => {
		const stencil = getStencil(tx, stencilId);
		const before = meta.mode === 'replace' ? 0 : stencil.apertureCount;
		if (before + list.length > limits.maxAperturesPerStencil)
			throw new ApertureImportError([
				{
					where: 'import',
					field: 'apertures',
					message:
						`the stencil would hold ${before + list.length} apertures; ` +
						`at most ${limits.maxAperturesPerStencil} are allowed`
				}
			]);
		const stored = meta.mode === 'replace' ? 0 : storedVertexCount(db, stencilId);
		if (stored + vertices > limits.maxVerticesPerStencil)
			throw new ApertureImportError([
				{
					where: 'import',
					field: 'verticesUm',
					message:
						`the stencil would hold ${formatCount(stored + vertices)} polygon vertices; ` +
						`the limit is ${formatCount(limits.maxVerticesPerStencil)} per stencil`
				}
			]);
		if (meta.mode === 'replace')
			tx.delete(apertures).where(eq(apertures.stencilId, stencilId)).run();
		// One prepared statement on the same connection (inside this transaction): 20,000 rows
		// in well under a second, where building drizzle inserts took seconds.
		const insert = db.$client.prepare(
			`insert into apertures (stencil_id, refdes, pad, shape, length_um, width_um,
			 corner_radius_um, diameter_um, vertices_um, x_um, y_um, rotation_deg, drawn)
			 values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`
		);
		for (const a of list)
			insert.run(
				stencilId,
				a.refdes,
				a.pad,
				a.shape,
				a.lengthUm ?? null,
				a.widthUm ?? null,
				a.cornerRadiusUm ?? null,
				a.diameterUm ?? null,
				a.verticesUm ? JSON.stringify(a.verticesUm) : null,
				a.xUm,
				a.yUm,
				a.rotationDeg,
				a.drawn === true ? 1 : 0
			);
		const record = tx
			.insert(apertureImports)
			.values({
				stencilId,
				source: meta.source,
				fileName: meta.fileName ?? null,
				unit: meta.unit ?? null,
				mode: meta.mode,
				apertureCount: list.length,
				warnings: meta.warnings ?? [],
				createdBy: actorLabel(actor)
			})
			.returning()
			.get();
		recordAudit(tx, actor, {
			action: 'import-apertures',
			entity: 'stencil',
			entityId: stencilId,
			after: { importId: record.id, source: meta.source, mode: meta.mode, count: list.length }
		});
		return {
			importId: record.id,
			stencilId,
			source: meta.source,
			fileName: record.fileName,
			unit: record.unit,
			mode: meta.mode,
			count: list.length,
			totalApertures: before + list.length,
			warnings: record.warnings,
			createdAt: record.createdAt
		};
	});
}

/** Remove one aperture (typed in by mistake), audited. Returns whether a row was removed. */
export function deleteAperture(db: Db, stencilId: number, apertureId: number, actor: Actor | null) {
	return db.transaction((tx) => {
		const gone = tx
			.delete(apertures)
			.where(sql`${apertures.id} = ${apertureId} and ${apertures.stencilId} = ${stencilId}`)
			.returning()
			.get();
		if (gone)
			recordAudit(tx, actor, {
				action: 'delete-aperture',
				entity: 'stencil',
				entityId: stencilId,
				before: { ...gone }
			});
		return !!gone;
	});
}

/** The import history of a stencil, newest first. */
export function listImports(db: Db, stencilId: number) {
	return db
		.select()
		.from(apertureImports)
		.where(eq(apertureImports.stencilId, stencilId))
		.orderBy(desc(apertureImports.id))
		.all();
}
