/**
 * SPI ingest through the real server (figures printed, never asserted):
 * `npm run bench:ingest:http` or `npm run bench:ingest -- --http`.
 *
 * Builds when sources changed (under the shared e2e lock) and copies the build to a temp folder,
 * so another build cannot change it underneath; starts it (`server.js`) on a free port with its own
 * temp database (ROLLBEAD_DEMO=0) and an API token made by scripts/token.ts; then uploads the
 * canonical 1,000,000-row file (bench-ingest-file.ts) with node's http client streaming it from
 * disk, once as multipart/form-data and once as a raw text/csv body per round (`--mode chunked`:
 * raw without a content-length, as Transfer-Encoding: chunked), each timed in
 * turn with sqlite3's own `.import` of the same file. Prints the medians and their ratio, the
 * server's CPU time per import and its peak RSS (VmHWM in /proc/<pid>/status).
 *
 * Each upload is its own file (the inspections shifted by whole days, same size and values), so
 * none is skipped as already stored. Options: `--repeat N` (or BENCH_INGEST_REPEAT, default 3)
 * rounds; `--mode multipart,raw,chunked` (a list; `both` = multipart,raw, the default; `all`); `--profile` runs the server with `--cpu-prof` and prints
 * where each thread spent its time (profiles kept in the printed folder); `--no-in-process` skips
 * timing `ingestSpiFile` in this process on the same files (which shows what HTTP adds on a
 * machine whose speed changes with other work); `--quiet-wait S` (default 60, 0 = off): before
 * each timing, wait up to S seconds for the machine's CPUs to be nearly idle. BENCH_INGEST_ROWS
 * changes the size as for the in-process benchmark; BENCH_HTTP_BUILD=dir runs that build folder
 * instead (an older commit's, for before/after). The server is stopped on every way out.
 */
import {
	cpSync,
	createReadStream,
	mkdirSync,
	mkdtempSync,
	readdirSync,
	readFileSync,
	rmSync,
	symlinkSync,
	writeFileSync
} from 'node:fs';
import { request as httpRequest } from 'node:http';
import { Session } from 'node:inspector/promises';
import { cpus, loadavg, tmpdir, totalmem } from 'node:os';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { openDatabase, type Db } from '../src/lib/server/db';
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
import {
	ROOT,
	ensureBuild,
	freePort,
	makeTokenIn,
	startServer,
	type OwnServer
} from './lib/own-server';
import { median } from './lib/figures';

type Mode = 'multipart' | 'raw' | 'chunked';

// Interrupted: exit, so startServer's exit hook stops the server.
for (const signal of ['SIGINT', 'SIGTERM'] as const) process.on(signal, () => process.exit(130));

/**
 * Build if needed and copy the build aside, both under the shared lock; or copy the build folder
 * given in BENCH_HTTP_BUILD (e.g. an older commit's, built in a git worktree, for before/after).
 */
function prepareBuild(appDir: string): void {
	const given = process.env.BENCH_HTTP_BUILD;
	if (given) cpSync(given, join(appDir, 'build'), { recursive: true });
	else ensureBuild(join(appDir, 'build'));
	// The copy resolves its packages and module type through these.
	symlinkSync(join(ROOT, 'node_modules'), join(appDir, 'node_modules'));
	cpSync(join(ROOT, 'package.json'), join(appDir, 'package.json'));
}

/** kB figures from /proc/<pid>/status (VmHWM: peak RSS; VmRSS: now). */
function procStatus(pid: number): { hwmKb: number; rssKb: number } {
	const text = readFileSync(`/proc/${pid}/status`, 'utf8');
	const kb = (key: string) => Number(new RegExp(`^${key}:\\s+(\\d+)`, 'm').exec(text)?.[1] ?? NaN);
	return { hwmKb: kb('VmHWM'), rssKb: kb('VmRSS') };
}

/** Context switches of all the process's threads so far (each one a thread that waited). */
function procSwitches(pid: number): number {
	let n = 0;
	for (const tid of readdirSync(`/proc/${pid}/task`)) {
		try {
			const text = readFileSync(`/proc/${pid}/task/${tid}/status`, 'utf8');
			for (const m of text.matchAll(/^(?:non)?voluntary_ctxt_switches:\s+(\d+)/gm))
				n += Number(m[1]);
		} catch {
			// the thread ended meanwhile
		}
	}
	return n;
}

function cpuTicks(): { busy: number; total: number } {
	const f = readFileSync('/proc/stat', 'utf8')
		.split('\n')[0]
		.trim()
		.split(/\s+/)
		.slice(1)
		.map(Number);
	const total = f.reduce((a, b) => a + b, 0);
	return { busy: total - f[3] - (f[4] ?? 0), total }; // minus idle and iowait
}

/**
 * Wait (at most `maxSeconds`) for half a second in which the machine's CPUs are less than 15 %
 * busy, so a timing does not start in the middle of someone else's work on a shared machine.
 * Returns how busy the last half second was.
 */
async function waitForQuiet(maxSeconds: number): Promise<number> {
	const deadline = Date.now() + maxSeconds * 1000;
	for (;;) {
		const a = cpuTicks();
		await new Promise((r) => setTimeout(r, 500));
		const b = cpuTicks();
		const busy = (b.busy - a.busy) / Math.max(1, b.total - a.total);
		if (busy < 0.15 || Date.now() > deadline) return busy;
	}
}

/** CPU seconds (user + system, all threads) the process has used. */
function procCpuSeconds(pid: number): number {
	const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
	const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
	const ticks = Number(fields[11]) + Number(fields[12]); // utime, stime (fields 14, 15)
	return ticks / 100; // USER_HZ is 100 on Linux
}

interface UploadResult {
	seconds: number;
	status: number;
	body: { status?: string; pads?: number; boards?: number; error?: string };
}

/** POST the file streamed from disk, as multipart/form-data or as a raw text/csv body. */
function upload(opts: {
	port: number;
	token: string;
	file: string;
	bytes: number;
	mode: Mode;
}): Promise<UploadResult> {
	const name = `bench-${opts.mode}.csv`;
	const boundary = '----rollbead-bench-7f3a9c';
	const head =
		opts.mode === 'multipart'
			? Buffer.from(
					`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${name}"\r\n` +
						'Content-Type: text/csv\r\n\r\n'
				)
			: Buffer.alloc(0);
	const tail = opts.mode === 'multipart' ? Buffer.from(`\r\n--${boundary}--\r\n`) : Buffer.alloc(0);
	const t0 = performance.now();
	return new Promise((res, rej) => {
		const req = httpRequest(
			{
				host: '127.0.0.1',
				port: opts.port,
				method: 'POST',
				path: opts.mode === 'multipart' ? '/api/spi/imports' : `/api/spi/imports?fileName=${name}`,
				headers: {
					authorization: `Bearer ${opts.token}`,
					'content-type':
						opts.mode === 'multipart' ? `multipart/form-data; boundary=${boundary}` : 'text/csv',
					// chunked: no content-length, so node sends Transfer-Encoding: chunked
					...(opts.mode === 'chunked'
						? {}
						: { 'content-length': String(head.length + opts.bytes + tail.length) })
				}
			},
			(r) => {
				const parts: Buffer[] = [];
				r.on('data', (c: Buffer) => parts.push(c));
				r.on('end', () => {
					const seconds = (performance.now() - t0) / 1000;
					const text = Buffer.concat(parts).toString('utf8');
					let body: UploadResult['body'];
					try {
						body = JSON.parse(text);
					} catch {
						body = { error: text.slice(0, 500) };
					}
					res({ seconds, status: r.statusCode ?? 0, body });
				});
				r.on('error', rej);
			}
		);
		req.on('error', rej);
		if (head.length) req.write(head);
		const file = createReadStream(opts.file, { highWaterMark: 1 << 20 });
		file.on('error', rej);
		file.pipe(req, { end: false });
		file.on('end', () => req.end(tail));
	});
}

/** Self time per function (ms) of one .cpuprofile, the heaviest first. */
function profileSummary(path: string, top: number): string[] {
	const prof = JSON.parse(readFileSync(path, 'utf8')) as {
		nodes: {
			id: number;
			callFrame: { functionName: string; url: string; lineNumber: number };
			hitCount?: number;
		}[];
		samples: number[];
		timeDeltas: number[];
		startTime: number;
		endTime: number;
	};
	const byNode = new Map(prof.nodes.map((n) => [n.id, n]));
	const selfUs = new Map<string, number>();
	for (let i = 0; i < prof.samples.length; i++) {
		const n = byNode.get(prof.samples[i]);
		if (!n) continue;
		const f = n.callFrame;
		const where = f.url
			? `${f.url.replace(/^.*\/(build|node_modules)\//, '$1/')}:${f.lineNumber + 1}`
			: '';
		const key = `${f.functionName || '(anonymous)'} ${where}`.trim();
		selfUs.set(key, (selfUs.get(key) ?? 0) + (prof.timeDeltas[i] ?? 0));
	}
	let total = 0;
	for (const [key, us] of selfUs) if (key !== '(idle)') total += us;
	const lines = [...selfUs]
		.filter(([key]) => key !== '(idle)')
		.sort((a, b) => b[1] - a[1])
		.slice(0, top)
		.map(
			([key, us]) =>
				`  ${(us / 1000).toFixed(0).padStart(7)} ms ${((100 * us) / total).toFixed(1).padStart(5)} %  ${key}`
		);
	return [
		`busy ${(total / 1e6).toFixed(2)} s of ${((prof.endTime - prof.startTime) / 1e6).toFixed(2)} s`,
		...lines
	];
}

/** The same file through `ingestSpiFile` in this process (as `npm run bench:ingest` times it). */
async function ingestInProcess(
	db: Db,
	csv: string,
	bytes: number,
	rows: number
): Promise<{ seconds: number; cpuSeconds: number }> {
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
	if (outcome.status !== 'imported' || outcome.pads !== rows)
		throw new Error(`the in-process ingest answered ${JSON.stringify(outcome).slice(0, 300)}`);
	return { seconds, cpuSeconds: (cpu.user + cpu.system) / 1e6 };
}

export async function runHttpBench(): Promise<void> {
	const { values } = parseArgs({
		args: process.argv.slice(2),
		strict: false,
		options: {
			repeat: { type: 'string' },
			mode: { type: 'string' },
			profile: { type: 'boolean' },
			'quiet-wait': { type: 'string' },
			http: { type: 'boolean' }
		}
	});
	const repeats = Math.max(1, Number(values.repeat ?? process.env.BENCH_INGEST_REPEAT ?? 3) || 3);
	const modeArg = String(values.mode ?? 'both');
	const modes: Mode[] =
		modeArg === 'all'
			? ['multipart', 'raw', 'chunked']
			: modeArg === 'both'
				? ['multipart', 'raw']
				: modeArg.split(',').filter((m): m is Mode => ['multipart', 'raw', 'chunked'].includes(m));
	if (modes.length === 0)
		throw new Error(
			`--mode: multipart, raw, chunked (comma-separated), both or all; got "${modeArg}"`
		);
	const rows = rowsWanted();
	const dir = mkdtempSync(join(tmpdir(), 'rollbead-bench-http-'));
	const profileDir = values.profile ? mkdtempSync(join(tmpdir(), 'rollbead-bench-prof-')) : null;
	const withSqlite = hasSqlite3();
	const withInProcess = !process.argv.includes('--no-in-process');
	const quietSeconds = Math.max(0, Number(values['quiet-wait'] ?? 60) || 0);
	const busyAtStart: number[] = [];
	const quiet = async () => {
		if (quietSeconds > 0) busyAtStart.push(await waitForQuiet(quietSeconds));
	};
	let server: OwnServer | null = null;
	let local: Db | null = null;
	try {
		const appDir = join(dir, 'app');
		mkdirSync(appDir);
		console.log(
			process.env.BENCH_HTTP_BUILD
				? `build from ${process.env.BENCH_HTTP_BUILD}`
				: 'build when sources changed (under the e2e lock), then a copy of it'
		);
		prepareBuild(appDir);
		const databaseUrl = join(dir, 'db', 'bench.db');
		mkdirSync(join(dir, 'db'));
		const token = makeTokenIn(databaseUrl, 'quality', 'bench');
		const port = await freePort();
		server = await startServer({
			databaseFile: databaseUrl,
			port,
			demo: false,
			buildFolder: join(appDir, 'build'),
			nodeArgs: profileDir ? ['--cpu-prof', '--cpu-prof-dir', profileDir] : [],
			env: { ROLLBEAD_MIGRATIONS_DIR: join(ROOT, 'drizzle') }
		});
		const pid = server.child.pid as number;
		const atStart = procStatus(pid);
		console.log(
			`server: server.js with the copied build, pid ${pid}, port ${port}, RSS after start ${(atStart.rssKb / 1024).toFixed(0)} MiB${profileDir ? `, CPU profile to ${profileDir}` : ''}`
		);

		if (withInProcess) {
			mkdirSync(join(dir, 'local'));
			local = openDatabase(join(dir, 'local', 'local.db'));
			await warmParserThread();
		}
		const inProcess: number[] = [];
		const inProcessCpu: number[] = [];
		const ours: Record<Mode, number[]> = { multipart: [], raw: [], chunked: [] };
		const theirs: Record<Mode, number[]> = { multipart: [], raw: [], chunked: [] };
		const serverCpu: Record<Mode, number[]> = { multipart: [], raw: [], chunked: [] };
		let fileNo = 0;
		let bytes = 0;
		for (let r = 0; r < repeats; r++) {
			for (const mode of modes) {
				fileNo++;
				const csv = join(dir, `spi-${fileNo}.csv`);
				bytes = await writeBenchFile(csv, rows, fileNo);
				await quiet();
				const cpu0 = procCpuSeconds(pid);
				const switches0 = procSwitches(pid);
				const result = await upload({ port, token, file: csv, bytes, mode });
				serverCpu[mode].push(procCpuSeconds(pid) - cpu0);
				const switches = procSwitches(pid) - switches0;
				if (result.status !== 201 || result.body.pads !== rows) {
					throw new Error(
						`${mode} upload ${fileNo} answered ${result.status}: ${JSON.stringify(result.body).slice(0, 500)}`
					);
				}
				ours[mode].push(result.seconds);
				if (local) await quiet();
				// With --profile, this thread's profile of the in-process ingest, to set beside the server's.
				const session = local && profileDir ? new Session() : null;
				if (session) {
					session.connect();
					await session.post('Profiler.enable');
					await session.post('Profiler.start');
				}
				const here = local
					? await ingestInProcess(local, csv, bytes, rows)
					: { seconds: NaN, cpuSeconds: NaN };
				if (session && profileDir) {
					const { profile } = await session.post('Profiler.stop');
					writeFileSync(
						join(profileDir, `in-process-${fileNo}.cpuprofile`),
						JSON.stringify(profile)
					);
					session.disconnect();
				}
				if (local) {
					inProcess.push(here.seconds);
					inProcessCpu.push(here.cpuSeconds);
				}
				if (withSqlite) await quiet();
				const sqlite = withSqlite ? sqliteImportSeconds(csv, dir) : NaN;
				if (withSqlite) theirs[mode].push(sqlite);
				console.log(
					`round ${r + 1} ${mode.padEnd(9)} ${result.seconds.toFixed(2)} s (server CPU ${serverCpu[mode].at(-1)?.toFixed(2)} s, ${switches.toLocaleString('en')} context switches)${local ? `, in-process ${here.seconds.toFixed(2)} s (CPU ${here.cpuSeconds.toFixed(2)} s)` : ''}${withSqlite ? `, sqlite3 .import ${sqlite.toFixed(2)} s, ratio ${(result.seconds / sqlite).toFixed(2)}` : ''}`
				);
				rmSync(csv, { force: true });
			}
		}
		const end = procStatus(pid);

		console.log(
			`machine: ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}, ${(totalmem() / 2 ** 30).toFixed(1)} GiB, node ${process.version}, load average ${loadavg()
				.map((x) => x.toFixed(2))
				.join(' ')}`
		);
		if (busyAtStart.length > 0) {
			const busy = busyAtStart.filter((b) => b >= 0.15).length;
			console.log(
				`quiet start: each timing waited up to ${quietSeconds} s for half a second with the CPUs < 15 % busy; ${busy} of ${busyAtStart.length} started busier (at most ${(100 * Math.max(...busyAtStart)).toFixed(0)} %)`
			);
		}
		console.log(
			`file: ${rows.toLocaleString('en')} rows, ${(bytes / 1e6).toFixed(1)} MB per upload`
		);
		const all = modes.flatMap((m) => ours[m]);
		const allSqlite = modes.flatMap((m) => theirs[m]);
		for (const mode of modes) {
			const m = median(ours[mode]);
			console.log(
				`HTTP ${mode}: ${listSeconds(ours[mode])} s, median ${m.toFixed(2)} s = ${Math.round(rows / m).toLocaleString('en')} rows/s; server CPU median ${median(serverCpu[mode]).toFixed(2)} s` +
					(withSqlite
						? `; sqlite3 .import in turn ${listSeconds(theirs[mode])} s; ratio of medians ${(m / median(theirs[mode])).toFixed(2)}`
						: '')
			);
		}
		if (withSqlite)
			console.log(
				`ratio of medians over all ${all.length} uploads, Rollbead through HTTP / sqlite3 .import: ${(median(all) / median(allSqlite)).toFixed(2)} (${median(all).toFixed(2)} s / ${median(allSqlite).toFixed(2)} s)`
			);
		else console.log(NO_SQLITE3);
		if (local) {
			const m = median(inProcess);
			console.log(
				`in-process ingestSpiFile of the same files (this process, file read from disk), in turn: ${listSeconds(inProcess)} s, median ${m.toFixed(2)} s` +
					(withSqlite ? `; ratio to sqlite3 ${(m / median(allSqlite)).toFixed(2)}` : '') +
					`; HTTP / in-process ${(median(all) / m).toFixed(2)}; CPU median ${median(inProcessCpu).toFixed(2)} s against the server's ${median(modes.flatMap((x) => serverCpu[x])).toFixed(2)} s per upload`
			);
		}
		console.log(
			`server peak RSS (VmHWM): ${(end.hwmKb / 1024).toFixed(0)} MiB over the whole run (${(atStart.hwmKb / 1024).toFixed(0)} MiB after start, ${(end.rssKb / 1024).toFixed(0)} MiB at the end)`
		);
	} finally {
		local?.$client.close();
		await server?.stop();
		rmSync(dir, { recursive: true, force: true });
	}
	if (profileDir) {
		for (const f of readdirSync(profileDir)
			.filter((f) => f.endsWith('.cpuprofile'))
			.sort()) {
			console.log(`\nprofile ${join(profileDir, f)}`);
			for (const line of profileSummary(join(profileDir, f), 25)) console.log(line);
		}
	}
}

if (import.meta.url === `file://${process.argv[1]}`) {
	runHttpBench().catch((err) => {
		console.error(err);
		process.exitCode = 1;
	});
}
