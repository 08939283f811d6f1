import type Database from 'better-sqlite3';
import type { Db } from '../db';

/**
 * Answers of `GET /api/charts/{id}` (JSON text) kept until the database changes. A chart costs
 * 4–13 ms of CPU whatever the data's size (bounded to its newest subgroups), and open chart pages
 * and wall screens ask for the same chart again and again between imports; on a busy 2-core
 * machine that CPU, not the data, decides the answer time.
 *
 * The key is the database's data version: this connection's `total_changes()` (its own writes:
 * limits, exclusions, acknowledgements, settings, signals) and SQLite's `data_version` (commits
 * by every other connection: the SPI ingest's, worker threads', other processes). Any commit
 * anywhere empties the cache, so an answer is never older than the data it was computed from.
 * A chart answer depends on nothing else (no clock).
 */
export const CHART_CACHE_ENTRIES = 100;

type Cache = {
	version: string;
	entries: Map<string, string>;
	read: Database.Statement;
};
const caches = new WeakMap<Database.Database, Cache>();

function cacheOf(conn: Database.Database): Cache {
	let cache = caches.get(conn);
	if (!cache) {
		cache = {
			version: '',
			entries: new Map(),
			read: conn.prepare(
				'select total_changes() as changes, data_version as version from pragma_data_version()'
			)
		};
		caches.set(conn, cache);
	}
	return cache;
}

/** The data version of `db`'s connection: changes whenever anyone commits a change. */
export function dataVersion(db: Db): string {
	const r = cacheOf(db.$client).read.get() as { changes: number; version: number };
	return `${r.version}:${r.changes}`;
}

/**
 * The JSON text of `compute()` for `key`, from the cache while the data version is the same.
 * `compute` must only read (its errors pass through and nothing is kept).
 * @example cachedChartJson(db, `${id}:${limit}`, () => chartJson(chartDetail(db, id, { limit })))
 */
export function cachedChartJson(
	db: Db,
	key: string,
	compute: () => unknown,
	maxEntries = CHART_CACHE_ENTRIES
): string {
	const cache = cacheOf(db.$client);
	const version = dataVersion(db);
	if (version !== cache.version) {
		cache.entries.clear();
		cache.version = version;
	}
	const hit = cache.entries.get(key);
	if (hit !== undefined) {
		// Most recently used last, so the oldest is the first to go.
		cache.entries.delete(key);
		cache.entries.set(key, hit);
		return hit;
	}
	const text = JSON.stringify(compute());
	if (cache.entries.size >= maxEntries) {
		const oldest = cache.entries.keys().next().value;
		if (oldest !== undefined) cache.entries.delete(oldest);
	}
	cache.entries.set(key, text);
	return text;
}
