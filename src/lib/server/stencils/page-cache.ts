/**
 * The stencil page's figures, kept per stencil revision: evaluating 20,000 apertures, their
 * overlap check (40–100 ms) and the page's compact JSON are computed once and reused until the
 * stencil's apertures, its foil or the site thresholds change. The key is read fresh on every
 * request (two small queries), so a change shows at once. Aperture row ids are never reused
 * (AUTOINCREMENT), so the count and the largest id together change with every import or removal.
 */
import { mapLayers } from '$lib/stencil';
import { aperturesToColumns, type StencilColumnsAnswer } from '$lib/stencil/aperture-columns';
import type { Db } from '../db';
import { loadApertures } from './apertures';
import {
	evaluateStoredApertures,
	stencilAdvice,
	type StencilAdvice,
	type StencilCheck
} from './evaluation';
import { getStencil } from './stencils';
import { siteThresholds } from './thresholds';

/** One stencil revision's figures; the derived parts are built on first use. */
export interface CachedStencil {
	check: StencilCheck;
	advice(): StencilAdvice;
	/** `{"apertures":[…]}` as JSON text. */
	rowsJson(): string;
	/** `StencilColumnsAnswer` as JSON text. */
	columnsJson(): string;
}

/** Stencils kept per database (20,000 evaluated apertures are some tens of MB). */
const KEPT = 4;
const caches = new WeakMap<Db, Map<number, { key: string; entry: CachedStencil }>>();

function lazy<T>(make: () => T): () => T {
	let value: { v: T } | null = null;
	return () => (value ??= { v: make() }).v;
}

/**
 * The stencil's check and page data, from the cache when nothing it depends on has changed.
 * The stencil record itself is always the fresh one (its state may change without a new check).
 * @throws StencilNotFoundError.
 */
export function cachedStencil(db: Db, stencilId: number): CachedStencil {
	const stencil = getStencil(db, stencilId);
	const thresholds = siteThresholds(db)[stencil.technology];
	const rows = db.$client
		.prepare('select count(*) as n, max(id) as last from apertures where stencil_id = ?')
		.get(stencilId) as { n: number; last: number | null };
	const key = JSON.stringify([
		stencil.thicknessUm,
		stencil.technology,
		stencil.stepRegions,
		thresholds,
		rows.n,
		rows.last
	]);
	let cache = caches.get(db);
	if (!cache) caches.set(db, (cache = new Map()));
	const hit = cache.get(stencilId);
	if (hit && hit.key === key) {
		// Most recently used last, so the oldest is the first to go.
		cache.delete(stencilId);
		cache.set(stencilId, hit);
		return { ...hit.entry, check: { ...hit.entry.check, stencil } };
	}
	const check = evaluateStoredApertures(stencil, thresholds, loadApertures(db, stencilId));
	const entry: CachedStencil = {
		check,
		advice: lazy(() => stencilAdvice(check)),
		rowsJson: lazy(() => JSON.stringify({ apertures: check.apertures })),
		columnsJson: lazy(() => {
			const { skipped: _skipped, ...map } = mapLayers(check.apertures);
			const answer: StencilColumnsAnswer = {
				count: check.apertures.length,
				columns: aperturesToColumns(check.apertures),
				map
			};
			return JSON.stringify(answer);
		})
	};
	cache.delete(stencilId);
	cache.set(stencilId, { key, entry });
	while (cache.size > KEPT) cache.delete(cache.keys().next().value!);
	return entry;
}

/**
 * Compute a stencil's page figures soon after its apertures changed (an import or a removal), so
 * the first view afterwards finds them ready. Runs after the current answer is sent; a stencil
 * that cannot be read is left for the page to report.
 */
export function warmStencilCache(db: Db, stencilId: number): void {
	const timer = setTimeout(() => {
		try {
			const cached = cachedStencil(db, stencilId);
			cached.advice();
			cached.columnsJson();
		} catch {
			// the page shows the error when it is opened
		}
	}, 0);
	timer.unref?.();
}
