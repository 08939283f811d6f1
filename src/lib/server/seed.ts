import { sql } from 'drizzle-orm';
import type { Db } from './db';
import { lines, products, sites, users } from './db/schema';
import { createUser } from './users';
import { DEMO_USERS } from './demo-accounts';
import { seedDemoStencils } from './stencils/demo';
import { seedDemoPrintlog } from './printlog/demo';
import { seedDemoProductFit } from './printlog/demo-fit';
import { seedDemoSpi } from './ingest/demo';
import { seedDemoSpc } from './spc/demo';
import { seedDemoAnalysis } from './analysis/demo';

/** The demo scenario: Fenmoor Works, an invented contract manufacturer with three SMT lines. */
export const DEMO_LINES = [
	{ code: 'SMT-1', name: 'Line 1 · fine pitch' },
	{ code: 'SMT-2', name: 'Line 2 · high mix' },
	{ code: 'SMT-3', name: 'Line 3 · prototypes' }
];

export const DEMO_PRODUCTS = [
	{ code: 'PB-100', name: 'Pump controller board' },
	{ code: 'SH-220', name: 'Sensor hub' },
	{ code: 'LM-48', name: 'LED matrix driver' }
];

/** Seed only a database with no users at all; returns whether anything was added. */
export async function seedDemoData(db: Db): Promise<boolean> {
	const userCount =
		db
			.select({ n: sql<number>`count(*)` })
			.from(users)
			.get()?.n ?? 0;
	if (userCount > 0) return false;
	const site = db
		.insert(sites)
		.values({ code: 'FMW', name: 'Fenmoor Works', timeZone: 'Europe/Berlin' })
		.onConflictDoNothing()
		.returning()
		.get();
	for (const line of DEMO_LINES) {
		db.insert(lines)
			.values({ ...line, siteId: site?.id ?? null })
			.onConflictDoNothing()
			.run();
	}
	for (const product of DEMO_PRODUCTS) {
		db.insert(products).values(product).onConflictDoNothing().run();
	}
	for (const user of DEMO_USERS) await createUser(db, user, null);
	seedDemoStencils(db);
	seedDemoPrintlog(db);
	await seedDemoSpi(db);
	await seedDemoSpc(db);
	await seedDemoAnalysis(db);
	seedDemoProductFit(db);
	return true;
}
