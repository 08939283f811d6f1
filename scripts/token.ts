/**
 * Command-line API tokens against the configured database (DATABASE_URL):
 *   npm run token -- create --name NAME --role ROLE [--days N]   prints the token alone on the last line
 *   npm run token -- list
 *   npm run token -- revoke --id ID
 */
import { parseArgs } from 'node:util';
import { isRole, ROLES } from '../src/lib/access';
import {
	closeDb,
	DatabaseOpenError,
	databasePath,
	openDatabase,
	type Db
} from '../src/lib/server/db';
import {
	createApiToken,
	DEFAULT_TOKEN_DAYS,
	listApiTokens,
	MAX_TOKEN_DAYS,
	revokeApiToken
} from '../src/lib/server/tokens';

const USAGE = `Usage:
  npm run token -- create --name NAME --role ROLE [--days N]   (roles: ${ROLES.join(', ')}; valid N days, default ${DEFAULT_TOKEN_DAYS})
  npm run token -- list
  npm run token -- revoke --id ID`;

function fail(message: string): never {
	console.error(`error: ${message}`);
	process.exit(1);
}

function main(): void {
	let parsed;
	try {
		parsed = parseArgs({
			allowPositionals: true,
			options: {
				name: { type: 'string' },
				role: { type: 'string' },
				id: { type: 'string' },
				days: { type: 'string' }
			}
		});
	} catch (err) {
		fail(`${(err as Error).message}\n${USAGE}`);
	}
	const [command] = parsed.positionals;
	const { name, role, id, days } = parsed.values;
	if (!command) fail(`no command given.\n${USAGE}`);

	let db: Db;
	try {
		db = openDatabase(databasePath());
	} catch (err) {
		if (err instanceof DatabaseOpenError) fail(err.message);
		throw err;
	}
	try {
		if (command === 'create') {
			const trimmedName = name?.trim();
			if (!trimmedName) fail(`--name is required.\n${USAGE}`);
			if (trimmedName.length > 80) fail('--name must be at most 80 characters.');
			if (!isRole(role)) fail(`--role must be one of: ${ROLES.join(', ')} (got "${role ?? ''}").`);
			const expiresInDays = days === undefined ? DEFAULT_TOKEN_DAYS : Number(days);
			if (!/^\d+$/.test(days ?? '90') || expiresInDays < 1 || expiresInDays > MAX_TOKEN_DAYS) {
				fail(`--days must be a whole number from 1 to ${MAX_TOKEN_DAYS} (got "${days}").`);
			}
			const created = createApiToken(db, { name: trimmedName, role, expiresInDays }, null);
			console.log(
				`Token "${created.name}" (role ${created.role}, id ${created.id}, valid until ${created.expiresAt.toISOString()}) for ${databasePath()}.`
			);
			console.log('It is shown once; Rollbead keeps only its hash.');
			console.log(created.token);
		} else if (command === 'list') {
			for (const t of listApiTokens(db)) {
				const status = t.revokedAt
					? `revoked ${t.revokedAt.toISOString()}`
					: t.expiresAt && t.expiresAt.getTime() <= Date.now()
						? `expired ${t.expiresAt.toISOString()}`
						: `active until ${t.expiresAt?.toISOString() ?? 'never'}`;
				console.log(`${t.id}\t${t.prefix}…\t${t.role}\t${status}\t${t.name}`);
			}
		} else if (command === 'revoke') {
			const tokenId = Number(id);
			if (!Number.isSafeInteger(tokenId) || tokenId <= 0)
				fail('--id must be a token id (see list).');
			if (!revokeApiToken(db, tokenId, null)) fail(`no active token with id ${tokenId}.`);
			console.log(`Token ${tokenId} revoked.`);
		} else {
			fail(`unknown command "${command}".\n${USAGE}`);
		}
	} finally {
		closeDb();
		db.$client.close();
	}
}

main();
