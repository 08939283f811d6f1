/**
 * Validate against stencil and plan: each board inspection of a file resolved, when it first
 * appears, to its line, product, print run and stencil (by name, or the print run's), with the
 * stencil's apertures for transfer efficiency and pad links. A board already stored (serial +
 * inspected_at) is marked so its rows are skipped.
 */
import type Database from 'better-sqlite3';
import type { BoardHeader } from '$lib/ingest';
import type { Db } from '../db';
import { checkStoredStencil } from '../stencils/evaluation';

/** Aperture volume (µm³) and id by `refdes\u0001pad` for one stencil. */
export type ApertureMap = Map<string, { id: number; volumeUm3: number }>;

/** The database's view of one board inspection of the file. */
export interface ResolvedBoard {
	lineId: number | null;
	productId: number | null;
	printRunId: number | null;
	stencilId: number | null;
	/** The inspection is stored already (its rows are skipped and counted). */
	stored: boolean;
	/** The stencil's apertures, or null (no stencil, or one that cannot be evaluated). */
	apertures: ApertureMap | null;
}

/**
 * `map.get(key)`, loaded once by `load` (null results are kept too).
 * @example cached(new Map(), 'L1', () => 3) // 3
 */
export function cached<K, V>(map: Map<K, V>, key: K, load: () => V): V {
	if (map.has(key)) return map.get(key) as V;
	const v = load();
	map.set(key, v);
	return v;
}

/**
 * A print-run reference from a file: `17`, `#17`, `PR-17`, `run 17` → 17; else null.
 * @example printRunNumber('PR-17') // 17
 */
export function printRunNumber(ref: string): number | null {
	const m = /^(?:pr[-\s]?|run\s*|#)?(\d{1,12})$/i.exec(ref.trim());
	return m ? Number(m[1]) : null;
}

/**
 * Resolve the boards of one import on `conn` (lookups are cached per import: a file names a few
 * lines, products and stencils many times over).
 */
export function createBoardResolver(db: Db, conn: Database.Database) {
	const boardStored = conn
		.prepare(`select 1 from spi_boards where serial = ? and inspected_at = ?`)
		.pluck();
	const lineIdOf = conn.prepare(`select id from lines where code = ?`).pluck();
	const productIdOf = conn.prepare(`select id from products where code = ?`).pluck();
	const runById = conn.prepare(`select id, line_id, stencil_id from print_runs where id = ?`);
	const runByWindow = conn.prepare(
		`select id, stencil_id from print_runs where line_id = ? and started_at <= ?
		 and (ended_at is null or ended_at >= ?) order by started_at desc limit 1`
	);
	const stencilByName = conn
		.prepare(`select id from stencils where name = ? order by id desc limit 1`)
		.pluck();
	const cache = {
		lines: new Map<string, number | null>(),
		products: new Map<string, number | null>(),
		stencils: new Map<string, number | null>(),
		apertures: new Map<number, ApertureMap | null>()
	};

	function aperturesOf(stencilId: number | null): ApertureMap | null {
		if (stencilId === null) return null;
		return cached(cache.apertures, stencilId, () => {
			try {
				const check = checkStoredStencil(db, stencilId);
				const m: ApertureMap = new Map();
				for (const a of check.apertures)
					m.set(`${a.refdes}\u0001${a.pad}`, { id: a.id, volumeUm3: a.volumeUm3 });
				return m;
			} catch {
				// A stencil that cannot be evaluated (bad geometry) links nothing; the import goes on.
				return null;
			}
		});
	}

	/** The print run named by the file, else the one running on the line at inspection time. */
	function printRunOf(b: BoardHeader, lineId: number | null) {
		if (b.printRun !== null) {
			const n = printRunNumber(b.printRun);
			return n === null
				? undefined
				: (runById.get(n) as { id: number; stencil_id: number | null } | undefined);
		}
		if (lineId === null) return undefined;
		return runByWindow.get(lineId, b.inspectedAtMs, b.inspectedAtMs) as
			{ id: number; stencil_id: number | null } | undefined;
	}

	return {
		resolve(b: BoardHeader): ResolvedBoard {
			const lineId = cached(
				cache.lines,
				b.lineCode,
				() => (lineIdOf.get(b.lineCode) as number) ?? null
			);
			const productId = cached(
				cache.products,
				b.productCode,
				() => (productIdOf.get(b.productCode) as number) ?? null
			);
			const run = printRunOf(b, lineId);
			const named = b.stencil;
			const stencilId =
				named !== null
					? cached(cache.stencils, named, () => (stencilByName.get(named) as number) ?? null)
					: (run?.stencil_id ?? null);
			return {
				lineId,
				productId,
				printRunId: run?.id ?? null,
				stencilId,
				stored: boardStored.get(b.boardSerial, b.inspectedAtMs) !== undefined,
				apertures: aperturesOf(stencilId)
			};
		}
	};
}
