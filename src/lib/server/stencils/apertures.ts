import { desc, eq, sql } from 'drizzle-orm';
import type { Db } from '../db';
import { apertureImports, apertures } from '../db/schema';
import { actorLabel, recordAudit } from '../audit';
import type { Actor } from '$lib/access';
import { Refusal, type FieldProblem } from '$lib/errors';
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

/**
 * An import refused as a whole; `problems` name the aperture and field. Answered 422
 * `{ error, errors: [{ where, field, message }] }` (the stencil API's documented shape).
 */
export class ApertureImportError extends Refusal {
	readonly status = 422;
	constructor(readonly problems: InputProblem[]) {
		super(problems.map(formatProblem).join('; '));
	}

	override get fieldProblems(): FieldProblem[] {
		return this.problems.map((p) => ({ field: p.field, message: formatProblem(p) }));
	}

	override body(): Record<string, unknown> {
		return {
			error: 'The apertures were refused; nothing was imported.',
			errors: this.problems.map((p) => ({
				where: p.where,
				field: p.field,
				message: formatProblem(p)
			}))
		};
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
 * Checks made before anything is written: the list's size, its polygon vertices (counted before
 * any polygon is checked) and every aperture. Returns the vertex count.
 * @throws ApertureImportError naming `apertures[i]` and the field.
 */
function precheckImport(list: readonly ApertureInput[], limits: StencilLimits): number {
	const vertices = precheckSizes(list, limits);
	const problems: InputProblem[] = [];
	if (list.length === 0)
		problems.push({ where: 'import', field: 'apertures', message: 'holds no apertures' });
	for (let i = 0; i < list.length && problems.length < 100; i++)
		problems.push(...checkAperture(list[i], i, limits.maxOutlineVertices));
	if (problems.length > 0) throw new ApertureImportError(problems.slice(0, 100));
	return vertices;
}

/** The list's size and polygon vertices against the budgets; returns the vertex count. */
function precheckSizes(list: readonly ApertureInput[], limits: StencilLimits): number {
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
	return vertices;
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
	const vertices = precheckImport(list, limits);
	return storeImport(db, stencilId, list.length, vertices, meta, actor, limits, () => {
		// One prepared statement on the same connection (inside this transaction): 20,000 rows
		// in well under a second, where building drizzle inserts took seconds.
		const insert = db.$client.prepare(INSERT_APERTURE_SQL);
		for (const a of list) insert.run(stencilId, ...apertureRow(a));
	});
}

/**
 * The all-or-nothing end of an import, in one transaction: the stencil's counts checked again,
 * its apertures removed on `replace`, the rows written by `writeRows`, the import record and the
 * audit entry.
 */
function storeImport(
	db: Db,
	stencilId: number,
	count: number,
	vertices: number,
	meta: ImportMeta,
	actor: Actor | null,
	limits: StencilLimits,
	writeRows: () => void
): ImportSummary {
	return db.transaction((tx) => {
		const stencil = getStencil(tx, stencilId);
		const before = meta.mode === 'replace' ? 0 : stencil.apertureCount;
		if (before + count > limits.maxAperturesPerStencil)
			throw new ApertureImportError([
				{
					where: 'import',
					field: 'apertures',
					message:
						`the stencil would hold ${before + count} apertures; ` +
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
		writeRows();
		const record = tx
			.insert(apertureImports)
			.values({
				stencilId,
				source: meta.source,
				fileName: meta.fileName ?? null,
				unit: meta.unit ?? null,
				mode: meta.mode,
				apertureCount: count,
				warnings: meta.warnings ?? [],
				createdBy: actorLabel(actor)
			})
			.returning()
			.get();
		recordAudit(tx, actor, {
			action: 'import-apertures',
			entity: 'stencil',
			entityId: stencilId,
			after: { importId: record.id, source: meta.source, mode: meta.mode, count }
		});
		return {
			importId: record.id,
			stencilId,
			source: meta.source,
			fileName: record.fileName,
			unit: record.unit,
			mode: meta.mode,
			count,
			totalApertures: before + count,
			warnings: record.warnings,
			createdAt: record.createdAt
		};
	});
}

const APERTURE_COLUMNS = `refdes, pad, shape, length_um, width_um, corner_radius_um, diameter_um,
	 vertices_um, x_um, y_um, rotation_deg, drawn`;

const INSERT_APERTURE_SQL = `insert into apertures (stencil_id, ${APERTURE_COLUMNS})
	 values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`;

/** The column values of one aperture row after `stencil_id`, in `APERTURE_COLUMNS` order. */
function apertureRow(a: ApertureInput): (string | number | null)[] {
	return [
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
	];
}

/** Rows staged per chunk of a large import; each chunk is one short write, then the loop yields. */
export const IMPORT_CHUNK_ROWS = 2_000;

const yieldToEventLoop = () => new Promise<void>((done) => setImmediate(done));

let stagingToken = 0;

/**
 * `importApertures` for large lists without holding the request thread: the apertures are
 * checked and staged in chunks of `IMPORT_CHUNK_ROWS` rows in a connection-private temporary
 * table, yielding to the event loop between chunks (so /api/health and other requests are
 * answered meanwhile), then moved into `apertures` with the import record and audit entry in one
 * short transaction (one INSERT … SELECT). All or nothing: staged rows of a failed import are
 * dropped and nothing reaches `apertures`. Lists of one chunk or less are stored at once.
 * @throws the same errors as `importApertures`.
 * @example await importAperturesStaged(db, 4, parsed.apertures, { source: 'gerber', mode: 'replace' }, actor)
 */
export async function importAperturesStaged(
	db: Db,
	stencilId: number,
	list: readonly ApertureInput[],
	meta: ImportMeta,
	actor: Actor | null,
	limits: StencilLimits = stencilLimitsFromEnv(),
	chunkRows = IMPORT_CHUNK_ROWS
): Promise<ImportSummary> {
	if (list.length <= chunkRows) return importApertures(db, stencilId, list, meta, actor, limits);
	// Size and vertices first (cheap), then every aperture, a chunk at a time.
	const vertices = precheckSizes(list, limits);
	const problems: InputProblem[] = [];
	for (let i = 0; i < list.length && problems.length < 100; i += chunkRows) {
		for (let k = i; k < Math.min(list.length, i + chunkRows) && problems.length < 100; k++)
			problems.push(...checkAperture(list[k], k, limits.maxOutlineVertices));
		await yieldToEventLoop();
	}
	if (problems.length > 0) throw new ApertureImportError(problems.slice(0, 100));
	getStencil(db, stencilId); // 404 before any staging
	const client = db.$client;
	client.exec(`create temp table if not exists aperture_stage (token integer not null,
		seq integer not null, ${APERTURE_COLUMNS})`);
	const token = ++stagingToken;
	const stage = client.prepare(
		`insert into temp.aperture_stage (token, seq, ${APERTURE_COLUMNS})
		 values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`
	);
	const stageChunk = client.transaction((from: number) => {
		for (let k = from; k < Math.min(list.length, from + chunkRows); k++)
			stage.run(token, k, ...apertureRow(list[k]));
	});
	try {
		for (let from = 0; from < list.length; from += chunkRows) {
			stageChunk(from);
			await yieldToEventLoop();
		}
		return storeImport(db, stencilId, list.length, vertices, meta, actor, limits, () => {
			client
				.prepare(
					`insert into apertures (stencil_id, ${APERTURE_COLUMNS})
					 select ?, ${APERTURE_COLUMNS} from temp.aperture_stage where token = ? order by seq`
				)
				.run(stencilId, token);
		});
	} finally {
		client.prepare('delete from temp.aperture_stage where token = ?').run(token);
	}
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
