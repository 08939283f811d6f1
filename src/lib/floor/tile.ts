/**
 * The line tile: what the print floor sees of one line at a glance, computed from plain facts
 * (the open run, its stencil and paste lot, the last boards' SPI results, open signals and the
 * key characteristics' capability). Pure: no database, no clock (the caller passes `nowMs`).
 *
 * Words are Rollbead's own. A line is
 * - `printing`: a run is open, boards come in and nothing needs anyone;
 * - `attention`: a run is open but something wants a look (an open signal, a check due, a low
 *   pass rate, a limit coming up);
 * - `stopped`: a run is open but the line cannot go on as it is (paste over its time on the
 *   stencil, lot expired, stencil past its life or out of use) or no board came for a while;
 * - `idle`: no run is open.
 * A due item is `ok`, `soon`, `due` (now) or `late` (past its limit).
 */

import { minutesOutOfCold } from '../printlog/paste-events';

/** Line states, in the order of urgency used to sort tiles. */
export const LINE_STATES = ['stopped', 'attention', 'printing', 'idle'] as const;
export type LineState = (typeof LINE_STATES)[number];

/** The word shown beside each state's colour. */
export const LINE_STATE_WORDS: Readonly<Record<LineState, string>> = {
	printing: 'printing',
	attention: 'attention',
	stopped: 'stopped',
	idle: 'idle'
};

export const DUE_STATUSES = ['late', 'due', 'soon', 'ok'] as const;
export type DueStatus = (typeof DUE_STATUSES)[number];

export const DUE_STATUS_WORDS: Readonly<Record<DueStatus, string>> = {
	late: 'late',
	due: 'due now',
	soon: 'soon',
	ok: 'ok'
};

/** Thresholds of the tile. Defaults are Rollbead choices (see FLOOR_DEFAULTS); sites may set them. */
export interface FloorSettings {
	/** Off-line stencil clean after this many prints since the last clean. */
	stencilCleanEveryPrints: number;
	/** … or after this many hours since the last clean, whichever comes first. */
	stencilCleanEveryHours: number;
	/** Tension check interval in days since the last reading (never measured: due now). */
	tensionCheckEveryDays: number;
	/** A run with no new board for this long counts as stopped. */
	stallMinutes: number;
	/** Paste on the stencil: `soon` within this many minutes of its limit. */
	pasteSoonMinutes: number;
	/** Lot expiry: `soon` within this many hours. */
	lotExpirySoonHours: number;
	/** Stencil clean: `soon` within this many prints of the interval. */
	cleanSoonPrints: number;
	/** Tension check: `soon` within this many days. */
	tensionSoonDays: number;
	/** Stencil life: `soon` from this share of rated life (the print log warns at 90 %). */
	stencilLifeSoonPct: number;
	/** Pass rate of the last 10 boards below this (percent) asks for attention. */
	passRateAttentionPct: number;
}

/**
 * Rollbead choices, not standards: an off-line clean every 2,000 prints or 24 h (common shop
 * practice is per shift or per run); a tension reading every 30 days; 10 min without a board
 * counts as stopped; 60 min warning before the paste's on-stencil limit; 24 h before a lot
 * expires; 90 % of rated stencil life as in the print log; a 90 % pass rate.
 */
export const FLOOR_DEFAULTS: Readonly<FloorSettings> = Object.freeze({
	stencilCleanEveryPrints: 2000,
	stencilCleanEveryHours: 24,
	tensionCheckEveryDays: 30,
	stallMinutes: 10,
	pasteSoonMinutes: 60,
	lotExpirySoonHours: 24,
	cleanSoonPrints: 200,
	tensionSoonDays: 3,
	stencilLifeSoonPct: 90,
	passRateAttentionPct: 90
});

/** One inspected board, newest first in `LineFacts.boards`. */
export interface BoardFact {
	id: number;
	atMs: number;
	/** True when no pad failed. */
	pass: boolean;
	volumePctMean: number | null;
	heightUmMean: number | null;
	offsetXUmMean: number | null;
	offsetYUmMean: number | null;
}

/** Everything the tile is computed from. Times are epoch milliseconds. */
export interface LineFacts {
	line: { id: number; code: string; name: string };
	run: {
		id: number;
		productCode: string;
		productName: string;
		startedAtMs: number;
		/** Boards printed so far: the larger of the logged count and the boards SPI linked to it. */
		boardsPrinted: number;
		/** Wipe interval from the run's parameters (0 = automatic wiping off; null = not logged). */
		wipeIntervalPrints: number | null;
	} | null;
	/** When the line's last run ended (idle since), if any. */
	lastRunEndedAtMs: number | null;
	stencil: {
		id: number;
		name: string;
		revision: string;
		state: string;
		thicknessUm: number;
		ratedLifePrints: number | null;
		printCount: number;
		printsSinceClean: number;
		/** Last clean, else when the stencil came into use (its first run), else null. */
		lastCleanAtMs: number | null;
		lastTension: { atMs: number; pass: boolean; minimumNPerCm: number } | null;
		/** Sides this stencil is approved to print for the run's product (product fit). */
		approvedSides?: readonly ('top' | 'bottom')[];
	} | null;
	pasteLot: {
		id: number;
		lotNumber: string;
		expiresAtMs: number | null;
		state: string;
		onStencilAtMs: number | null;
		maxOnStencilMinutes: number;
		/** Periods out of cold storage (`toMs` null while still out), so the time out moves with `nowMs`. */
		outOfColdPeriods: { fromMs: number; toMs: number | null }[];
		maxOutOfColdMinutes: number;
	} | null;
	/** The line's last boards (up to 100), newest first. */
	boards: BoardFact[];
	/** Targets of the board means: volume % of nominal, height µm (stencil thickness), offset µm. */
	targets: { volumePct: number | null; heightUm: number | null; offsetUm: number | null };
	characteristics: CharacteristicFact[];
	signals: SignalFact[];
}

export interface CharacteristicFact {
	id: number;
	name: string;
	measure: string;
	/** Capability level from the assessment: not-capable | marginal | capable | highly-capable | undefined. */
	level: string;
	cpk: number | null;
	ppk: number | null;
	openSignals: number;
}

export interface SignalFact {
	id: number;
	characteristicId: number;
	characteristic: string;
	rule: string;
	createdAtMs: number;
	owner: string | null;
	printRunId: number | null;
	boardIds: number[];
	pointKey: string;
}

/** A check that is due now, soon or later. */
export interface DueItem {
	key:
		| 'paste-on-stencil'
		| 'lot-expiry'
		| 'paste-out-of-cold'
		| 'stencil-clean'
		| 'tension-check'
		| 'stencil-life'
		| 'stencil-state'
		| 'wipe';
	label: string;
	status: DueStatus;
	/** Prints left until it is due (negative: over by that many). */
	remainingPrints?: number;
	/** Minutes left until it is due (negative: over by that many). */
	remainingMinutes?: number;
	/** A sentence for the floor. */
	text: string;
}

/** A measure's mean over the last boards against its target. */
export interface MeanFigure {
	mean: number | null;
	target: number | null;
	/** Boards the mean is over (those with a value). */
	boards: number;
}

/** The tile as the overview API and the stream send it. */
export interface LineTile {
	lineId: number;
	lineCode: string;
	lineName: string;
	state: LineState;
	stateWord: string;
	/** Why the line is in its state, most urgent first. */
	reasons: string[];
	product: { code: string; name: string } | null;
	/** top / bottom from the stencil's name (-T, -B), else null (not recorded). */
	side: 'top' | 'bottom' | null;
	run: {
		id: number;
		startedAt: string;
		boardsPrinted: number;
		lastBoardAt: string | null;
		minutesSinceLastBoard: number | null;
	} | null;
	idleSince: string | null;
	stencil: {
		id: number;
		name: string;
		revision: string;
		state: string;
		printCount: number;
		printsSinceClean: number;
		cleanEveryPrints: number;
		ratedLifePrints: number | null;
		lifeUsedPct: number | null;
		lastTensionAt: string | null;
		tensionDueAt: string;
	} | null;
	paste: {
		id: number;
		lotNumber: string;
		state: string;
		minutesOnStencil: number | null;
		maxOnStencilMinutes: number;
		minutesToExpiry: number | null;
		expiresAt: string | null;
	} | null;
	spi: {
		boards: number;
		passRateLast10Pct: number | null;
		passRateLast100Pct: number | null;
		last10Boards: number;
		last100Boards: number;
		lastBoardAt: string | null;
		volumePct: MeanFigure;
		heightUm: MeanFigure;
		offsetXUm: MeanFigure;
		offsetYUm: MeanFigure;
	};
	characteristics: CharacteristicFact[];
	signals: (Omit<SignalFact, 'createdAtMs'> & { createdAt: string; ageMinutes: number })[];
	/** Checks, most urgent first (late, due, soon, ok), then by what is left. */
	due: DueItem[];
}

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;

const iso = (ms: number | null | undefined) =>
	ms === null || ms === undefined ? null : new Date(ms).toISOString();

/**
 * The side a stencil prints, from a name ending in -T/-TOP or -B/-BOT/-BOTTOM (Rollbead's
 * naming convention for sided stencils), else null.
 * @example stencilSide('ST-PB100-T') // 'top'
 */
export function stencilSide(name: string | null | undefined): 'top' | 'bottom' | null {
	if (!name) return null;
	if (/[-_ ](T|TOP)$/i.test(name.trim())) return 'top';
	if (/[-_ ](B|BOT|BOTTOM)$/i.test(name.trim())) return 'bottom';
	return null;
}

/**
 * The side being printed: the one side the stencil is approved for on this product, else the
 * side its name says (a stencil approved for both sides, or not approved yet, falls back to it).
 */
export function runSide(
	stencil: Pick<NonNullable<LineFacts['stencil']>, 'name' | 'approvedSides'> | null
): 'top' | 'bottom' | null {
	const sides = stencil?.approvedSides ?? [];
	if (sides.length === 1) return sides[0];
	return stencilSide(stencil?.name);
}

/** Status of a remaining amount: below 0 late, 0 due, within `soon` soon, else ok. */
export function dueStatus(remaining: number, soon: number): DueStatus {
	if (remaining < 0) return 'late';
	if (remaining === 0) return 'due';
	return remaining <= soon ? 'soon' : 'ok';
}

/** Minutes for sentences: 45 min, 3 h 20 min, 2 d 4 h. */
export function wordsForMinutes(minutes: number): string {
	const m = Math.round(Math.abs(minutes));
	if (m < 60) return `${m} min`;
	if (m < 48 * 60) {
		const h = Math.floor(m / 60);
		const rest = m % 60;
		return rest ? `${h} h ${rest} min` : `${h} h`;
	}
	const d = Math.floor(m / (24 * 60));
	const h = Math.floor((m % (24 * 60)) / 60);
	return h ? `${d} d ${h} h` : `${d} d`;
}

const plural = (n: number, word: string) => `${n} ${word}${Math.abs(n) === 1 ? '' : 's'}`;

/** Pass rate of the first `n` boards (newest first), percent, or null without boards. */
export function passRatePct(boards: readonly BoardFact[], n: number): number | null {
	const slice = boards.slice(0, n);
	if (slice.length === 0) return null;
	return (slice.filter((b) => b.pass).length / slice.length) * 100;
}

function meanOf(
	boards: readonly BoardFact[],
	pick: (b: BoardFact) => number | null,
	target: number | null
): MeanFigure {
	let sum = 0;
	let count = 0;
	for (const b of boards) {
		const v = pick(b);
		if (v === null || !Number.isFinite(v)) continue;
		sum += v;
		count++;
	}
	return { mean: count ? sum / count : null, target, boards: count };
}

/**
 * Every check of the line's open run: paste time on the stencil and out of cold storage, lot
 * expiry, stencil clean, tension check, stencil life and state, and the next wipe. Without an
 * open run only the stencil and lot checks of what was last mounted are left out: nothing is due.
 */
export function dueItems(
	facts: LineFacts,
	nowMs: number,
	settings: FloorSettings = FLOOR_DEFAULTS
): DueItem[] {
	const items: DueItem[] = [];
	const { run, pasteLot: lot, stencil } = facts;
	if (!run) return items;

	if (lot) {
		if (lot.onStencilAtMs !== null && lot.state === 'on-stencil') {
			const on = (nowMs - lot.onStencilAtMs) / MINUTE;
			const left = Math.floor(lot.maxOnStencilMinutes - on);
			const status = dueStatus(left, settings.pasteSoonMinutes);
			items.push({
				key: 'paste-on-stencil',
				label: 'Paste time on stencil',
				status,
				remainingMinutes: left,
				text:
					left < 0
						? `paste ${lot.lotNumber} is ${wordsForMinutes(-left)} over its ${wordsForMinutes(lot.maxOnStencilMinutes)} on the stencil: replace it`
						: `paste ${lot.lotNumber} on the stencil ${wordsForMinutes(on)} of ${wordsForMinutes(lot.maxOnStencilMinutes)}: ${wordsForMinutes(left)} left`
			});
		}
		const outMinutes = minutesOutOfCold({ outOfColdPeriods: lot.outOfColdPeriods }, nowMs);
		if (lot.state !== 'discarded' && outMinutes > 0) {
			const left = Math.floor(lot.maxOutOfColdMinutes - outMinutes);
			items.push({
				key: 'paste-out-of-cold',
				label: 'Paste time out of cold storage',
				status: dueStatus(left, settings.pasteSoonMinutes),
				remainingMinutes: left,
				text:
					left < 0
						? `paste ${lot.lotNumber} has been out of cold storage ${wordsForMinutes(-left)} too long`
						: `paste ${lot.lotNumber} out of cold storage: ${wordsForMinutes(left)} left`
			});
		}
		if (lot.expiresAtMs !== null) {
			const left = Math.floor((lot.expiresAtMs - nowMs) / MINUTE);
			// Expiry is an instant: at it the lot is expired (assessLotForRun: now ≥ expiry).
			const status: DueStatus =
				left <= 0 && nowMs >= lot.expiresAtMs
					? 'late'
					: dueStatus(left, settings.lotExpirySoonHours * 60);
			items.push({
				key: 'lot-expiry',
				label: 'Lot expiry',
				status,
				remainingMinutes: left,
				text:
					status === 'late'
						? `paste lot ${lot.lotNumber} expired ${wordsForMinutes(-left)} ago`
						: `paste lot ${lot.lotNumber} expires in ${wordsForMinutes(left)}`
			});
		}
	}

	if (stencil) {
		const byPrints = settings.stencilCleanEveryPrints - stencil.printsSinceClean;
		const byHours =
			stencil.lastCleanAtMs === null
				? null
				: Math.floor(
						(stencil.lastCleanAtMs + settings.stencilCleanEveryHours * HOUR - nowMs) / MINUTE
					);
		const printsStatus = dueStatus(byPrints, settings.cleanSoonPrints);
		const hoursStatus = byHours === null ? 'ok' : dueStatus(byHours, 60);
		const worse = rank(printsStatus) <= rank(hoursStatus) ? 'prints' : 'hours';
		items.push({
			key: 'stencil-clean',
			label: 'Stencil clean',
			status: worse === 'prints' ? printsStatus : hoursStatus,
			remainingPrints: byPrints,
			...(byHours !== null && { remainingMinutes: byHours }),
			text:
				worse === 'prints'
					? byPrints < 0
						? `stencil ${stencil.name} is ${plural(-byPrints, 'print')} past its clean (every ${settings.stencilCleanEveryPrints})`
						: `stencil clean in ${plural(byPrints, 'print')} (${stencil.printsSinceClean} since the last)`
					: byHours! < 0
						? `stencil ${stencil.name} was last cleaned more than ${settings.stencilCleanEveryHours} h ago`
						: `stencil clean due in ${wordsForMinutes(byHours!)}`
		});

		const tensionLeft =
			stencil.lastTension === null
				? null
				: Math.floor(
						(stencil.lastTension.atMs + settings.tensionCheckEveryDays * DAY - nowMs) / MINUTE
					);
		if (stencil.lastTension && !stencil.lastTension.pass) {
			items.push({
				key: 'tension-check',
				label: 'Tension check',
				status: 'late',
				remainingMinutes: tensionLeft ?? 0,
				text: `last tension reading failed (lowest ${stencil.lastTension.minimumNPerCm} N/cm): measure again or take the stencil off`
			});
		} else {
			items.push({
				key: 'tension-check',
				label: 'Tension check',
				status:
					tensionLeft === null ? 'due' : dueStatus(tensionLeft, settings.tensionSoonDays * 24 * 60),
				...(tensionLeft !== null && { remainingMinutes: tensionLeft }),
				text:
					tensionLeft === null
						? `no tension reading for stencil ${stencil.name}: measure it`
						: tensionLeft < 0
							? `tension check ${wordsForMinutes(-tensionLeft)} overdue`
							: `tension check in ${wordsForMinutes(tensionLeft)}`
			});
		}

		if (stencil.ratedLifePrints) {
			const left = stencil.ratedLifePrints - stencil.printCount;
			const usedPct = (stencil.printCount / stencil.ratedLifePrints) * 100;
			const status: DueStatus =
				left <= 0 ? 'late' : usedPct >= settings.stencilLifeSoonPct ? 'soon' : 'ok';
			items.push({
				key: 'stencil-life',
				label: 'Stencil life',
				status,
				remainingPrints: left,
				text:
					left <= 0
						? `stencil ${stencil.name} has reached its rated life (${stencil.printCount} of ${stencil.ratedLifePrints} prints)`
						: `stencil life ${Math.floor(usedPct)} % used: ${plural(left, 'print')} left`
			});
		}
		if (['quarantined', 'retired', 'out-for-cleaning'].includes(stencil.state)) {
			items.push({
				key: 'stencil-state',
				label: 'Stencil state',
				status: 'late',
				text: `stencil ${stencil.name} is ${stencil.state} but the run is open`
			});
		}
	}

	if (run.wipeIntervalPrints !== null && run.wipeIntervalPrints > 0) {
		const interval = run.wipeIntervalPrints;
		const left = interval - (run.boardsPrinted % interval);
		items.push({
			key: 'wipe',
			label: 'Under-stencil wipe',
			// The printer wipes by itself: the next wipe is information, never late.
			status: 'ok',
			remainingPrints: left,
			text: `wipe in ${plural(left, 'print')} (every ${interval})`
		});
	}

	return items.sort(
		(a, b) =>
			rank(a.status) - rank(b.status) ||
			remainingOrder(a) - remainingOrder(b) ||
			a.key.localeCompare(b.key)
	);
}

function rank(status: DueStatus): number {
	return DUE_STATUSES.indexOf(status);
}

/** Comparable "how soon" across prints and minutes (a print ≈ half a minute on a line). */
function remainingOrder(item: DueItem): number {
	const byMinutes = item.remainingMinutes ?? Infinity;
	const byPrints = item.remainingPrints === undefined ? Infinity : item.remainingPrints * 0.5;
	return Math.min(byMinutes, byPrints);
}

/** Due items whose lateness stops the line (the others ask for attention). */
const STOPPING: ReadonlySet<DueItem['key']> = new Set([
	'paste-on-stencil',
	'lot-expiry',
	'stencil-life',
	'stencil-state'
]);

/**
 * The tile of one line at `nowMs`.
 * @example lineTile(facts, Date.now()).state // 'printing'
 */
export function lineTile(
	facts: LineFacts,
	nowMs: number,
	settings: FloorSettings = FLOOR_DEFAULTS
): LineTile {
	const due = dueItems(facts, nowMs, settings);
	const { run, stencil, pasteLot: lot, boards } = facts;
	const runBoards = run ? boards.filter((b) => b.atMs >= run.startedAtMs) : [];
	const lastBoardMs = boards[0]?.atMs ?? null;
	const lastRunBoardMs = runBoards[0]?.atMs ?? null;

	const reasons: { urgency: number; text: string }[] = [];
	let state: LineState;
	if (!run) {
		state = 'idle';
		reasons.push({
			urgency: 9,
			text: facts.lastRunEndedAtMs ? 'no run open' : 'no run logged yet'
		});
	} else {
		for (const item of due) {
			if (item.status === 'late')
				reasons.push({ urgency: STOPPING.has(item.key) ? 0 : 2, text: item.text });
			else if (item.status === 'due') reasons.push({ urgency: 3, text: item.text });
		}
		const since = lastRunBoardMs ?? run.startedAtMs;
		const quietMinutes = (nowMs - since) / MINUTE;
		if (quietMinutes >= settings.stallMinutes) {
			reasons.push({
				urgency: 1,
				text:
					lastRunBoardMs === null
						? `no board inspected since the run started ${wordsForMinutes(quietMinutes)} ago`
						: `no board for ${wordsForMinutes(quietMinutes)}`
			});
		}
		const open = facts.signals.length;
		if (open > 0) reasons.push({ urgency: 2, text: `${plural(open, 'open signal')}` });
		const rate10 = passRatePct(boards, 10);
		if (rate10 !== null && rate10 < settings.passRateAttentionPct) {
			reasons.push({
				urgency: 2,
				text: `pass rate of the last ${Math.min(10, boards.length)} boards ${Math.round(rate10)} %`
			});
		}
		for (const item of due)
			if (item.status === 'soon') reasons.push({ urgency: 4, text: item.text });
		const worst = Math.min(...reasons.map((r) => r.urgency), 99);
		state = worst <= 1 ? 'stopped' : worst <= 3 ? 'attention' : 'printing';
	}
	reasons.sort((a, b) => a.urgency - b.urgency);

	const last100 = boards.slice(0, 100);
	const t = facts.targets;
	return {
		lineId: facts.line.id,
		lineCode: facts.line.code,
		lineName: facts.line.name,
		state,
		stateWord: LINE_STATE_WORDS[state],
		reasons: reasons.map((r) => r.text),
		product: run ? { code: run.productCode, name: run.productName } : null,
		side: run ? runSide(stencil) : null,
		run: run
			? {
					id: run.id,
					startedAt: iso(run.startedAtMs)!,
					boardsPrinted: run.boardsPrinted,
					lastBoardAt: iso(lastRunBoardMs),
					minutesSinceLastBoard:
						lastRunBoardMs === null ? null : Math.floor((nowMs - lastRunBoardMs) / MINUTE)
				}
			: null,
		idleSince: run ? null : iso(facts.lastRunEndedAtMs),
		stencil:
			run && stencil
				? {
						id: stencil.id,
						name: stencil.name,
						revision: stencil.revision,
						state: stencil.state,
						printCount: stencil.printCount,
						printsSinceClean: stencil.printsSinceClean,
						cleanEveryPrints: settings.stencilCleanEveryPrints,
						ratedLifePrints: stencil.ratedLifePrints,
						lifeUsedPct: stencil.ratedLifePrints
							? (stencil.printCount / stencil.ratedLifePrints) * 100
							: null,
						lastTensionAt: iso(stencil.lastTension?.atMs),
						tensionDueAt: iso(
							stencil.lastTension
								? stencil.lastTension.atMs + settings.tensionCheckEveryDays * DAY
								: nowMs
						)!
					}
				: null,
		paste:
			run && lot
				? {
						id: lot.id,
						lotNumber: lot.lotNumber,
						state: lot.state,
						minutesOnStencil:
							lot.onStencilAtMs !== null && lot.state === 'on-stencil'
								? Math.floor((nowMs - lot.onStencilAtMs) / MINUTE)
								: null,
						maxOnStencilMinutes: lot.maxOnStencilMinutes,
						minutesToExpiry:
							lot.expiresAtMs === null ? null : Math.floor((lot.expiresAtMs - nowMs) / MINUTE),
						expiresAt: iso(lot.expiresAtMs)
					}
				: null,
		spi: {
			boards: boards.length,
			passRateLast10Pct: passRatePct(boards, 10),
			passRateLast100Pct: passRatePct(boards, 100),
			last10Boards: Math.min(10, boards.length),
			last100Boards: last100.length,
			lastBoardAt: iso(lastBoardMs),
			volumePct: meanOf(last100, (b) => b.volumePctMean, t.volumePct),
			heightUm: meanOf(last100, (b) => b.heightUmMean, t.heightUm),
			offsetXUm: meanOf(last100, (b) => b.offsetXUmMean, t.offsetUm),
			offsetYUm: meanOf(last100, (b) => b.offsetYUmMean, t.offsetUm)
		},
		characteristics: facts.characteristics,
		signals: facts.signals
			.map(({ createdAtMs, ...s }) => ({
				...s,
				createdAt: iso(createdAtMs)!,
				ageMinutes: Math.floor((nowMs - createdAtMs) / MINUTE)
			}))
			.sort((a, b) => b.ageMinutes - a.ageMinutes),
		due
	};
}

/** Tiles in the overview's order: stopped, attention, printing, idle; then by line code. */
export function sortTiles<T extends Pick<LineTile, 'state' | 'lineCode'>>(
	tiles: readonly T[]
): T[] {
	return [...tiles].sort(
		(a, b) =>
			LINE_STATES.indexOf(a.state) - LINE_STATES.indexOf(b.state) ||
			a.lineCode.localeCompare(b.lineCode, 'en', { numeric: true })
	);
}
