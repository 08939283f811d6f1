import type { CharacteristicFact } from '$lib/floor/tile';
import type { Db } from '../db';
import { characteristicsFor } from '../spc/chart-source';
import { chartDetail } from '../spc/chart-service';
import { openSignalCounts } from '../spc/signals';

/**
 * Key characteristics' state for the tiles: the capability assessment of each active chart of the
 * line's product (the chart page's own `chartDetail`, newest 200 points) and its open signals.
 * A chart assessment reads up to 200 subgroups, too much to repeat for every tile on every
 * request, so each is kept for CAPABILITY_MAX_AGE_MS and then refreshed after the answer
 * (the tile shows the previous figures meanwhile). Open-signal counts are always current.
 */
export const CAPABILITY_MAX_AGE_MS = 60_000;

type Entry = {
	atMs: number;
	fact: Omit<CharacteristicFact, 'openSignals'> & { target: number | null };
};
const entries = new Map<number, Entry>();
const refreshing = new Set<number>();
let refreshQueue: number[] = [];
let refreshTimer: ReturnType<typeof setTimeout> | null = null;

function assess(db: Db, id: number): Entry['fact'] | null {
	try {
		const d = chartDetail(db, id);
		const cap = d.capability.result;
		return {
			id,
			name: d.characteristic.name,
			measure: d.characteristic.measure,
			// The one capability assessment's verdict, as the chart page shows it.
			level: d.capability.assessment.verdict,
			cpk: cap?.cpk ?? null,
			ppk: cap?.ppk ?? null,
			target: d.characteristic.target
		};
	} catch (err) {
		console.error(`[floor] capability of chart ${id} failed`, err);
		return null;
	}
}

function scheduleRefresh(db: Db, id: number): void {
	if (refreshing.has(id)) return;
	refreshing.add(id);
	refreshQueue.push(id);
	if (refreshTimer) return;
	// One chart per turn of the event loop, so requests are never held up behind a batch.
	const step = () => {
		const next = refreshQueue.shift();
		if (next === undefined) {
			refreshTimer = null;
			return;
		}
		const fact = assess(db, next);
		if (fact) entries.set(next, { atMs: Date.now(), fact });
		refreshing.delete(next);
		refreshTimer = setTimeout(step, 0);
	};
	refreshTimer = setTimeout(step, 0);
}

/** Forget every cached assessment (tests). */
export function clearCapabilityCache(): void {
	entries.clear();
	refreshing.clear();
	refreshQueue = [];
}

/**
 * Characteristic facts per `${productId}:${lineId}` for the given scopes.
 * @example capabilityStates(db, [{ productId: 1, lineId: 1 }]).get('1:1')
 */
export function capabilityStates(
	db: Db,
	scopes: readonly { productId: number; lineId: number }[],
	nowMs = Date.now()
): Map<string, (CharacteristicFact & { target: number | null })[]> {
	const out = new Map<string, (CharacteristicFact & { target: number | null })[]>();
	if (scopes.length === 0) return out;
	const open = openSignalCounts(db);
	for (const scope of scopes) {
		const key = `${scope.productId}:${scope.lineId}`;
		if (out.has(key)) continue;
		const list: (CharacteristicFact & { target: number | null })[] = [];
		for (const c of characteristicsFor(db, scope.productId, scope.lineId)) {
			let entry = entries.get(c.id);
			if (!entry) {
				const fact = assess(db, c.id);
				if (!fact) continue;
				entry = { atMs: nowMs, fact };
				entries.set(c.id, entry);
			} else if (nowMs - entry.atMs > CAPABILITY_MAX_AGE_MS) {
				scheduleRefresh(db, c.id);
			}
			list.push({ ...entry.fact, openSignals: open.get(c.id) ?? 0 });
		}
		out.set(key, list);
	}
	return out;
}
