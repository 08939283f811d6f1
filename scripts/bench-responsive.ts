/**
 * `npm run bench:responsive`: does Rollbead keep answering while heavy work runs? Starts the
 * built app (`server.js`) with the demo data on its own port and database, then times
 * `GET /api/health` and a chart request (`GET /api/charts/{id}`) every 50 ms through four phases:
 * idle, a large SPI upload (BENCH_RESPONSIVE_ROWS pad rows, default 1,000,000), a heavy legal
 * Gerber layer (BENCH_RESPONSIVE_FLASHES flashes, default 40,000) and both at once. Prints
 * p50 / p95 / max per phase and endpoint against the target (p95 < 200 ms). Figures only: it
 * asserts nothing. The machine is shared: read the ratios of one run, not absolute times.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ensureBuild, freePort, makeTokenIn, startServer, type OwnServer } from './lib/own-server';
import { uploadPaced, writeSpiFile } from './lib/spi-load';
import { quantile } from './lib/figures';

const PADS_PER_BOARD = 5000;
const rows = Number(process.env.BENCH_RESPONSIVE_ROWS ?? 1_000_000);
const flashes = Number(process.env.BENCH_RESPONSIVE_FLASHES ?? 40_000);
const PROBE_EVERY_MS = 50;
const TARGET_P95_MS = 200;

/** A legal paste layer: a grid of rectangular flashes, 0.4 × 0.25 mm at 0.8 mm pitch. */
function gerberLayer(count: number): string {
	const lines = ['%FSLAX46Y46*%', '%MOMM*%', '%ADD10R,0.400000X0.250000*%', 'D10*'];
	const perRow = Math.ceil(Math.sqrt(count));
	for (let i = 0; i < count; i++) {
		const x = (i % perRow) * 800_000;
		const y = Math.floor(i / perRow) * 800_000;
		lines.push(`X${x}Y${y}D03*`);
	}
	lines.push('M02*');
	return lines.join('\n') + '\n';
}

interface Sample {
	phase: string;
	endpoint: string;
	ms: number;
	status: number;
}

async function timed(url: string, token: string): Promise<{ ms: number; status: number }> {
	const start = performance.now();
	try {
		const res = await fetch(url, { headers: { authorization: `Bearer ${token}` } });
		await res.arrayBuffer();
		return { ms: performance.now() - start, status: res.status };
	} catch {
		return { ms: performance.now() - start, status: 0 };
	}
}

/** Probe both endpoints in turn every 50 ms until `until` settles. */
async function probeDuring(
	server: OwnServer,
	token: string,
	chartId: number,
	phase: string,
	until: Promise<unknown>,
	samples: Sample[]
): Promise<void> {
	let done = false;
	until.finally(() => (done = true)).catch(() => undefined);
	while (!done) {
		const tick = performance.now();
		const health = await timed(`${server.url}/api/health`, token);
		samples.push({ phase, endpoint: 'GET /api/health', ...health });
		const chart = await timed(`${server.url}/api/charts/${chartId}`, token);
		samples.push({ phase, endpoint: `GET /api/charts/${chartId}`, ...chart });
		const wait = PROBE_EVERY_MS - (performance.now() - tick);
		if (wait > 0) await new Promise((r) => setTimeout(r, wait));
	}
}

async function uploadGerber(server: OwnServer, token: string, stencilId: number, text: string) {
	const res = await fetch(
		`${server.url}/api/stencils/${stencilId}/apertures?format=gerber&mode=replace&fileName=bench.gbr`,
		{
			method: 'POST',
			headers: { authorization: `Bearer ${token}`, 'content-type': 'text/plain' },
			body: text
		}
	);
	const body = (await res.json()) as { count?: number; error?: string };
	return { status: res.status, count: body.count, error: body.error };
}

async function main() {
	const dir = mkdtempSync(join(tmpdir(), 'rollbead-responsive-'));
	const databaseFile = join(dir, 'rollbead.db');
	let server: OwnServer | undefined;
	try {
		ensureBuild();
		const spiFile = join(dir, 'bench.csv');
		const boards = Math.max(1, Math.round(rows / PADS_PER_BOARD));
		const spiBytes = await writeSpiFile(spiFile, boards, PADS_PER_BOARD, 'RSP');
		const gerber = gerberLayer(flashes);
		writeFileSync(join(dir, 'bench.gbr'), gerber);

		server = await startServer({ databaseFile, port: await freePort(), demo: true });
		const quality = makeTokenIn(databaseFile, 'quality');
		const engineer = makeTokenIn(databaseFile, 'engineer');
		const charts = (await (
			await fetch(`${server.url}/api/charts`, { headers: { authorization: `Bearer ${quality}` } })
		).json()) as { charts: { id: number }[] };
		const chartId = charts.charts[0].id;
		const stencilIds: number[] = [];
		for (const name of ['BENCH-RESPONSIVE-1', 'BENCH-RESPONSIVE-2']) {
			const res = await fetch(`${server.url}/api/stencils`, {
				method: 'POST',
				headers: { authorization: `Bearer ${engineer}`, 'content-type': 'application/json' },
				body: JSON.stringify({
					name,
					revision: 'A',
					thicknessUm: 120,
					technology: 'laser-stainless'
				})
			});
			stencilIds.push(((await res.json()) as { id: number }).id);
		}

		const samples: Sample[] = [];
		const spiBody = readFileSync(spiFile);
		const spi = (name: string) =>
			uploadPaced(server!.url, quality, spiBody, name, { pieceBytes: 1 << 20, pauseMs: 0 }).done;

		await probeDuring(
			server,
			quality,
			chartId,
			'idle (3 s)',
			new Promise((r) => setTimeout(r, 3000)),
			samples
		);

		const spiStart = performance.now();
		const spiRun = spi('responsive-1.csv');
		await probeDuring(server, quality, chartId, 'SPI upload', spiRun, samples);
		const spiOutcome = await spiRun;
		const spiSeconds = (performance.now() - spiStart) / 1000;

		const gerberStart = performance.now();
		const gerberRun = uploadGerber(server, engineer, stencilIds[0], gerber);
		await probeDuring(server, quality, chartId, 'Gerber import', gerberRun, samples);
		const gerberOutcome = await gerberRun;
		const gerberSeconds = (performance.now() - gerberStart) / 1000;

		// The same file again would be a duplicate: shift its serials for the combined phase.
		const spiBody2 = Buffer.from(spiBody.toString('latin1').replaceAll('RSP-', 'RSQ-'), 'latin1');
		const both = Promise.all([
			uploadPaced(server.url, quality, spiBody2, 'responsive-2.csv', {
				pieceBytes: 1 << 20,
				pauseMs: 0
			}).done,
			uploadGerber(server, engineer, stencilIds[1], gerber)
		]);
		await probeDuring(server, quality, chartId, 'SPI + Gerber at once', both, samples);
		const [spi2, gerber2] = await both;

		console.log(
			`Rollbead responsiveness under load (${new Date().toISOString()}, load average ${readFileSync('/proc/loadavg', 'utf8').split(' ').slice(0, 3).join(' ')})`
		);
		console.log(
			`SPI file: ${rows.toLocaleString('en-US')} pad rows, ${(spiBytes / 1e6).toFixed(1)} MB → ${spiOutcome.status} ${String(spiOutcome.body.status ?? '')} in ${spiSeconds.toFixed(1)} s; again with Gerber: ${spi2.status} ${String(spi2.body.status ?? '')}`
		);
		console.log(
			`Gerber layer: ${flashes.toLocaleString('en-US')} flashes, ${(gerber.length / 1e6).toFixed(1)} MB → ${gerberOutcome.status} (${gerberOutcome.count ?? gerberOutcome.error} apertures) in ${gerberSeconds.toFixed(1)} s; again with SPI: ${gerber2.status}`
		);
		console.log(`Probes every ${PROBE_EVERY_MS} ms; target p95 < ${TARGET_P95_MS} ms.\n`);
		console.log('| phase | endpoint | n | p50 ms | p95 ms | max ms | non-200 | p95 target |');
		console.log('| --- | --- | --- | --- | --- | --- | --- | --- |');
		const phases = [...new Set(samples.map((s) => s.phase))];
		for (const phase of phases) {
			for (const endpoint of [...new Set(samples.map((s) => s.endpoint))]) {
				const these = samples.filter((s) => s.phase === phase && s.endpoint === endpoint);
				if (these.length === 0) continue;
				const ms = these.map((s) => s.ms);
				const p95 = quantile(ms, 0.95);
				const bad = these.filter((s) => s.status !== 200).length;
				console.log(
					`| ${phase} | ${endpoint} | ${these.length} | ${quantile(ms, 0.5).toFixed(0)} | ${p95.toFixed(0)} | ${Math.max(...ms).toFixed(0)} | ${bad} | ${p95 < TARGET_P95_MS ? 'met' : 'missed'} |`
				);
			}
		}
	} finally {
		await server?.stop();
		rmSync(dir, { recursive: true, force: true });
	}
}

await main();
