/**
 * The site's TE model for a stencil technology, as the stencil page shows it beside each
 * aperture: the one analysis of `GET /api/analysis/transfer-efficiency` (all pastes and dates,
 * default floor), computed once per technology and kept until the SPI data or any stencil's
 * apertures change (smallest and largest board id: new boards and purged old ones, read from the
 * rowid index without counting millions of boards; aperture count and largest id), since the scan
 * reads up to two million pads.
 */
import { siteTeModel, type SiteTeModel } from '$lib/stencil/te-prediction';
import type { Db } from '../db';
import { transferEfficiency } from '../analysis/transfer-efficiency';

/** The model, or null with the analysis's reason (too few pads, no knee in the data…). */
export interface SiteTeModelAnswer {
	model: SiteTeModel | null;
	reason: string | null;
}

/** The TE floor the page reads the learned limit at (the analysis's default). */
export const PAGE_TE_FLOOR = 0.7;

const caches = new WeakMap<
	Db,
	Map<string, { version: string; answer: Promise<SiteTeModelAnswer> }>
>();

function dataVersion(db: Db): string {
	const row = db.$client
		.prepare(
			`select (select min(id) from spi_boards) as firstBoard, (select max(id) from spi_boards) as lastBoard,
			   (select count(*) from apertures) as apertures, (select max(id) from apertures) as lastAperture`
		)
		.get();
	return JSON.stringify(row);
}

/**
 * The site's TE model for one technology; concurrent requests share one computation.
 * @example (await siteTeModelFor(db, 'laser-stainless')).model?.coefficients.knee // 0.58
 */
export function siteTeModelFor(db: Db, technology: string): Promise<SiteTeModelAnswer> {
	const version = dataVersion(db);
	let cache = caches.get(db);
	if (!cache) caches.set(db, (cache = new Map()));
	const hit = cache.get(technology);
	if (hit && hit.version === version) return hit.answer;
	const answer = transferEfficiency(db, {
		technology,
		paste: null,
		powder: null,
		fromMs: null,
		toMs: null,
		floor: PAGE_TE_FLOOR
	}).then((te) => {
		const model = siteTeModel(te);
		return { model, reason: model ? null : (te.reason ?? 'no curve could be fitted') };
	});
	cache.set(technology, { version, answer });
	// A failed scan is not kept: the next request tries again.
	answer.catch(() => {
		if (cache.get(technology)?.answer === answer) cache.delete(technology);
	});
	return answer;
}
