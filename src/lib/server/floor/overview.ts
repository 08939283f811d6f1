import { FLOOR_DEFAULTS, lineTile, type LineTile } from '$lib/floor/tile';
import type { Db } from '../db';
import { loadLineFacts } from './facts';

/**
 * Tiles of every active line (or of `lineIds`), in line code order: what `GET /api/lines/overview`
 * answers and the stream sends one at a time.
 */
export function lineTiles(db: Db, nowMs = Date.now(), lineIds?: readonly number[]): LineTile[] {
	return loadLineFacts(db, nowMs, lineIds).map((facts) => lineTile(facts, nowMs, FLOOR_DEFAULTS));
}

/** The overview answer: `{ lines, at }`. */
export function lineOverview(db: Db, nowMs = Date.now()): { lines: LineTile[]; at: string } {
	return { lines: lineTiles(db, nowMs), at: new Date(nowMs).toISOString() };
}
