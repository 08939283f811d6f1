/**
 * Line simulator: invented SMT lines printing through Rollbead's public HTTP API, so the line
 * overview can be watched live and load-tested.
 *
 *   npm run simulate -- --lines 100 --minutes 10 [--url http://localhost:3000] [--token rb_…]
 *
 * The token (or ROLLBEAD_TOKEN) must be an engineer's or admin's: the simulator creates its lines
 * (SIM-001 …), products (SIM-P01 … SIM-P10), one stencil and paste lot per line, then per line:
 * a print run; one SPI file per board every 20–40 s with 300–2,000 pads (fixed per product);
 * now and then a process shift (volume and height drop, pads fail) for a few boards; a stencil
 * clean or tension reading, a fresh paste lot, a run ended and the next one started. All data is
 * invented (Fenmoor Works naming, no real products).
 */
import { parseArgs } from 'node:util';
import { performance } from 'node:perf_hooks';

export interface SimulationOptions {
	url: string;
	token: string;
	lines: number;
	minutes: number;
	/** Seconds between boards on a line: uniform in [min, max]. */
	boardEverySeconds?: [number, number];
	/** Called when an SPI file is posted and when its answer arrives (the benchmark's figures). */
	onImport?: (e: {
		line: string;
		sentAtMs: number;
		answeredAtMs: number | null;
		status: number;
		pads: number;
	}) => void;
	onImportSent?: (e: { line: string; sentAtMs: number }) => void;
	log?: (message: string) => void;
	seed?: number;
}

export interface SimulationResult {
	boards: number;
	pads: number;
	failedPosts: number;
	runsStarted: number;
	lotEvents: number;
	stencilEvents: number;
	shifts: number;
}

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';
const PRODUCTS = 10;
const ON_TARGET = {
	squeegeeAngleDeg: 60,
	squeegeeSpeedMmS: 40,
	squeegeePressureKg: 7.5,
	separationSpeedMmS: 1,
	wipeIntervalPrints: 5,
	printStroke: 'alternating',
	wipeMode: 'wet-vacuum-dry'
};

/** A small deterministic generator (Park–Miller), so runs with the same seed look alike. */
function generator(seed: number) {
	let s = seed % 2147483647 || 1;
	const rand = () => (s = (s * 48271) % 2147483647) / 2147483647;
	const gauss = () => Math.sqrt(-2 * Math.log(rand() || 1e-12)) * Math.cos(2 * Math.PI * rand());
	return { rand, gauss };
}

const pad3 = (n: number) => String(n).padStart(3, '0');

export async function runSimulation(options: SimulationOptions): Promise<SimulationResult> {
	const log = options.log ?? ((m: string) => console.log(m));
	const { rand, gauss } = generator(options.seed ?? 20261203);
	const [minS, maxS] = options.boardEverySeconds ?? [20, 40];
	const base = options.url.replace(/\/$/, '');
	const auth = { authorization: `Bearer ${options.token}` };
	const result: SimulationResult = {
		boards: 0,
		pads: 0,
		failedPosts: 0,
		runsStarted: 0,
		lotEvents: 0,
		stencilEvents: 0,
		shifts: 0
	};
	const tag = Date.now().toString(36);

	async function call(method: string, path: string, body?: unknown, okStatuses = [200, 201]) {
		const response = await fetch(base + path, {
			method,
			headers: { ...auth, ...(body !== undefined && { 'content-type': 'application/json' }) },
			body: body === undefined ? undefined : JSON.stringify(body)
		});
		const text = await response.text();
		let json: unknown = null;
		try {
			json = text ? JSON.parse(text) : null;
		} catch {
			json = text;
		}
		if (!okStatuses.includes(response.status)) {
			throw new Error(`${method} ${path}: ${response.status} ${text.slice(0, 300)}`);
		}
		return { status: response.status, json: json as Record<string, unknown> };
	}

	// Factory: products, lines, stencils (409 = made by an earlier simulation: reused).
	for (let p = 1; p <= PRODUCTS; p++) {
		await call(
			'POST',
			'/api/products',
			{ code: `SIM-P${String(p).padStart(2, '0')}`, name: `Simulated board ${p}` },
			[201, 409]
		);
	}
	const stencilIds = new Map<string, number>();
	const existingStencils = (await call('GET', '/api/stencil-life')).json as {
		stencils?: { id: number; name: string }[];
	};
	for (const s of existingStencils.stencils ?? []) stencilIds.set(s.name, s.id);
	const lines = Array.from({ length: options.lines }, (_, i) => {
		const code = `SIM-${pad3(i + 1)}`;
		const productIndex = (i % PRODUCTS) + 1;
		// 300–2,000 pads, fixed per product (its pad dictionary stays the same from board to board).
		const pads = 300 + Math.round(((productIndex - 1) / (PRODUCTS - 1)) * 1700);
		return {
			code,
			product: `SIM-P${String(productIndex).padStart(2, '0')}`,
			pads,
			stencil: `SIM-ST-${pad3(i + 1)}-${i % 2 ? 'B' : 'T'}`
		};
	});
	for (const line of lines) {
		await call(
			'POST',
			'/api/lines',
			{ code: line.code, name: `Simulated line ${line.code.slice(4)}` },
			[201, 409]
		);
		if (!stencilIds.has(line.stencil)) {
			const created = await call('POST', '/api/stencils', {
				name: line.stencil,
				revision: 'A',
				thicknessUm: 120,
				technology: 'laser-stainless',
				ratedLifePrints: 60_000
			});
			stencilIds.set(line.stencil, Number(created.json.id));
		}
	}
	log(`[simulate] ${lines.length} lines ready; printing for ${options.minutes} min`);

	async function freshLot(line: (typeof lines)[number], n: number): Promise<string> {
		const lotNumber = `SIM-${tag}-${line.code.slice(4)}-${n}`;
		const now = Date.now();
		await call('POST', '/api/paste-lots', {
			lotNumber,
			alloy: 'SAC305',
			powderType: 4,
			fluxClass: 'ROL0',
			expiresOn: new Date(now + 120 * 86_400_000).toISOString().slice(0, 10)
		});
		const event = (event: string, minutesAgo: number) =>
			call('POST', `/api/paste-lots/${encodeURIComponent(lotNumber)}/events`, {
				event,
				at: new Date(now - minutesAgo * 60_000).toISOString()
			});
		await event('out-of-cold-storage', 300);
		await event('opened', 50);
		await event('on-stencil', 45 - Math.floor(rand() * 40));
		result.lotEvents += 3;
		return lotNumber;
	}

	async function startRun(line: (typeof lines)[number], lotNumber: string): Promise<number> {
		const open = (await call('GET', `/api/print-runs?line=${line.code}&open=true`)).json as {
			runs?: { id: number }[];
		};
		for (const r of open.runs ?? []) await call('POST', `/api/print-runs/${r.id}/end`, {});
		const started = await call('POST', '/api/print-runs', {
			line: line.code,
			product: line.product,
			stencil: line.stencil,
			pasteLot: lotNumber,
			parameters: ON_TARGET
		});
		result.runsStarted++;
		return Number(started.json.id);
	}

	function spiFile(line: (typeof lines)[number], serial: string, shift: boolean): string {
		const at = new Date().toISOString();
		const rows: string[] = [HEADER];
		const volumeMean = shift ? 82 : 101;
		const heightMean = shift ? 108 : 121;
		for (let p = 0; p < line.pads; p++) {
			const volume = volumeMean + gauss() * 6;
			const height = heightMean + gauss() * 4;
			const result = volume < 70 || volume > 140 ? 'fail' : volume < 80 ? 'warn' : 'pass';
			rows.push(
				`${serial},${at},${line.code},${line.product},0,R${(p >> 1) + 1},${(p & 1) + 1},` +
					`${volume.toFixed(2)},${(100 + gauss() * 4).toFixed(2)},${height.toFixed(2)},${(gauss() * 8).toFixed(2)},${(gauss() * 8).toFixed(2)},${result}`
			);
		}
		return rows.join('\n') + '\n';
	}

	const endAt = performance.now() + options.minutes * 60_000;
	const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

	async function feed(line: (typeof lines)[number], index: number): Promise<void> {
		// Spread the lines' first boards over the first interval, as on a real floor.
		await sleep(rand() * minS * 1000);
		let lotCount = 1;
		let lot = await freshLot(line, lotCount);
		let runId = await startRun(line, lot);
		let board = 0;
		let shiftLeft = 0;
		while (performance.now() < endAt) {
			board++;
			if (shiftLeft === 0 && rand() < 0.02) {
				shiftLeft = 5 + Math.floor(rand() * 6);
				result.shifts++;
			}
			const shift = shiftLeft > 0;
			if (shiftLeft > 0) shiftLeft--;
			const serial = `FW-SIM-${tag}-${line.code.slice(4)}-${String(board).padStart(6, '0')}`;
			const text = spiFile(line, serial, shift);
			const sentAtMs = Date.now();
			options.onImportSent?.({ line: line.code, sentAtMs });
			let status = 0;
			try {
				const response = await fetch(`${base}/api/spi/imports?fileName=${serial}.csv`, {
					method: 'POST',
					headers: { ...auth, 'content-type': 'text/csv' },
					body: text
				});
				status = response.status;
				await response.arrayBuffer();
				if (status === 201) {
					result.boards++;
					result.pads += line.pads;
				} else result.failedPosts++;
			} catch (err) {
				result.failedPosts++;
				log(`[simulate] ${line.code}: import failed: ${(err as Error).message}`);
			}
			options.onImport?.({
				line: line.code,
				sentAtMs,
				answeredAtMs: Date.now(),
				status,
				pads: line.pads
			});
			try {
				const r = rand();
				if (r < 0.03) {
					await call('POST', `/api/stencil-life/${stencilIds.get(line.stencil)}/entries`, {
						kind: 'cleaning',
						detail: 'under-stencil wipe, manual IPA clean'
					});
					result.stencilEvents++;
				} else if (r < 0.04) {
					const readings = Array.from(
						{ length: 5 },
						() => Math.round((38 + gauss() * 2) * 10) / 10
					);
					await call('POST', `/api/stencil-life/${stencilIds.get(line.stencil)}/entries`, {
						kind: 'tension',
						readingsNPerCm: readings
					});
					result.stencilEvents++;
				} else if (r < 0.05) {
					// A new jar and a new run: the old run ends with what was printed.
					await call('POST', `/api/print-runs/${runId}/end`, { boardsPrinted: board });
					lot = await freshLot(line, ++lotCount);
					runId = await startRun(line, lot);
					board = 0;
				}
			} catch (err) {
				log(`[simulate] ${line.code}: ${(err as Error).message}`);
			}
			const wait = (minS + rand() * (maxS - minS)) * 1000 - (Date.now() - sentAtMs);
			if (performance.now() + wait > endAt) break;
			await sleep(Math.max(0, wait));
		}
		void index;
	}

	await Promise.all(
		lines.map((line, i) =>
			feed(line, i).catch((err) =>
				log(`[simulate] ${line.code} stopped: ${(err as Error).message}`)
			)
		)
	);
	return result;
}

async function main(): Promise<void> {
	const { values } = parseArgs({
		options: {
			lines: { type: 'string', default: '10' },
			minutes: { type: 'string', default: '10' },
			url: { type: 'string', default: process.env.ROLLBEAD_URL ?? 'http://localhost:3000' },
			token: { type: 'string', default: process.env.ROLLBEAD_TOKEN ?? '' }
		}
	});
	const lines = Number(values.lines);
	const minutes = Number(values.minutes);
	if (!Number.isInteger(lines) || lines < 1 || lines > 999)
		throw new Error('--lines must be a whole number from 1 to 999');
	if (!Number.isFinite(minutes) || minutes <= 0 || minutes > 24 * 60)
		throw new Error('--minutes must be a number of minutes > 0 (at most a day)');
	if (!values.token)
		throw new Error(
			'give an engineer or admin API token: --token rb_… or ROLLBEAD_TOKEN (npm run token -- create --name sim --role engineer)'
		);
	const result = await runSimulation({ url: values.url!, token: values.token, lines, minutes });
	console.log(`[simulate] done: ${JSON.stringify(result)}`);
}

if (import.meta.url === `file://${process.argv[1]}`) {
	main().catch((err) => {
		console.error(`[simulate] ${(err as Error).message}`);
		process.exit(1);
	});
}
