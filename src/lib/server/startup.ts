import { DatabaseOpenError, getDb } from './db';
import { seedDemoData } from './seed';
import { cleanArchiveTemp, recoverInterruptedImports, startSpiWatcher } from './ingest';
import { warmParserThread } from './ingest/parse-driver';
import { startLiveOverview } from './floor/live';
import { startSignalEscalation } from './floor/signal-owners';
import { startCfxFromEnv } from './cfx/receiver';
import { backupScheduleFrom, startBackupSchedule } from './backup';
import { siteFloorSettings } from './floor/floor-settings';
import { siteShiftSettings } from './floor/shift-settings';

/**
 * Everything the server needs before it answers: the database (migrations applied), the rows of
 * interrupted SPI imports removed, demo data on an empty database unless ROLLBEAD_DEMO=0, and
 * background services.
 */
export async function startServices(): Promise<void> {
	checkSiteSettings();
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
	// Before anything imports: an import cut short by a stopped server leaves rows no reader sees.
	const interrupted = await recoverInterruptedImports(db);
	if (interrupted > 0)
		console.log(`[rollbead] removed the partial rows of ${interrupted} interrupted SPI import(s)`);
	if (process.env.ROLLBEAD_DEMO !== '0') {
		const seeded = await seedDemoData(db);
		if (seeded)
			console.log('[rollbead] empty database: demo data added (ROLLBEAD_DEMO=0 turns this off)');
	}
	startSpiServices(db);
	// The live overview listens to floor events from the start; overdue signals escalate by mail.
	startLiveOverview(db);
	startSignalEscalation(db);
	startScheduledBackups(db);
	startCfxServices(db);
}

/** IPC-CFX machine messages over AMQP 1.0, only when CFX_URL is set; a malformed value stops the start. */
function startCfxServices(db: ReturnType<typeof getDb>): void {
	let cfx;
	try {
		cfx = startCfxFromEnv(db);
	} catch (err) {
		console.error(`[rollbead] cfx: ${(err as Error).message}`);
		process.exit(1);
	}
	const receiver = cfx;
	if (receiver) process.once('sveltekit:shutdown', () => void receiver.stop());
}

/** BACKUP_EVERY / BACKUP_DIR / BACKUP_KEEP (see $lib/server/backup); a malformed value stops the start. */
function startScheduledBackups(db: ReturnType<typeof getDb>): void {
	let schedule;
	try {
		schedule = backupScheduleFrom(process.env, db.$client.name);
	} catch (err) {
		console.error(`[rollbead] ${(err as Error).message}`);
		process.exit(1);
	}
	if (!schedule) return;
	const stop = startBackupSchedule(db.$client, schedule);
	console.log(
		`[rollbead] backing up to ${schedule.dir} every ${schedule.everyMs / 60_000} min, keeping ${schedule.keep}`
	);
	process.once('sveltekit:shutdown', stop);
}

/**
 * SPI ingest: clear temp files of an interrupted import; start the parser thread, so the first
 * large file does not wait for it; watch SPI_WATCH_DIR when set.
 */
function startSpiServices(db: ReturnType<typeof getDb>): void {
	cleanArchiveTemp(db.$client.name);
	void warmParserThread();
	const dir = process.env.SPI_WATCH_DIR?.trim();
	if (!dir) return;
	const watcher = startSpiWatcher(db, { dir, profile: process.env.SPI_WATCH_PROFILE ?? null });
	console.log(`[rollbead] watching ${dir} for SPI exports (done/ and rejected/ beside them)`);
	process.once('sveltekit:shutdown', () => void watcher.close());
}

/** A malformed site setting stops the start with the variable named, before anything answers. */
function checkSiteSettings(): void {
	try {
		siteFloorSettings();
		siteShiftSettings();
	} catch (err) {
		console.error(`[rollbead] ${err instanceof Error ? err.message : String(err)}`);
		process.exit(1);
	}
}
