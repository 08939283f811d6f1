/**
 * SPI ingest benchmark (figures printed, never asserted): `npm run bench:ingest`.
 *
 * Generates its own canonical file (200 boards × 5,000 pads = 1,000,000 rows, ~90 MB) in a temp
 * folder, ingests it through the same service the API uses (`ingestSpiFile`: parse, validate,
 * insert, aggregates, archive) into a fresh database, and prints rows/s end to end, peak RSS,
 * database bytes per pad row (dbstat), and — when the `sqlite3` command-line tool exists — the
 * time of sqlite3's own `.import` of the same file into an untyped table, with the ratio.
 *
 * BENCH_INGEST_ROWS=N changes the row count (multiple of 5,000); BENCH_INGEST_GB=1 runs the
 * ~1 GB variant (about 11.6 M rows) for the memory check instead. BENCH_INGEST_REPEAT=N times
 * Rollbead and sqlite3 in turn N times (default 3; 1 for the 1 GB file) and compares medians.
 * `npm run bench:ingest -- --http` (or `npm run bench:ingest:http`) sends the file to the built
 * server over HTTP instead (scripts/bench-ingest-http.ts).
 */
import { createReadStream, mkdtempSync, rmSync, statSync } from 'node:fs';
import { cpus, tmpdir, totalmem } from 'node:os';
import { join } from 'node:path';
import { openDatabase } from '../src/lib/server/db';
import { ingestSpiFile } from '../src/lib/server/ingest/ingest-service';
import { warmParserThread } from '../src/lib/server/ingest/parse-driver';
import {
	NO_SQLITE3,
	hasSqlite3,
	listSeconds,
	rowsWanted,
	sqliteImportSeconds,
	writeBenchFile
} from './bench-ingest-file';
import { median } from './lib/figures';

async function main() {
	const rows = rowsWanted();
	const dir = mkdtempSync(join(tmpdir(), 'rollbead-bench-ingest-'));
	try {
		const csv = join(dir, 'spi.csv');
		process.stdout.write(`generating ${rows.toLocaleString('en')} rows … `);
		const bytes = await writeBenchFile(csv, rows);
		console.log(`${(bytes / 1e6).toFixed(1)} MB`);

		const dbFile = join(dir, 'bench.db');
		const db = openDatabase(dbFile);
		// The server starts its parser thread at start-up (startup.ts); so does the benchmark, so the
		// figures do not include loading the thread's code (seconds under tsx, not in the built app).
		await warmParserThread();
		global.gc?.();
		const baseRss = process.memoryUsage().rss;
		let peakRss = baseRss;
		let atPeak = process.memoryUsage();
		const sampler = setInterval(() => {
			const m = process.memoryUsage();
			if (m.rss > peakRss) atPeak = m;
			peakRss = Math.max(peakRss, m.rss);
		}, 20);
		const cpu0 = process.cpuUsage();
		const t0 = performance.now();
		const outcome = await ingestSpiFile(db, {
			source: 'api',
			fileName: 'bench.csv',
			body: createReadStream(csv, { highWaterMark: 1 << 20 }),
			totalBytes: bytes,
			createdBy: 'system'
		});
		const seconds = (performance.now() - t0) / 1000;
		const cpu = process.cpuUsage(cpu0);
		const cpuSeconds = (cpu.user + cpu.system) / 1e6;
		clearInterval(sampler);
		peakRss = Math.max(peakRss, process.memoryUsage().rss);
		if (outcome.status !== 'imported') {
			console.error('ingest did not import:', outcome);
			process.exit(1);
		}
		const pads = outcome.pads;
		let tableBytes = NaN;
		try {
			tableBytes = db.$client
				.prepare(`select sum(pgsize) from dbstat where name = 'spi_pad_measurements'`)
				.pluck()
				.get() as number;
		} catch {
			// dbstat not compiled in: fall back to the file size below.
		}
		db.$client.pragma('wal_checkpoint(TRUNCATE)');
		const fileBytes = statSync(dbFile).size;
		db.$client.close();

		console.log(
			`machine: ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}, ${(totalmem() / 2 ** 30).toFixed(1)} GiB, node ${process.version}`
		);
		console.log(
			`ingest (parse, validate, insert, aggregates, archive): ${seconds.toFixed(2)} s, parser on ${outcome.threaded ? 'a worker thread' : 'the main thread'}`
		);
		console.log(`rows/s end to end: ${Math.round(pads / seconds).toLocaleString('en')}`);
		console.log(
			`CPU time of this process: ${cpuSeconds.toFixed(2)} s (${Math.round(pads / cpuSeconds).toLocaleString('en')} rows per CPU-second; steadier than wall time on a shared machine)`
		);
		console.log(`boards: ${outcome.boards}, pad rows: ${pads.toLocaleString('en')}`);
		console.log(
			`peak RSS: ${(peakRss / 2 ** 20).toFixed(0)} MiB, ${((peakRss - baseRss) / 2 ** 20).toFixed(0)} MiB above the ${(baseRss / 2 ** 20).toFixed(0)} MiB before the ingest (maxRSS ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MiB; at the peak: JS heap ${(atPeak.heapTotal / 2 ** 20).toFixed(0)} MiB, array buffers ${(atPeak.arrayBuffers / 2 ** 20).toFixed(0)} MiB, the rest (code, SQLite cache, the parser thread) ${((atPeak.rss - atPeak.heapTotal - atPeak.arrayBuffers) / 2 ** 20).toFixed(0)} MiB)`
		);
		console.log(
			`bytes per pad row: ${(tableBytes / pads).toFixed(1)} (spi_pad_measurements incl. its key, dbstat); whole database file ${(fileBytes / pads).toFixed(1)}`
		);
		if (hasSqlite3()) {
			// The two are timed in turn, several times, so a change in the machine's speed during
			// the run (a shared VM) touches both alike; medians are compared.
			const repeats = Math.max(
				1,
				Number(process.env.BENCH_INGEST_REPEAT ?? (rows > 2_000_000 ? 1 : 3))
			);
			const ours = [seconds];
			const theirs = [sqliteImportSeconds(csv, dir)];
			for (let r = 1; r < repeats; r++) {
				const again = openDatabase(join(dir, `again-${r}.db`));
				const t = performance.now();
				const o = await ingestSpiFile(again, {
					source: 'api',
					fileName: 'bench.csv',
					body: createReadStream(csv, { highWaterMark: 1 << 20 }),
					totalBytes: bytes,
					createdBy: 'system'
				});
				ours.push((performance.now() - t) / 1000);
				if (o.status !== 'imported') throw new Error(`repeat ${r} did not import: ${o.status}`);
				again.$client.close();
				theirs.push(sqliteImportSeconds(csv, dir));
			}
			const mid = median;
			const list = listSeconds;
			console.log(
				`sqlite3 .import of the same file (untyped table): ${list(theirs)} s, median ${mid(theirs).toFixed(2)} s = ${Math.round(rows / mid(theirs)).toLocaleString('en')} rows/s`
			);
			console.log(
				`Rollbead, timed in turn with it: ${list(ours)} s, median ${mid(ours).toFixed(2)} s = ${Math.round(rows / mid(ours)).toLocaleString('en')} rows/s; ratio of medians Rollbead/sqlite3 = ${(mid(ours) / mid(theirs)).toFixed(2)}`
			);
		} else {
			console.log(NO_SQLITE3);
		}
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
}

// `-- --http`: the same file through a running server and a real HTTP client (bench-ingest-http.ts).
if (process.argv.includes('--http'))
	import('./bench-ingest-http')
		.then((m) => m.runHttpBench())
		.catch((err) => {
			console.error(err);
			process.exitCode = 1;
		});
else void main();
