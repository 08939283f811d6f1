/**
 * The SPI benchmark file and the sqlite3 `.import` yardstick, shared by `bench-ingest.ts`
 * (in-process) and `bench-ingest-http.ts` (through a running server).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { createWriteStream, rmSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { once } from 'node:events';

export const PADS_PER_BOARD = 5000;
const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result\n';

export function rowsWanted(): number {
	if (process.env.BENCH_INGEST_GB === '1') return 11_600_000;
	const n = Number(process.env.BENCH_INGEST_ROWS ?? 1_000_000);
	return Math.max(PADS_PER_BOARD, Math.round(n / PADS_PER_BOARD) * PADS_PER_BOARD);
}

/** Small deterministic PRNG (mulberry32), so every run writes the same file. */
function prng(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/**
 * Write the canonical benchmark file; returns its size in bytes. `dayOffset` shifts every
 * inspection by whole days: the same bytes count and values, but other board inspections (and
 * another SHA-256), so one server can import several of them without skipping any as stored.
 */
export async function writeBenchFile(path: string, rows: number, dayOffset = 0): Promise<number> {
	const out = createWriteStream(path);
	const rnd = prng(42);
	const start = Date.parse('2026-03-02T06:00:00Z') + dayOffset * 86_400_000;
	out.write(HEADER);
	const boards = rows / PADS_PER_BOARD;
	for (let b = 0; b < boards; b++) {
		const serial = `FW-PB100-${String(b + 1).padStart(7, '0')}`;
		const at = new Date(start + b * 25_000).toISOString();
		const prefix = `${serial},${at},SMT-1,PB-100,0,`;
		let chunk = '';
		for (let p = 0; p < PADS_PER_BOARD; p++) {
			const refdes = `C${(p >> 1) + 1}`;
			const pad = (p & 1) + 1;
			const vol = (95 + rnd() * 15).toFixed(2);
			const area = (97 + rnd() * 6).toFixed(2);
			const height = (118 + rnd() * 8).toFixed(2);
			const ox = (rnd() * 40 - 20).toFixed(2);
			const oy = (rnd() * 40 - 20).toFixed(2);
			const result = rnd() < 0.002 ? 'fail' : rnd() < 0.01 ? 'warn' : 'pass';
			chunk += `${prefix}${refdes},${pad},${vol},${area},${height},${ox},${oy},${result}\n`;
		}
		if (!out.write(chunk)) await once(out, 'drain');
	}
	out.end();
	await once(out, 'finish');
	return statSync(path).size;
}

export function hasSqlite3(): boolean {
	return spawnSync('sqlite3', ['-version']).status === 0;
}

export const NO_SQLITE3 =
	'sqlite3 command-line tool not found: no .import comparison (Debian: sudo apt-get install -y sqlite3)';

/** Seconds sqlite3's own `.import` takes to load `csv` into a fresh untyped table. */
export function sqliteImportSeconds(csv: string, dir: string): number {
	const db = join(dir, 'plain.db');
	rmSync(db, { force: true }); // a fresh table each time (an existing one would take the header as data)
	const t0 = performance.now();
	execFileSync('sqlite3', [db, '.mode csv', `.import ${csv} t`]);
	const seconds = (performance.now() - t0) / 1000;
	rmSync(db, { force: true });
	return seconds;
}

export const listSeconds = (xs: number[]) => xs.map((x) => x.toFixed(2)).join(', ');
