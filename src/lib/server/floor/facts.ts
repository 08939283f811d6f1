import type Database from 'better-sqlite3';
import { checkTensionReadings, lotExpiresAtMs, replayPasteEvents } from '$lib/printlog';
import type { BoardFact, CharacteristicFact, LineFacts, SignalFact } from '$lib/floor/tile';
import type { Db } from '../db';
import { capabilityStates } from './capability-cache';
import { SPI_MEASURE_BY_ID } from '$lib/spi/measures';

/**
 * The facts of the line tiles, read with one set of prepared statements, each on an index:
 * open runs (partial unique index), the runs' SPI boards (print_run index), each line's last
 * 100 boards (line_code + inspected_at), stencil runs and events (stencil index, stencil + at),
 * paste events (lot + at), open signals (ack_at index). Per line the work is bounded (100
 * boards, one run, one stencil, one lot), so 100 lines cost about 100× one line.
 */

type Statements = ReturnType<typeof prepare>;
const cache = new WeakMap<Database.Database, Statements>();

// Board-mean targets when no key characteristic sets one: the measure catalogue's (volume is % of
// the aperture's nominal volume, offsets aim at 0).
const VOLUME_TARGET = SPI_MEASURE_BY_ID['volume-pct'].defaults.target;
const OFFSET_TARGET = SPI_MEASURE_BY_ID['offset-x-um'].defaults.target;

function prepare(conn: Database.Database) {
	return {
		lines: conn.prepare(`select id, code, name from lines where active = 1 order by code`),
		openRuns: conn.prepare(
			`select r.id, r.line_id as lineId, r.started_at as startedAt, r.boards_printed as boardsPrinted,
			        r.parameters, r.stencil_id as stencilId, r.paste_lot_id as pasteLotId,
			        r.product_id as productId, p.code as productCode, p.name as productName
			   from print_runs r join products p on p.id = r.product_id
			  where r.ended_at is null`
		),
		lastEnded: conn
			.prepare(`select ended_at from print_runs where line_id = ? order by started_at desc limit 1`)
			.pluck(),
		runBoards: conn.prepare(`select count(*) as n from spi_boards where print_run_id = ?`).pluck(),
		runBoardsSince: conn
			.prepare(`select count(*) from spi_boards where print_run_id = ? and inspected_at >= ?`)
			.pluck(),
		lineBoards: conn.prepare(
			`select id, inspected_at as atMs, fail_count as failCount, volume_pct_mean as v,
			        height_um_mean as h, offset_x_um_mean as x, offset_y_um_mean as y
			   from spi_boards where line_code = ? order by inspected_at desc limit 100`
		),
		stencil: conn.prepare(
			`select id, name, revision, state, thickness_um as thicknessUm, rated_life_prints as ratedLifePrints
			   from stencils where id = ?`
		),
		approvedSides: conn
			.prepare(
				`select distinct side from product_stencil_approvals
				  where product_id = ? and stencil_name = ? order by side`
			)
			.pluck(),
		stencilRuns: conn.prepare(
			`select id, started_at as startedAt, boards_printed as boardsPrinted
			   from print_runs where stencil_id = ?`
		),
		lastEvent: conn.prepare(
			`select at, readings_n_per_cm as readings from stencil_events
			  where stencil_id = ? and kind = ? order by at desc, id desc limit 1`
		),
		lot: conn.prepare(
			`select id, lot_number as lotNumber, expires_on as expiresOn,
			        max_on_stencil_minutes as maxOnStencil, max_out_of_cold_minutes as maxOutOfCold
			   from paste_lots where id = ?`
		),
		lotEvents: conn.prepare(`select event, at from paste_events where lot_id = ? order by at, id`),
		openSignals: conn.prepare(
			`select s.id, s.characteristic_id as characteristicId, c.name as characteristic, c.product_id as productId,
			        s.rule, s.created_at as createdAt, s.point_key as pointKey, s.board_ids as boardIds,
			        u.name as owner
			   from spc_signals s
			   join spc_characteristics c on c.id = s.characteristic_id
			   left join users u on u.id = s.assignee_user_id
			  where s.ack_at is null
			  order by s.id desc limit 2000`
		),
		boardLineRun: conn.prepare(
			`select line_id as lineId, print_run_id as runId from spi_boards where id = ?`
		),
		runLine: conn.prepare(`select line_id from print_runs where id = ?`).pluck(),
		// A board a printer reported over CFX (chart point `cfx-unit:ID`, see ../cfx/board-points).
		cfxUnitLineRun: conn.prepare(
			`select line_id as lineId, print_run_id as runId from cfx_units where id = ?`
		)
	};
}

function statements(db: Db): Statements {
	let s = cache.get(db.$client);
	if (!s) {
		s = prepare(db.$client);
		cache.set(db.$client, s);
	}
	return s;
}

/** Signal id → line and print run (fixed once stored, so kept for the process). */
const signalPlace = new Map<number, { lineId: number | null; runId: number | null }>();

function placeOfSignal(s: Statements, id: number, pointKey: string, boardIds: number[]) {
	let place = signalPlace.get(id);
	if (place) return place;
	const run = /^run:(\d+)$/.exec(pointKey);
	const cfxUnit = /^cfx-unit:(\d+)$/.exec(pointKey);
	if (run) {
		const runId = Number(run[1]);
		place = { lineId: (s.runLine.get(runId) as number | undefined) ?? null, runId };
	} else if (cfxUnit) {
		const unit = s.cfxUnitLineRun.get(Number(cfxUnit[1])) as
			{ lineId: number; runId: number | null } | undefined;
		place = { lineId: unit?.lineId ?? null, runId: unit?.runId ?? null };
	} else {
		const board = boardIds.length
			? (s.boardLineRun.get(boardIds[boardIds.length - 1]) as
					{ lineId: number | null; runId: number | null } | undefined)
			: undefined;
		place = { lineId: board?.lineId ?? null, runId: board?.runId ?? null };
	}
	if (signalPlace.size > 50_000) signalPlace.clear();
	signalPlace.set(id, place);
	return place;
}

export interface OpenSignalOnLine extends SignalFact {
	productId: number;
	lineId: number | null;
}

/** Open signals with the line and run they came from (signals of no line: lineId null). */
export function openSignalsByLine(db: Db): Map<number | null, OpenSignalOnLine[]> {
	const s = statements(db);
	const rows = s.openSignals.all() as {
		id: number;
		characteristicId: number;
		characteristic: string;
		productId: number;
		rule: string;
		createdAt: number;
		pointKey: string;
		boardIds: string;
		owner: string | null;
	}[];
	const out = new Map<number | null, OpenSignalOnLine[]>();
	for (const r of rows) {
		let boardIds: number[] = [];
		try {
			const parsed = JSON.parse(r.boardIds);
			if (Array.isArray(parsed)) boardIds = parsed.filter((n) => Number.isSafeInteger(n));
		} catch {
			/* stored by the service as JSON; an unreadable list just has no boards */
		}
		const place = placeOfSignal(s, r.id, r.pointKey, boardIds);
		const signal: OpenSignalOnLine = {
			id: r.id,
			characteristicId: r.characteristicId,
			characteristic: r.characteristic,
			rule: r.rule,
			createdAtMs: r.createdAt,
			owner: r.owner,
			printRunId: place.runId,
			boardIds,
			pointKey: r.pointKey,
			productId: r.productId,
			lineId: place.lineId
		};
		const list = out.get(place.lineId) ?? [];
		list.push(signal);
		out.set(place.lineId, list);
	}
	return out;
}

type OpenRun = {
	id: number;
	lineId: number;
	startedAt: number;
	boardsPrinted: number;
	parameters: string;
	stencilId: number | null;
	pasteLotId: number | null;
	productId: number;
	productCode: string;
	productName: string;
};

function wipeInterval(parameters: string): number | null {
	try {
		const v = (JSON.parse(parameters) as Record<string, unknown>)?.wipeIntervalPrints;
		return typeof v === 'number' && Number.isInteger(v) && v >= 0 ? v : null;
	} catch {
		return null;
	}
}

function stencilFacts(
	s: Statements,
	stencilId: number,
	run: OpenRun,
	liveBoards: number
): LineFacts['stencil'] {
	const row = s.stencil.get(stencilId) as
		| {
				id: number;
				name: string;
				revision: string;
				state: string;
				thicknessUm: number;
				ratedLifePrints: number | null;
		  }
		| undefined;
	if (!row) return null;
	const cleaning = s.lastEvent.get(stencilId, 'cleaning') as { at: number } | undefined;
	const cleanedAt = cleaning?.at ?? null;
	let printCount = 0;
	let sinceClean = 0;
	for (const r of s.stencilRuns.all(stencilId) as {
		id: number;
		startedAt: number;
		boardsPrinted: number;
	}[]) {
		const boards = r.id === run.id ? liveBoards : r.boardsPrinted;
		printCount += boards;
		if (cleanedAt === null || r.startedAt >= cleanedAt) sinceClean += boards;
		else if (r.id === run.id) sinceClean += s.runBoardsSince.get(run.id, cleanedAt) as number;
	}
	const tension = s.lastEvent.get(stencilId, 'tension') as
		{ at: number; readings: string | null } | undefined;
	let lastTension: NonNullable<LineFacts['stencil']>['lastTension'] = null;
	if (tension) {
		let readings: number[] = [];
		try {
			readings = JSON.parse(tension.readings ?? '[]');
		} catch {
			readings = [];
		}
		const check = checkTensionReadings(readings);
		if (check.minimumNPerCm !== null) {
			lastTension = { atMs: tension.at, pass: check.pass, minimumNPerCm: check.minimumNPerCm };
		}
	}
	const approvedSides = (s.approvedSides.all(run.productId, row.name) as string[]).filter(
		(side): side is 'top' | 'bottom' => side === 'top' || side === 'bottom'
	);
	return {
		...row,
		printCount,
		printsSinceClean: sinceClean,
		lastCleanAtMs: cleanedAt,
		lastTension,
		approvedSides
	};
}

function lotFacts(s: Statements, lotId: number, nowMs: number): LineFacts['pasteLot'] {
	const row = s.lot.get(lotId) as
		| {
				id: number;
				lotNumber: string;
				expiresOn: string;
				maxOnStencil: number;
				maxOutOfCold: number;
		  }
		| undefined;
	if (!row) return null;
	const events = s.lotEvents.all(lotId) as { event: string; at: number }[];
	const replay = replayPasteEvents(events, nowMs);
	let expiresAtMs: number | null = null;
	try {
		expiresAtMs = lotExpiresAtMs(row.expiresOn);
	} catch {
		expiresAtMs = null;
	}
	return {
		id: row.id,
		lotNumber: row.lotNumber,
		expiresAtMs,
		state: replay.ok ? replay.timeline.state : 'inconsistent',
		onStencilAtMs: replay.ok ? replay.timeline.onStencilAtMs : null,
		maxOnStencilMinutes: row.maxOnStencil,
		outOfColdPeriods: replay.ok ? replay.timeline.outOfColdPeriods : [],
		maxOutOfColdMinutes: row.maxOutOfCold
	};
}

/**
 * The facts of every active line's tile (or only `lineIds`), in line code order.
 * @example loadLineFacts(db, Date.now()).map((f) => f.line.code)
 */
export function loadLineFacts(db: Db, nowMs: number, lineIds?: readonly number[]): LineFacts[] {
	const s = statements(db);
	const wanted = lineIds ? new Set(lineIds) : null;
	const lines = (s.lines.all() as { id: number; code: string; name: string }[]).filter(
		(l) => !wanted || wanted.has(l.id)
	);
	const runs = new Map(
		(s.openRuns.all() as OpenRun[])
			.filter((r) => !wanted || wanted.has(r.lineId))
			.map((r) => [r.lineId, r])
	);
	const signals = openSignalsByLine(db);
	const capability = capabilityStates(
		db,
		[...runs.values()].map((r) => ({ productId: r.productId, lineId: r.lineId }))
	);
	return lines.map((line) => {
		const run = runs.get(line.id) ?? null;
		const boards: BoardFact[] = (
			s.lineBoards.all(line.code) as {
				id: number;
				atMs: number;
				failCount: number;
				v: number | null;
				h: number | null;
				x: number | null;
				y: number | null;
			}[]
		).map((b) => ({
			id: b.id,
			atMs: b.atMs,
			pass: b.failCount === 0,
			volumePctMean: b.v,
			heightUmMean: b.h,
			offsetXUmMean: b.x,
			offsetYUmMean: b.y
		}));
		if (!run) {
			return {
				line,
				run: null,
				lastRunEndedAtMs: (s.lastEnded.get(line.id) as number | null | undefined) ?? null,
				stencil: null,
				pasteLot: null,
				boards,
				targets: { volumePct: VOLUME_TARGET, heightUm: null, offsetUm: OFFSET_TARGET },
				characteristics: [],
				signals: (signals.get(line.id) ?? []).map(stripSignal)
			};
		}
		const liveBoards = Math.max(run.boardsPrinted, s.runBoards.get(run.id) as number);
		const stencil = run.stencilId === null ? null : stencilFacts(s, run.stencilId, run, liveBoards);
		const chars: (CharacteristicFact & { target: number | null })[] =
			capability.get(`${run.productId}:${line.id}`) ?? [];
		const targetOf = (measure: string) =>
			chars.find((c) => c.measure === measure && c.target !== null)?.target ?? null;
		return {
			line,
			run: {
				id: run.id,
				productCode: run.productCode,
				productName: run.productName,
				startedAtMs: run.startedAt,
				boardsPrinted: liveBoards,
				wipeIntervalPrints: wipeInterval(run.parameters)
			},
			lastRunEndedAtMs: null,
			stencil,
			pasteLot: run.pasteLotId === null ? null : lotFacts(s, run.pasteLotId, nowMs),
			boards,
			// SPI volume is % of the aperture's nominal volume (target 100); the nominal height is
			// the foil thickness; offsets aim at 0. A key characteristic's own target wins.
			targets: {
				volumePct: targetOf('volume-pct') ?? VOLUME_TARGET,
				heightUm: targetOf('height-um') ?? stencil?.thicknessUm ?? null,
				offsetUm: OFFSET_TARGET
			},
			characteristics: chars.map(({ target: _t, ...c }) => c),
			signals: (signals.get(line.id) ?? []).map(stripSignal)
		};
	});
}

function stripSignal(s: OpenSignalOnLine): SignalFact {
	const { productId: _p, lineId: _l, ...rest } = s;
	return rest;
}
