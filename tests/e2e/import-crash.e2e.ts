import { expect, test } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { once } from 'node:events';
import { freePort, makeTokenIn } from '../../scripts/lib/own-server';
import { integrityCheck, spiCounts, uploadPaced, writeSpiFile } from '../../scripts/lib/spi-load';
import { ownServersPerTest } from './own-servers';

// `kill -9` of a server in the middle of a large SPI import: nothing of it may show, the database
// stays sound, and the same file imports whole afterwards (README, SPI inspection data).
test.describe.configure({ timeout: 300_000 });

const own = ownServersPerTest('rollbead-crash-');

test('a server killed mid-import comes back with no partial import; the file then imports whole', async () => {
	const dir = own.folder();
	const databaseFile = join(dir, 'rollbead.db');
	const port = await freePort();
	const token = makeTokenIn(databaseFile, 'quality');

	// 1,500 boards × 200 pads = 300,000 rows (~29 MB): parsed on the worker thread.
	const bigFile = join(dir, 'line-2-shift.csv');
	await writeSpiFile(bigFile, 1_500, 200, 'FW-CRASH');
	const bytes = readFileSync(bigFile);
	const smallFile = join(dir, 'earlier.csv');
	await writeSpiFile(smallFile, 4, 50, 'FW-EARLIER');

	let server = await own.start({ databaseFile, port, demo: false });
	const earlier = await fetch(`${server.url}/api/spi/imports?fileName=earlier.csv`, {
		method: 'POST',
		headers: { authorization: `Bearer ${token}`, 'content-type': 'text/csv' },
		body: readFileSync(smallFile)
	});
	expect(earlier.status).toBe(201);
	const before = spiCounts(databaseFile);
	expect(before).toMatchObject({ boards: 4, visibleMeasurements: 200, importing: 0 });

	// Send the first 60 % of the file, wait until the server has committed chunks of it, then kill.
	const live = server;
	let killedAt = -1;
	const upload = uploadPaced(server.url, token, bytes, 'line-2-shift.csv', {
		pieceBytes: 256 * 1024,
		pauseMs: 0,
		onPiece: async (sent) => {
			if (killedAt >= 0 || sent < bytes.length * 0.6) return;
			const deadline = Date.now() + 60_000;
			while (spiCounts(databaseFile).allMeasurements <= before.allMeasurements) {
				if (Date.now() > deadline) throw new Error('no chunk was committed');
				await new Promise((r) => setTimeout(r, 50));
			}
			const during = spiCounts(databaseFile);
			// Chunks are on disk, but no reader can reach them and nothing is listed as imported.
			expect(during).toMatchObject({
				boards: before.boards,
				padDictionary: before.padDictionary,
				visibleMeasurements: before.visibleMeasurements,
				imported: 1,
				importing: 1
			});
			killedAt = sent;
			live.child.kill('SIGKILL');
			await new Promise((r) => live.child.once('exit', r));
		}
	});
	await expect(upload.done).rejects.toThrow();
	expect(killedAt).toBeGreaterThan(0);
	if (live.child.exitCode === null && live.child.signalCode === null)
		await once(live.child, 'exit');
	expect(live.child.signalCode).toBe('SIGKILL');

	// Restart on the same database: start-up removes what the killed import left.
	server = await own.start({ databaseFile, port, demo: false });
	expect(integrityCheck(databaseFile)).toBe('ok');
	expect(spiCounts(databaseFile)).toEqual({ ...before, importing: 0 });
	const listed = await fetch(`${server.url}/api/spi/imports`, {
		headers: { authorization: `Bearer ${token}` }
	});
	const { imports } = (await listed.json()) as {
		imports: { fileName: string; status: string; errors?: unknown }[];
	};
	const cut = imports.filter((i) => i.fileName === 'line-2-shift.csv');
	expect(cut.map((i) => i.status)).toEqual(['rejected']);
	expect(imports.filter((i) => i.status === 'imported').map((i) => i.fileName)).toEqual([
		'earlier.csv'
	]);

	// The same file again: imported whole.
	const again = await fetch(`${server.url}/api/spi/imports?fileName=line-2-shift.csv`, {
		method: 'POST',
		headers: { authorization: `Bearer ${token}`, 'content-type': 'text/csv' },
		body: bytes
	});
	expect(again.status).toBe(201);
	expect(await again.json()).toMatchObject({
		status: 'imported',
		boards: 1_500,
		pads: 300_000,
		duplicateBoards: 0
	});
	expect(spiCounts(databaseFile)).toMatchObject({
		boards: before.boards + 1_500,
		visibleMeasurements: before.visibleMeasurements + 300_000,
		allMeasurements: before.allMeasurements + 300_000,
		imported: 2,
		importing: 0
	});
	expect(integrityCheck(databaseFile)).toBe('ok');
});
