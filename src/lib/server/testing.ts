import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openDatabase, type Db } from './db';

/** A fresh migrated database in a temporary folder, for tests of server modules. */
export function openTestDatabase(): { db: Db; dir: string; close: () => void } {
	const dir = mkdtempSync(join(tmpdir(), 'rollbead-test-'));
	const db = openDatabase(join(dir, 'test.db'));
	return {
		db,
		dir,
		close: () => {
			db.$client.close();
			// A background checkpoint thread may still hold the file for a moment after an import.
			rmSync(dir, { recursive: true, force: true, maxRetries: 10, retryDelay: 50 });
		}
	};
}
