/**
 * SPC benchmark (figures printed, never asserted): `npx tsx scripts/bench-spc.ts`.
 *
 * Fills a throw-away database with synthetic SPI data written directly (not through the ingest
 * service, to keep the run short): BENCH_SPC_BOARDS boards (default 2,000) × 5,000 pads =
 * 10,000,000 pad measurement rows, each board with the per-board aggregates ingest computes.
 * BENCH_SPC_PADS changes the pads per board (a quick check of the script).
 * Then times, on a between/within paste-volume chart with all twelve rules and frozen limits:
 * - the chart API path (`chartDetail` + `chartJson`, what GET /api/charts/{id}?limit=1000 runs)
 *   for 1,000 subgroups with limits, rules and capability (target < 50 ms);
 * - rule evaluation for one new board (`evaluateSignalsAfterIngest`, what an import calls; target
 *   < 5 ms).
 */
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { openDatabase } from '../src/lib/server/db';
import { lines, products, spiImports } from '../src/lib/server/db/schema';
import { chartJson } from '../src/lib/spc/api-json';
import { chartDetail } from '../src/lib/server/spc/chart-service';
import { createCharacteristic } from '../src/lib/server/spc/characteristics';
import { freezeLimits } from '../src/lib/server/spc/limits-lifecycle';
import { evaluateSignalsAfterIngest } from '../src/lib/server/spc/signals';
import { analyzeStudy, RULE_IDS } from '../src/lib/spc';
import { MAX_STUDY_VALUES } from '../src/lib/spc/analyze';
import { median, quantile } from './lib/figures';

const PADS = Math.max(2, Number(process.env.BENCH_SPC_PADS ?? 5000));
const BOARDS = Math.max(1100, Number(process.env.BENCH_SPC_BOARDS ?? 2000));
const dir = mkdtempSync(join(tmpdir(), 'rollbead-bench-spc-'));
const file = join(dir, 'bench.db');
const db = openDatabase(file);
const sqlite = db.$client;

/** A small deterministic generator (Park–Miller), so every run measures the same data. */
let seed = 20261202;
const rand = () => (seed = (seed * 48271) % 2147483647) / 2147483647;
const gauss = () => Math.sqrt(-2 * Math.log(rand() || 1e-12)) * Math.cos(2 * Math.PI * rand());

const ms = (v: number) => `${v.toFixed(2)} ms`;

const product = db.insert(products).values({ code: 'BX-1', name: 'Bench board' }).returning().get();
const line = db.insert(lines).values({ code: 'BL-1', name: 'Bench line' }).returning().get();
const importId = db
	.insert(spiImports)
	.values({
		source: 'api',
		fileName: 'bench',
		sha256: 'bench',
		sizeBytes: 0,
		status: 'imported',
		createdBy: 'system',
		startedAt: new Date(),
		finishedAt: new Date()
	})
	.returning()
	.get().id;

const insertPad = sqlite.prepare(
	'insert into spi_pads (product_code, panel_index, refdes, pad) values (?, 0, ?, ?)'
);
const padIds: number[] = [];
sqlite.transaction(() => {
	for (let p = 0; p < PADS; p++)
		padIds.push(
			Number(
				insertPad.run('BX-1', `R${Math.floor(p / 2) + 1}`, String((p % 2) + 1)).lastInsertRowid
			)
		);
})();

const insertBoard =
	sqlite.prepare(`insert into spi_boards (serial, inspected_at, line_code, product_code, line_id, product_id,
	import_id, pad_count, pass_count, warn_count, fail_count, volume_pct_count, volume_pct_mean, volume_pct_sd,
	volume_pct_min, volume_pct_max, volume_pct_range) values (?, ?, 'BL-1', 'BX-1', ?, ?, ?, ?, ?, 0, 0, ?, ?, ?, ?, ?, ?)`);
const insertMeasurement =
	sqlite.prepare(`insert into spi_pad_measurements (board_id, pad_id, volume_centi_pct,
	area_centi_pct, height_centi_um, offset_x_centi_um, offset_y_centi_um, result) values (?, ?, ?, 10000, 12000, 0, 0, 0)`);
const start = Date.parse('2026-11-01T00:00:00Z');

/** One synthetic board: a board-level shift plus pad-level noise, aggregates as ingest does. */
function addBoard(i: number, shift = 0): number {
	const boardShift = gauss() * 3 + shift;
	const values = new Int32Array(PADS);
	let sum = 0;
	let min = Infinity;
	let max = -Infinity;
	for (let p = 0; p < PADS; p++) {
		const v = Math.round((100 + boardShift + gauss() * 8) * 100);
		values[p] = v;
		sum += v / 100;
		if (v < min) min = v;
		if (v > max) max = v;
	}
	const mean = sum / PADS;
	let ss = 0;
	for (let p = 0; p < PADS; p++) ss += (values[p] / 100 - mean) ** 2;
	const boardId = Number(
		insertBoard.run(
			`BX-${String(i).padStart(6, '0')}`,
			start + i * 30_000,
			line.id,
			product.id,
			importId,
			PADS,
			PADS,
			PADS,
			mean,
			Math.sqrt(ss / (PADS - 1)),
			min / 100,
			max / 100,
			(max - min) / 100
		).lastInsertRowid
	);
	for (let p = 0; p < PADS; p++) insertMeasurement.run(boardId, padIds[p], values[p]);
	return boardId;
}

const t0 = performance.now();
for (let b = 0; b < BOARDS; b += 100) {
	sqlite.transaction(() => {
		for (let i = b; i < Math.min(BOARDS, b + 100); i++) addBoard(i);
	})();
}
const fillS = (performance.now() - t0) / 1000;
const padRows = (
	sqlite.prepare('select count(*) n from spi_pad_measurements').get() as { n: number }
).n;
console.log(
	`data: ${BOARDS} boards, ${padRows.toLocaleString('en')} pad rows written in ${fillS.toFixed(1)} s; database ${(statSync(file).size / 1e6).toFixed(0)} MB`
);

const chart = createCharacteristic(
	db,
	{
		name: 'Bench volume',
		productId: product.id,
		lineIds: [line.id],
		measure: 'volume-pct',
		chartKind: 'between-within',
		rules: [...RULE_IDS]
	},
	null
);
freezeLimits(db, chart.id, { limit: 1000 }, null);

// Wall time suffers when other processes share the CPU; CPU time of this process is printed too.
const cpuMs = (from: NodeJS.CpuUsage) => {
	const d = process.cpuUsage(from);
	return (d.user + d.system) / 1000;
};
const chartTimes: number[] = [];
let points = 0;
const chartCpu = process.cpuUsage();
for (let r = 0; r < 25; r++) {
	const a = performance.now();
	const body = JSON.stringify(chartJson(chartDetail(db, chart.id, { limit: 1000 })));
	chartTimes.push(performance.now() - a);
	points = (JSON.parse(body).points as unknown[]).length;
}
const chartCpuEach = cpuMs(chartCpu) / chartTimes.length;
console.log(
	`chart API path, ${points} subgroups, limits + 12 rules + capability + histogram + JSON: median ${ms(median(chartTimes))}, min ${ms(Math.min(...chartTimes))}, CPU ${ms(chartCpuEach)} per request (target < 50 ms)`
);

// Warm-up, not timed: the first signal loads the mail module (once per server process).
await evaluateSignalsAfterIngest(db, [sqlite.transaction(() => addBoard(BOARDS, 40))()]);
const evalTimes: number[] = [];
let signals = 0;
let evalCpuTotal = 0;
for (let r = 0; r < 40; r++) {
	const id = sqlite.transaction(() => addBoard(BOARDS + 1 + r, r % 10 === 9 ? 40 : 0))();
	const cpu = process.cpuUsage();
	const a = performance.now();
	signals += (await evaluateSignalsAfterIngest(db, [id])).length;
	evalTimes.push(performance.now() - a);
	evalCpuTotal += cpuMs(cpu);
}
const p90 = quantile(evalTimes, 0.9);
console.log(
	`rule evaluation for one new board (evaluateSignalsAfterIngest): median ${ms(median(evalTimes))}, 90th percentile ${ms(p90)}, max ${ms(Math.max(...evalTimes))}, CPU ${ms(evalCpuTotal / evalTimes.length)} per board on average (target < 5 ms); ${signals} signals stored (boards 10, 20, 30 and 40 of the 40 are shifted by +40 %)`
);

// The ad-hoc study (POST /api/spc/analyze) on 1,000 subgroups of 5, all rules, capability.
const study = {
	chart: 'xbar-r',
	subgroups: Array.from({ length: 1000 }, (_, i) =>
		Array.from({ length: 5 }, (_, j) => 100 + Math.sin(i * 7.1 + j * 3.3) * 2)
	),
	lsl: 90,
	usl: 110,
	rules: [...RULE_IDS]
};
analyzeStudy(study); // warm-up
const studyTimes: number[] = [];
for (let r = 0; r < 20; r++) {
	const a = performance.now();
	if (!analyzeStudy(study).ok) throw new Error('bench study was refused');
	studyTimes.push(performance.now() - a);
}
console.log(
	`ad-hoc study (analyzeStudy), X-bar/R 1000 × 5, 12 rules + capability: median ${ms(median(studyTimes))}, min ${ms(Math.min(...studyTimes))}`
);

// The largest study the work budget lets in: MAX_STUDY_VALUES individual values, all rules.
const largest = {
	chart: 'i-mr',
	values: Array.from({ length: MAX_STUDY_VALUES }, (_, i) => 100 + Math.sin(i * 7.1) * 2),
	lsl: 90,
	usl: 110,
	rules: [...RULE_IDS]
};
const largestTimes: number[] = [];
for (let r = 0; r < 5; r++) {
	const a = performance.now();
	if (!analyzeStudy(largest).ok) throw new Error('bench study at the budget was refused');
	largestTimes.push(performance.now() - a);
}
console.log(
	`ad-hoc study at the work budget (I-MR, ${MAX_STUDY_VALUES.toLocaleString('en-US')} values, 12 rules + capability): median ${ms(median(largestTimes))}, max ${ms(Math.max(...largestTimes))} on the request loop`
);

if (process.env.BENCH_SPC_KEEP) {
	console.log(file);
	process.exit(0);
}
db.$client.close();
rmSync(dir, { recursive: true, force: true });
