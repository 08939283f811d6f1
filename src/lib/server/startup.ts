import { DatabaseOpenError, getDb } from './db';
import { seedDemoData } from './seed';

/**
 * Everything the server needs before it answers: the database (migrations applied), demo data on
 * an empty database unless ROLLBEAD_DEMO=0, and background services.
 */
export async function startServices(): Promise<void> {
	let db;
	try {
		db = getDb();
	} catch (err) {
		if (err instanceof DatabaseOpenError) {
			console.error(`[rollbead] ${err.message}`);
			process.exit(1);
		}
		throw err;
	}
	if (process.env.ROLLBEAD_DEMO !== '0') {
		const seeded = await seedDemoData(db);
		if (seeded) console.log('[rollbead] empty database: demo data added (ROLLBEAD_DEMO=0 turns this off)');
	}
}
