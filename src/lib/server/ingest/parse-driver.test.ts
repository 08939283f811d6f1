import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { CANONICAL_PROFILE, type SpiParseLimits } from '$lib/ingest';
import { openArchiveWriter } from './archive';
import { parseMemoryMb, threadedParseDriver, type ParseDriver } from './parse-driver';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result\n';

/** `boards` one-pad board inspections as 64 KiB-ish byte chunks. */
function onePadBoards(boards: number): Uint8Array[] {
	const chunks: Uint8Array[] = [new TextEncoder().encode(HEADER)];
	let text = '';
	for (let i = 0; i < boards; i++) {
		text += `RB-MEM-${i},2026-03-02T08:00:00Z,L1,PB-100,0,C1,1,100,100,120,0,0,pass\n`;
		if (text.length > 65_000) {
			chunks.push(new TextEncoder().encode(text));
			text = '';
		}
	}
	chunks.push(new TextEncoder().encode(text));
	return chunks;
}

const dirs: string[] = [];
afterEach(() => {
	for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true });
});

function archive() {
	const dir = mkdtempSync(join(tmpdir(), 'rollbead-driver-'));
	dirs.push(dir);
	return { dir, writer: openArchiveWriter(join(dir, 'test.db')) };
}

/** Feed chunks as the ingest service does (a few in flight), then end, summary and digest. */
async function run(driver: ParseDriver, chunks: Uint8Array[]) {
	let rows = 0;
	const inFlight: Promise<{ length: number }[]>[] = [];
	for (const chunk of chunks) {
		inFlight.push(driver.push(chunk));
		while (inFlight.length > 2) for (const b of await inFlight.shift()!) rows += b.length;
	}
	while (inFlight.length > 0) for (const b of await inFlight.shift()!) rows += b.length;
	for (const b of await driver.end()) rows += b.length;
	const summary = await driver.summary();
	const sha256 = await driver.digest();
	await driver.close();
	return { rows, summary, sha256 };
}

const sha = (chunks: Uint8Array[]) => {
	const h = createHash('sha256');
	for (const c of chunks) h.update(c);
	return h.digest('hex');
};

describe('parser thread memory ceiling', { timeout: 120_000 }, () => {
	it('a file that outgrows the thread ends the thread, not the server: rejected, archived whole, next file parses', async () => {
		// 400,000 one-pad boards with the board budget lifted: ~550 MB of board records, far over
		// a 64 MB heap.
		const chunks = onePadBoards(400_000);
		const limits: SpiParseLimits = { maxLineBytes: 1024 * 1024, maxColumns: 1000, maxBoards: 1e9 };
		const first = archive();
		const driver = await threadedParseDriver(
			{ profile: CANONICAL_PROFILE, fileName: 'many.csv', archiveFd: first.writer.fd, limits },
			60_000,
			64
		);
		expect(driver?.threaded).toBe(true);
		const outcome = await run(driver!, chunks);
		expect(outcome.summary).toMatchObject({ ok: false, boards: [], errorCount: 1 });
		expect(outcome.summary.errors).toEqual([
			{
				row: 0,
				column: null,
				message:
					"reading this file needed more than the parser's memory limit of 64 MB (SPI_PARSE_MEMORY_MB) and was stopped; nothing was imported. Split the export, or raise the limit"
			}
		]);
		// The archive copy and its hash cover every byte, including chunks the thread never saw.
		expect(outcome.sha256).toBe(sha(chunks));
		const stored = first.writer.commit(outcome.sha256);
		expect(
			createHash('sha256')
				.update(readFileSync(join(first.dir, stored)))
				.digest('hex')
		).toBe(outcome.sha256);

		// The next file gets a working thread.
		const good = onePadBoards(50);
		const second = archive();
		const next = await threadedParseDriver(
			{ profile: CANONICAL_PROFILE, fileName: 'next.csv', archiveFd: second.writer.fd },
			60_000
		);
		const nextOutcome = await run(next!, good);
		expect(nextOutcome.summary).toMatchObject({ ok: true, rowsAccepted: 50, errorCount: 0 });
		expect(nextOutcome.rows).toBe(50);
		expect(nextOutcome.sha256).toBe(sha(good));
		second.writer.discard();
	});
});

describe('parseMemoryMb', () => {
	it('reads SPI_PARSE_MEMORY_MB as whole MB of at least 64, else 512', () => {
		expect(parseMemoryMb({})).toBe(512);
		expect(parseMemoryMb({ SPI_PARSE_MEMORY_MB: '1024' })).toBe(1024);
		for (const raw of ['32', '1e3', '0x400', '-1', 'lots']) {
			expect(parseMemoryMb({ SPI_PARSE_MEMORY_MB: raw })).toBe(512);
		}
	});
});
