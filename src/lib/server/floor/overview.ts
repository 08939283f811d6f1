import type Database from 'better-sqlite3';
import { lineTile, type LineFacts, type LineTile } from '$lib/floor/tile';
import type { Db } from '../db';
import { takePublishedEvents } from './events';
import { loadLineFacts } from './facts';
import { linesOfEvent } from './lines-of';
import { siteFloorSettings } from './floor-settings';

/**
 * Tiles of every active line (or of `lineIds`), in line code order: what `GET /api/lines/overview`
 * answers and the stream sends one at a time.
 *
 * A line's facts (its run, stencil, lot, last boards, signals) change only when a service writes,
 * and every such write publishes a floor event. So the facts are kept per line and read again
 * only for lines an event touched since, or after FACTS_MAX_AGE_MS (a safety net for changes
 * made outside the services, e.g. by hand in the database). The tile itself (what is due, ages,
 * the state) is computed from the facts at every request, so the clock is always current.
 */
export const FACTS_MAX_AGE_MS = 30_000;
/** Aged lines re-read per request at most. */
const AGED_PER_REQUEST = 10;

type Cache = { facts: Map<number, { facts: LineFacts; atMs: number }> };
const caches = new WeakMap<Database.Database, Cache>();

function cacheOf(db: Db): Cache {
	let cache = caches.get(db.$client);
	if (!cache) {
		cache = { facts: new Map() };
		caches.set(db.$client, cache);
	}
	return cache;
}

/** Forget the lines events touched since the last call (run before every read). */
function applyEvents(db: Db, cache: Cache): void {
	const { events, overflow } = takePublishedEvents();
	if (overflow) {
		cache.facts.clear();
		return;
	}
	for (const e of events) {
		for (const id of linesOfEvent(db, e)) cache.facts.delete(id);
	}
}

export function lineTiles(db: Db, nowMs = Date.now(), lineIds?: readonly number[]): LineTile[] {
	const cache = cacheOf(db);
	applyEvents(db, cache);
	// Which lines are active: one small indexed read, always current (lines are added or retired).
	const active = db.$client
		.prepare(`select id from lines where active = 1 order by code`)
		.pluck()
		.all() as number[];
	const wanted = lineIds ? active.filter((id) => lineIds.includes(id)) : active;
	const missing = wanted.filter((id) => !cache.facts.has(id));
	// Aged facts are refreshed a few at a time, oldest first, so lines that went quiet together do
	// not all come due on one request (the others keep their facts until a later one).
	const aged = wanted
		.filter((id) => {
			const entry = cache.facts.get(id);
			return entry && (nowMs - entry.atMs > FACTS_MAX_AGE_MS || nowMs < entry.atMs);
		})
		.sort((a, b) => cache.facts.get(a)!.atMs - cache.facts.get(b)!.atMs)
		.slice(0, AGED_PER_REQUEST);
	missing.push(...aged);
	if (missing.length) {
		for (const facts of loadLineFacts(db, nowMs, missing)) {
			cache.facts.set(facts.line.id, { facts, atMs: nowMs });
		}
	}
	const tiles: LineTile[] = [];
	for (const id of wanted) {
		const entry = cache.facts.get(id);
		if (entry) tiles.push(lineTile(entry.facts, nowMs, siteFloorSettings()));
	}
	return tiles;
}

/** The overview answer: `{ lines, at }`. */
export function lineOverview(db: Db, nowMs = Date.now()): { lines: LineTile[]; at: string } {
	return { lines: lineTiles(db, nowMs), at: new Date(nowMs).toISOString() };
}
