import type { Db } from '../db';
import { checkStoredStencil } from '../stencils/evaluation';
import { ingestSpiFile } from './ingest-service';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result,volume_um3,stencil';
const DAY = 24 * 60 * 60 * 1000;
const BOARDS = 150;

/** Deterministic standard-normal-ish noise (sum of uniforms from an LCG), so the demo repeats. */
function gaussian(seed: number): () => number {
	let state = seed;
	const uniform = () => {
		state = (state * 1103515245 + 12345) % 2147483648;
		return state / 2147483648;
	};
	return () => uniform() + uniform() + uniform() + uniform() - 2;
}

/**
 * Demo SPI data for the Fenmoor Works scenario: 150 PB-100 boards on SMT-1 over the last days,
 * one file per day, through the real ingest service (source "api", by "system"). Pads are the
 * demo stencil's apertures (ST-PB100, latest revision), so boards link to it and to the print
 * runs whose windows hold them. Volume drifts slowly down (≈ 103 % → 92 %) so the SPC demo chart
 * shows a signal; the BGA U2 prints low and fails most (the Pareto's top). Invented data.
 * Does nothing when the demo stencil or line is missing.
 */
export async function seedDemoSpi(db: Db, nowMs = Date.now()): Promise<void> {
	const stencil = db.$client
		.prepare(`select id from stencils where name = 'ST-PB100' order by id desc limit 1`)
		.get() as { id: number } | undefined;
	const line = db.$client.prepare(`select id from lines where code = 'SMT-1'`).get() as
		{ id: number } | undefined;
	if (!stencil || !line) return;
	const apertures = checkStoredStencil(db, stencil.id).apertures;
	if (apertures.length === 0) return;

	// Place boards inside the line's recent print runs when there are any, else over 5 days.
	const runs = db.$client
		.prepare(
			`select started_at as s, coalesce(ended_at, ?) as e, board_serial as serial from print_runs
			 where line_id = ? and started_at < ?
			 and product_id = (select id from products where code = 'PB-100')
			 order by started_at desc limit 10`
		)
		.all(nowMs, line.id, nowMs) as { s: number; e: number; serial: string | null }[];
	runs.reverse();
	const windows =
		runs.length > 0
			? runs
			: Array.from({ length: 5 }, (_, d) => ({
					s: nowMs - (5 - d) * DAY + 6 * 60 * 60 * 1000,
					e: nowMs - (5 - d) * DAY + 14 * 60 * 60 * 1000,
					serial: null as string | null
				}));
	const perWindow = Math.ceil(BOARDS / windows.length);
	const noise = gaussian(20260302);
	let board = 0;
	for (const w of windows) {
		const lines: string[] = [HEADER];
		const span = Math.max(60_000, w.e - w.s);
		for (let j = 0; j < perWindow && board < BOARDS; j++, board++) {
			const at = new Date(w.s + ((j + 0.5) / perWindow) * span).toISOString();
			// The boards of a run carry its serials: the run logs its first board's serial, the
			// inspected boards follow it, so a serial found in SPI leads to its run (and stencil, lot).
			const first = w.serial ? /^(.*?)(\d+)$/.exec(w.serial) : null;
			const serial = first
				? `${first[1]}${String(Number(first[2]) + j).padStart(first[2].length, '0')}`
				: `FW-PB100-${String(100001 + board).padStart(7, '0')}`;
			const drift = 103 - (11 * board) / BOARDS; // slow loss of volume (e.g. paste drying)
			for (const a of apertures) {
				const bga = a.refdes === 'U2';
				let vol = drift + (bga ? -22 : 0) + noise() * (bga ? 12 : 6);
				vol = Math.min(400, Math.max(5, vol));
				const area = Math.min(400, Math.max(5, 100 + noise() * 4));
				const height = Math.max(10, a.thicknessUm * (vol / area) + noise() * 3);
				const ox = noise() * 15;
				const oy = noise() * 15;
				const result = vol < 60 || vol > 140 ? 'fail' : vol < 75 || vol > 125 ? 'warn' : 'pass';
				const um3 = Math.round((a.volumeUm3 * vol) / 100);
				lines.push(
					`${serial},${at},SMT-1,PB-100,0,${a.refdes},${a.pad},${vol.toFixed(2)},${area.toFixed(2)},${height.toFixed(2)},${ox.toFixed(2)},${oy.toFixed(2)},${result},${um3},ST-PB100`
				);
			}
		}
		if (lines.length === 1) continue;
		const text = lines.join('\n') + '\n';
		const day = new Date(w.s).toISOString().slice(0, 10);
		await ingestSpiFile(db, {
			source: 'api',
			fileName: `smt1-spi-${day}.csv`,
			body: (async function* () {
				yield new TextEncoder().encode(text);
			})(),
			createdBy: 'system'
		});
	}
}
