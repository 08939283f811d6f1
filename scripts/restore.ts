/**
 * npm run restore -- FILE
 * Replace the database (DATABASE_URL) with a backup, only after the backup passes PRAGMA
 * integrity_check and is a Rollbead database. The current database is first kept beside it as
 * <name>.before-restore-<UTC time>.db. Stop Rollbead first; start it again afterwards (it applies
 * any newer migrations and removes the rows of an import the backup caught half-way).
 */
import { parseArgs } from 'node:util';
import { databasePath } from '../src/lib/server/db';
import { checkDatabaseFile, restoreDatabase, RestoreRefusedError } from '../src/lib/server/backup';

async function main(): Promise<void> {
	const { positionals } = parseArgs({ allowPositionals: true, options: {} });
	const [file] = positionals;
	if (!file || positionals.length !== 1) {
		console.error('Usage: npm run restore -- FILE   (stop Rollbead first)');
		process.exit(1);
	}
	const check = checkDatabaseFile(file);
	if (!check.ok) {
		console.error(
			`error: ${file} was not restored: ${check.problems.join('; ')}. Nothing was changed.`
		);
		process.exit(1);
	}
	const target = databasePath();
	const result = await restoreDatabase(file, target);
	console.log(
		`Restored ${file}\n  into ${result.restored}\n  integrity_check ok; ${check.migrations} migrations; ` +
			`${check.counts.users} users, ${check.counts.audit_log} audit entries, ${check.counts.spi_boards ?? 0} SPI boards` +
			(result.previousKeptAs
				? `\n  the database it replaced is kept as ${result.previousKeptAs}`
				: '')
	);
}

main().catch((err) => {
	console.error(
		`error: ${(err as Error).message}${err instanceof RestoreRefusedError ? ' Nothing was changed.' : ''}`
	);
	process.exit(1);
});
