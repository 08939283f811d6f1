/**
 * Floor load benchmark (figures printed, never asserted): `npm run bench:floor [-- --lines 100 --minutes 10]`.
 *
 * Builds when sources changed (under the e2e lock), starts `server.js` on its own free port with a
 * throw-away database (no demo data), makes an engineer token, listens to `GET /api/lines/stream`
 * and runs the line simulator (scripts/simulate.ts) against it at production pace. Meanwhile it
 * samples `GET /api/lines/overview` once a second and the server's RSS every 10 s, and prints:
 * - overview API latency p50 / p95 / max (target p95 < 150 ms);
 * - event delay p50 / p95 / max: from sending an SPI file's POST to the stream's `line` event of
 *   that line (target p95 < 2 s);
 * - ingest backlog: SPI files sent but not yet answered, sampled every 5 s (kept up = stays flat);
 * - server RSS over time (flat = no growth).
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { request as httpRequest } from 'node:http';
import { cpus, tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { performance } from 'node:perf_hooks';
import { runSimulation } from './simulate';
import { ensureBuild, freePort, makeTokenIn, startServer } from './lib/own-server';
import { quantile } from './lib/figures';

const { values } = parseArgs({
	options: { lines: { type: 'string', default: '100' }, minutes: { type: 'string', default: '10' } }
});
const LINES = Number(values.lines);
const MINUTES = Number(values.minutes);
if (!Number.isInteger(LINES) || LINES < 1 || !(MINUTES > 0))
	throw new Error('--lines N (whole) and --minutes M (> 0)');

const fmt = (v: number, unit = 'ms') =>
	Number.isFinite(v) ? `${v.toFixed(v < 10 ? 1 : 0)} ${unit}` : '–';

console.log('[bench:floor] building when sources changed (under the e2e lock)…');
ensureBuild();

const dir = mkdtempSync(join(tmpdir(), 'rollbead-bench-floor-'));
process.on('exit', () => rmSync(dir, { recursive: true, force: true }));
const database = join(dir, 'floor.db');
const token = makeTokenIn(database, 'engineer', 'bench floor');
const server = await startServer({
	databaseFile: database,
	port: await freePort(),
	demo: false,
	env: { SIGNAL_ESCALATE_MINUTES: '0' }
});
const base = server.url;
const pid = server.child.pid;
console.log(`[bench:floor] server on ${base} (pid ${pid}); ${LINES} lines for ${MINUTES} min`);

// Stream: each `line` event closes the oldest unanswered-by-event POST of its line.
const pendingSends = new Map<string, number[]>();
const eventDelays: number[] = [];
let lineEvents = 0;
let streamText = '';
const stream = httpRequest(
	`${base}/api/lines/stream`,
	{ headers: { authorization: `Bearer ${token}` } },
	(res) => {
		res.setEncoding('utf8');
		res.on('data', (chunk: string) => {
			streamText += chunk;
			let end: number;
			while ((end = streamText.indexOf('\n\n')) !== -1) {
				const frame = streamText.slice(0, end);
				streamText = streamText.slice(end + 2);
				if (!frame.includes('event: line')) continue;
				lineEvents++;
				const data = /^data: (.*)$/m.exec(frame)?.[1];
				if (!data) continue;
				const code = /"lineCode":"([^"]+)"/.exec(data)?.[1];
				const sends = code ? pendingSends.get(code) : undefined;
				if (sends?.length) {
					const now = Date.now();
					// The tile carries every file sent before it was computed: the earliest counts.
					eventDelays.push(now - sends[0]);
					pendingSends.set(code!, []);
				}
			}
		});
	}
);
stream.end();

let inFlight = 0;
const importTimes: number[] = [];
const overviewTimes: number[] = [];
const backlog: { atS: number; inFlight: number }[] = [];
const rss: { atS: number; mb: number }[] = [];
const t0 = performance.now();
const elapsedS = () => Math.round((performance.now() - t0) / 1000);
const readRssMb = () => {
	try {
		const status = readFileSync(`/proc/${pid}/status`, 'utf8');
		return Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? NaN) / 1024;
	} catch {
		return NaN;
	}
};

let sampling = true;
const overviewLoop = (async () => {
	while (sampling) {
		const start = performance.now();
		try {
			const r = await fetch(`${base}/api/lines/overview`, {
				headers: { authorization: `Bearer ${token}` }
			});
			await r.arrayBuffer();
			if (r.ok) overviewTimes.push(performance.now() - start);
		} catch {
			/* counted as missing */
		}
		await new Promise((r) => setTimeout(r, 1000));
	}
})();
const backlogTimer = setInterval(() => backlog.push({ atS: elapsedS(), inFlight }), 5000);
const rssTimer = setInterval(() => rss.push({ atS: elapsedS(), mb: readRssMb() }), 10_000);
rss.push({ atS: 0, mb: readRssMb() });

const result = await runSimulation({
	url: base,
	token,
	lines: LINES,
	minutes: MINUTES,
	log: (m) => console.log(m),
	onImportSent: ({ line, sentAtMs }) => {
		inFlight++;
		const list = pendingSends.get(line) ?? [];
		list.push(sentAtMs);
		pendingSends.set(line, list);
	},
	onImport: ({ sentAtMs, answeredAtMs }) => {
		inFlight--;
		if (answeredAtMs) importTimes.push(answeredAtMs - sentAtMs);
	}
});
sampling = false;
await overviewLoop;
clearInterval(backlogTimer);
clearInterval(rssTimer);
rss.push({ atS: elapsedS(), mb: readRssMb() });
stream.destroy();

const overviewBody = await (
	await fetch(`${base}/api/lines/overview`, { headers: { authorization: `Bearer ${token}` } })
).json();
console.log('\n== bench:floor ==');
console.log(`lines ${LINES}, ${MINUTES} min, machine: ${cpus().length} cores`);
console.log(`simulated: ${JSON.stringify(result)}`);
console.log(`overview tiles at the end: ${overviewBody.lines.length}`);
console.log(
	`GET /api/lines/overview: n ${overviewTimes.length}, p50 ${fmt(quantile(overviewTimes, 0.5))}, p95 ${fmt(quantile(overviewTimes, 0.95))}, max ${fmt(Math.max(...overviewTimes))} (target p95 < 150 ms)`
);
console.log(
	`event delay POST → SSE line event: n ${eventDelays.length} (of ${lineEvents} line events), p50 ${fmt(quantile(eventDelays, 0.5))}, p95 ${fmt(quantile(eventDelays, 0.95))}, max ${fmt(Math.max(...eventDelays))} (target p95 < 2 s)`
);
console.log(
	`SPI import answer: p50 ${fmt(quantile(importTimes, 0.5))}, p95 ${fmt(quantile(importTimes, 0.95))}, max ${fmt(Math.max(...importTimes))}`
);
console.log(
	`ingest backlog (files sent, not answered) every 5 s: ${backlog.map((b) => b.inFlight).join(' ')}`
);
console.log(`server RSS (MB) every 10 s: ${rss.map((r) => r.mb.toFixed(0)).join(' ')}`);
await server.stop();
process.exit(0);
