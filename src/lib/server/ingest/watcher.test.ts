import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { copyFileSync, existsSync, mkdirSync, readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { openTestDatabase } from '../testing';
import { ingestSpiFile } from './ingest-service';
import { startSpiWatcher, type SpiFolderWatcher } from './watcher';

const FIXTURES = 'tests/fixtures/spi';
let t: ReturnType<typeof openTestDatabase>;
let watcher: SpiFolderWatcher | null = null;
let dir: string;

beforeEach(() => {
	t = openTestDatabase();
	dir = join(t.dir, 'watch');
	mkdirSync(dir);
});
afterEach(async () => {
	await watcher?.close();
	watcher = null;
	t.close();
});

const count = (sql: string) => t.db.$client.prepare(sql).pluck().get() as number;

/** Wait until `check` holds (the watcher works on its own schedule), at most `ms`. */
async function until(check: () => boolean, ms = 30000): Promise<void> {
	const end = Date.now() + ms;
	while (!check()) {
		if (Date.now() > end) throw new Error('timed out waiting for the watcher');
		await new Promise((r) => setTimeout(r, 50));
	}
	await watcher?.idle();
}

describe('startSpiWatcher', { timeout: 60_000 }, () => {
	it('imports a good file to done/, a bad one to rejected/ with an error report', async () => {
		watcher = startSpiWatcher(t.db, { dir, stableMs: 100, log: () => {} });
		await watcher.ready;
		copyFileSync(join(FIXTURES, 'good-canonical.csv'), join(dir, 'good.csv'));
		copyFileSync(join(FIXTURES, 'non-numeric.csv'), join(dir, 'bad.csv'));
		await until(
			() =>
				existsSync(join(dir, 'done', 'good.csv')) && existsSync(join(dir, 'rejected', 'bad.csv'))
		);
		expect(readdirSync(dir).filter((f) => f.endsWith('.csv'))).toEqual([]);
		const report = readFileSync(join(dir, 'rejected', 'bad.csv.errors.txt'), 'utf8');
		expect(report).toMatch(/rejected .*nothing of it was stored/);
		expect(report).toMatch(/row \d+, column "/);
		expect(
			count(`select count(*) from spi_imports where source = 'watch' and status = 'imported'`)
		).toBe(1);
		expect(
			count(`select count(*) from spi_imports where source = 'watch' and status = 'rejected'`)
		).toBe(1);
	});

	it('after a restart, a file imported but not moved is recognised and not stored twice', async () => {
		const path = join(dir, 'left-behind.csv');
		copyFileSync(join(FIXTURES, 'good-canonical.csv'), path);
		const { createReadStream } = await import('node:fs');
		const first = await ingestSpiFile(t.db, {
			source: 'watch',
			fileName: 'left-behind.csv',
			body: createReadStream(path),
			createdBy: 'system'
		});
		expect(first.status).toBe('imported');
		const pads = count('select count(*) from spi_pad_measurements');
		watcher = startSpiWatcher(t.db, { dir, stableMs: 100, log: () => {} });
		await until(() => existsSync(join(dir, 'done', 'left-behind.csv')));
		expect(count('select count(*) from spi_pad_measurements')).toBe(pads);
		expect(readFileSync(join(dir, 'done', 'left-behind.csv.errors.txt'), 'utf8')).toContain(
			`same content as SPI import ${first.id}`
		);
	});
});
