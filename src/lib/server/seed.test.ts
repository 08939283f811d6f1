import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { openTestDatabase } from './testing';
import { seedDemoData } from './seed';
import { DEMO_USERS } from './demo-accounts';
import { authenticate } from './users';
import { lines, products, users } from './db/schema';
import type { Db } from './db';

let db: Db;
let close: () => void;
beforeEach(() => ({ db, close } = openTestDatabase()));
afterEach(() => close());

const count = (table: typeof users | typeof lines | typeof products) =>
	db
		.select({ n: sql<number>`count(*)` })
		.from(table)
		.get()!.n;

describe('demo data', () => {
	it('seeds an empty database once: the factory and one user per role who can sign in', async () => {
		expect(await seedDemoData(db)).toBe(true);
		expect(count(lines)).toBe(3);
		expect(count(products)).toBe(3);
		expect(new Set(DEMO_USERS.map((u) => u.role)).size).toBe(5);
		for (const user of DEMO_USERS) {
			expect((await authenticate(db, user.email, user.password))?.role).toBe(user.role);
		}
		expect(await seedDemoData(db)).toBe(false);
		expect(count(users)).toBe(DEMO_USERS.length);
	}, 30_000);
});
