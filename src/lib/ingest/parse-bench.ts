/**
 * Micro-benchmark of SPI parsing + validation (not a test). Generates 1,000,000 canonical rows
 * in memory (≈ 90 MB as UTF-8), feeds them to `createSpiRowParser` in 64 KiB byte chunks as a
 * file stream would, and prints rows/s (wall clock, and per CPU-second, which is steadier when
 * other jobs share the machine). Target: ≥ 600 000 rows/s for parse + validate.
 * Run: `npx tsx src/lib/ingest/parse-bench.ts [rows]`; with
 * `node --expose-gc --import tsx src/lib/ingest/parse-bench.ts` it also prints the heap the
 * parser still holds after `end()` (should stay small: boards only, not the file).
 */
import { createSpiRowParser } from './spi-row-parser';
import { CANONICAL_PROFILE } from './mapping-profile';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result,stencil,print_run\n';
const PADS_PER_BOARD = 1000;
const CHUNK_BYTES = 65536;

/** Deterministic pseudo-random numbers (mulberry32) so every run parses the same file. */
function mulberry32(seed: number): () => number {
	let a = seed;
	return () => {
		a = (a + 0x6d2b79f5) | 0;
		let t = Math.imul(a ^ (a >>> 15), 1 | a);
		t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/** Build the benchmark file as UTF-8 byte chunks. */
function generateChunks(rows: number): Uint8Array[] {
	const random = mulberry32(42);
	const encoder = new TextEncoder();
	const chunks: Uint8Array[] = [];
	let text = HEADER;
	const start = Date.UTC(2026, 2, 2, 6, 0, 0);
	for (let i = 0; i < rows; i++) {
		const board = Math.floor(i / PADS_PER_BOARD);
		const pad = i % PADS_PER_BOARD;
		const serial = `RB-BENCH-${String(board).padStart(6, '0')}`;
		const time = new Date(start + board * 20_000).toISOString();
		const volume = (100 + (random() - 0.5) * 30).toFixed(2);
		const area = (100 + (random() - 0.5) * 20).toFixed(2);
		const height = (120 + (random() - 0.5) * 20).toFixed(1);
		const dx = ((random() - 0.5) * 40).toFixed(1);
		const dy = ((random() - 0.5) * 40).toFixed(1);
		const result = random() < 0.98 ? 'pass' : random() < 0.5 ? 'warn' : 'fail';
		text += `${serial},${time},L1,PB-100,${pad % 4},C${pad >> 1},${(pad & 1) + 1},${volume},${area},${height},${dx},${dy},${result},ST-7,RUN-12\n`;
		if (text.length >= CHUNK_BYTES) {
			chunks.push(encoder.encode(text));
			text = '';
		}
	}
	if (text) chunks.push(encoder.encode(text));
	return chunks;
}

/**
 * Floor for comparison: decode, split lines and fields with String.split, Number() on the five
 * measures, no validation. Shows how much of the cost is Rollbead's checking.
 */
function naiveBaseline(chunks: Uint8Array[]): number {
	const decoder = new TextDecoder();
	let carry = '';
	let rows = 0;
	let checksum = 0;
	let first = true;
	for (const chunk of chunks) {
		const lines = (carry + decoder.decode(chunk, { stream: true })).split('\n');
		carry = lines.pop() as string;
		for (const line of lines) {
			if (first) {
				first = false; // header
				continue;
			}
			const f = line.split(',');
			checksum += Number(f[7]) + Number(f[8]) + Number(f[9]) + Number(f[10]) + Number(f[11]);
			rows++;
		}
	}
	return checksum > 0 ? rows : -1; // using the checksum keeps the work from being optimised away
}

function run(): void {
	const rows = Number(process.argv[2] ?? 1_000_000);
	const chunks = generateChunks(rows);
	const bytes = chunks.reduce((s, c) => s + c.length, 0);
	for (let round = 1; round <= 3; round++) {
		const gc = (globalThis as { gc?: () => void }).gc;
		gc?.();
		const heapBefore = process.memoryUsage().heapUsed;
		const parser = createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'bench.csv' });
		let batches = 0;
		const t0 = performance.now();
		const cpu0 = process.cpuUsage();
		for (const chunk of chunks) batches += parser.push(chunk).length;
		batches += parser.end().length;
		const seconds = (performance.now() - t0) / 1000;
		const cpu = process.cpuUsage(cpu0);
		// CPU time (user + system, includes GC threads) is steadier than wall time on a busy host.
		const cpuSeconds = (cpu.user + cpu.system) / 1e6;
		const summary = parser.summary();
		if (!summary.ok || summary.rowsAccepted !== rows) {
			throw new Error(
				`bench file did not parse cleanly: ${JSON.stringify(summary.errors.slice(0, 3))}`
			);
		}
		console.log(
			`round ${round}: Rollbead parser ${rows} rows, ${(bytes / 1e6).toFixed(1)} MB, ${batches} batches, ` +
				`${seconds.toFixed(2)} s wall, ${Math.round(rows / seconds).toLocaleString('en-US')} rows/s; ` +
				`${cpuSeconds.toFixed(2)} s CPU, ${Math.round(rows / cpuSeconds).toLocaleString('en-US')} rows/CPU-s`
		);
		if (gc && round === 1) {
			// What the parser still holds after end() (boards, aggregates), batches dropped. Only
			// the first round is measured: later rounds start from a heap V8 has already sized.
			gc();
			const retainedMb = (process.memoryUsage().heapUsed - heapBefore) / 1e6;
			console.log(`round ${round}: parser retains ${retainedMb.toFixed(1)} MB after end()`);
		}
		const c0 = process.cpuUsage();
		const naiveRows = naiveBaseline(chunks);
		const c = process.cpuUsage(c0);
		const naiveCpu = (c.user + c.system) / 1e6;
		console.log(
			`round ${round}: naive split + Number() baseline ${naiveRows} rows, ` +
				`${Math.round(naiveRows / naiveCpu).toLocaleString('en-US')} rows/CPU-s`
		);
	}
}

run();
