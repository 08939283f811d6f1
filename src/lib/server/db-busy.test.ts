import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { openTestDatabase } from './testing';
import { BUSY_TIMEOUT_MS, isDatabaseBusy, type Db } from './db';
import { errorResponse } from './api';

let db: Db;
let close: () => void;
beforeEach(() => ({ db, close } = openTestDatabase()));
afterEach(() => close());

describe('a write that finds the database locked by another process', () => {
	it('gives up after the short busy timeout and is answered 503 with Retry-After, not 500', async () => {
		expect(db.$client.pragma('busy_timeout', { simple: true })).toBe(BUSY_TIMEOUT_MS);
		expect(BUSY_TIMEOUT_MS).toBeLessThan(1000);
		const other = new Database(db.$client.name);
		other.exec('BEGIN IMMEDIATE');
		let thrown: unknown;
		try {
			db.$client.prepare(`insert into lines (code, name) values ('L-B', 'Busy')`).run();
		} catch (err) {
			thrown = err;
		} finally {
			other.exec('ROLLBACK');
			other.close();
		}
		expect(isDatabaseBusy(thrown)).toBe(true);
		// Wrapped the way an ORM may wrap it: still recognised.
		expect(isDatabaseBusy(new Error('query failed', { cause: thrown }))).toBe(true);
		// As Auth.js wraps an error thrown while it checks credentials.
		expect(isDatabaseBusy(new Error('callback', { cause: { err: thrown } }))).toBe(true);
		expect(isDatabaseBusy(new Error('something else'))).toBe(false);
		const res = errorResponse(thrown);
		expect(res.status).toBe(503);
		expect(res.headers.get('retry-after')).toBe('1');
		expect(await res.json()).toEqual({
			error: 'The database is busy with another write; try again in a moment.'
		});
	});
});
