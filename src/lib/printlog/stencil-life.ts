/**
 * Stencil states, their allowed transitions and the check of a stencil before a run.
 * State names are Rollbead's own:
 * - `available`: on the rack, clean, ready;
 * - `in-use`: mounted in a printer;
 * - `out-for-cleaning`: off-line in the cleaner;
 * - `quarantined`: held for an engineer's decision (damage, low tension, suspect prints);
 * - `retired`: scrapped or past use for good; final.
 */
import { describeValue } from './field-error';

/** Stencil states. */
export const STENCIL_STATES = [
	'available',
	'in-use',
	'out-for-cleaning',
	'quarantined',
	'retired'
] as const;
/** A stencil state. */
export type StencilState = (typeof STENCIL_STATES)[number];

const ALLOWED: Readonly<Record<StencilState, readonly StencilState[]>> = {
	available: ['in-use', 'out-for-cleaning', 'quarantined', 'retired'],
	'in-use': ['available', 'out-for-cleaning', 'quarantined', 'retired'],
	'out-for-cleaning': ['available', 'quarantined', 'retired'],
	// Leaving quarantine is an engineer's release; straight back into a printer is not allowed.
	quarantined: ['available', 'out-for-cleaning', 'retired'],
	retired: []
};

/** Share of rated life from which a run is warned (Rollbead choice, the 90 %). */
export const STENCIL_LIFE_WARN_PCT = 90;

/**
 * Why a stencil may not move from one state to another, or null when it may.
 * @example stencilTransitionProblem('retired', 'available') // 'a retired stencil cannot change state'
 */
export function stencilTransitionProblem(
	from: StencilState,
	to: StencilState | string
): string | null {
	if (!(STENCIL_STATES as readonly string[]).includes(to)) {
		return `state must be one of ${STENCIL_STATES.join(', ')} (got ${JSON.stringify(to)})`;
	}
	if (from === to) return `the stencil is already ${from}`;
	if (ALLOWED[from].includes(to as StencilState)) return null;
	if (from === 'retired') return 'a retired stencil cannot change state';
	if (from === 'quarantined' && to === 'in-use') {
		return 'a quarantined stencil must be released (to available) by an engineer before use';
	}
	return `a stencil cannot go from ${from} to ${to}`;
}

/** A stencil's situation before a run. `ratedLifePrints` null or absent = no rated life known. */
export interface StencilForRun {
	name?: string;
	state: StencilState;
	printCount: number;
	ratedLifePrints?: number | null;
}

/** One reason with a stable code for the UI. */
export interface StencilReason {
	code:
		| 'retired'
		| 'out-for-cleaning'
		| 'quarantined'
		| 'past-rated-life'
		| 'near-rated-life'
		| 'invalid';
	message: string;
}

/** Outcome of the stencil check. */
export interface StencilAssessment {
	/** First blocking reason, if any. */
	refuse?: StencilReason;
	/** Non-blocking reason (near rated life, or a refusal lifted by an override). */
	warn?: StencilReason;
	/** printCount / ratedLifePrints × 100, or null without a rated life. */
	lifeUsedPct: number | null;
	/** True when an engineer's override with a reason may lift `refuse` (quarantine, past life). */
	canOverride: boolean;
	/** True when an override reason was given and lifted a refusal. */
	overridden: boolean;
}

/**
 * Check a stencil before a run. Refused when retired, out for cleaning, quarantined, or at or
 * past its rated life (printCount ≥ ratedLifePrints: the rated prints are used up, so the run's
 * first print would exceed them); warned from 90 % of rated life. An engineer's override with a
 * non-blank reason lifts a quarantine or rated-life refusal (turning it into a warning), never a
 * retired or out-for-cleaning one.
 * @example assessStencilForRun({ state: 'in-use', printCount: 9000, ratedLifePrints: 10000 })
 * // { warn: { code: 'near-rated-life', message: 'stencil has used 90 % of its rated life (9000 of 10000 prints)' }, lifeUsedPct: 90, canOverride: false, overridden: false }
 */
export function assessStencilForRun(
	stencil: StencilForRun,
	overrideReason?: string | null
): StencilAssessment {
	const name = stencil.name ? `stencil ${stencil.name}` : 'stencil';
	const { state, printCount, ratedLifePrints } = stencil;
	const invalid = (message: string): StencilAssessment => ({
		refuse: { code: 'invalid', message },
		lifeUsedPct: null,
		canOverride: false,
		overridden: false
	});
	if (!(STENCIL_STATES as readonly string[]).includes(state)) {
		const states = STENCIL_STATES.join(', ');
		return invalid(`${name}: state must be one of ${states} (got ${describeValue(state)})`);
	}
	if (!isWholeNumber(printCount) || printCount < 0) {
		const got = describeValue(printCount);
		return invalid(`${name}: printCount must be a whole number ≥ 0 (got ${got})`);
	}
	const hasLife = ratedLifePrints !== null && ratedLifePrints !== undefined;
	if (hasLife && (!isWholeNumber(ratedLifePrints) || ratedLifePrints <= 0)) {
		const got = describeValue(ratedLifePrints);
		return invalid(`${name}: ratedLifePrints must be a whole number > 0 (got ${got})`);
	}
	const lifeUsedPct = hasLife ? (printCount / (ratedLifePrints as number)) * 100 : null;
	const lifeText = hasLife ? `${printCount} of ${ratedLifePrints} prints` : '';

	// Each refusal: its code, what is wrong, and what to do; the first applicable one wins.
	let refusal: { code: StencilReason['code']; what: string; todo: string } | undefined;
	let canOverride = false;
	if (state === 'retired') {
		refusal = { code: 'retired', what: `${name} is retired`, todo: 'use another stencil' };
	} else if (state === 'out-for-cleaning') {
		refusal = {
			code: 'out-for-cleaning',
			what: `${name} is out for cleaning`,
			todo: 'log it back as available first'
		};
	} else if (state === 'quarantined') {
		refusal = {
			code: 'quarantined',
			what: `${name} is quarantined`,
			todo: 'an engineer must release it or override with a reason'
		};
		canOverride = true;
	} else if (lifeUsedPct !== null && lifeUsedPct >= 100) {
		refusal = {
			code: 'past-rated-life',
			what: `${name} has reached its rated life (${lifeText})`,
			todo: 'an engineer must override with a reason'
		};
		canOverride = true;
	}

	let warn: StencilReason | undefined;
	const nearLife = lifeUsedPct !== null && lifeUsedPct >= STENCIL_LIFE_WARN_PCT;
	if (lifeUsedPct !== null && nearLife && refusal?.code !== 'past-rated-life') {
		warn = {
			code: lifeUsedPct >= 100 ? 'past-rated-life' : 'near-rated-life',
			message: `${name} has used ${formatPct(lifeUsedPct)} % of its rated life (${lifeText})`
		};
	}
	const reason = typeof overrideReason === 'string' ? overrideReason.trim() : '';
	if (refusal && canOverride && reason !== '') {
		const extra = warn ? `; ${warn.message}` : '';
		return {
			warn: { code: refusal.code, message: `${refusal.what}; overridden: ${reason}${extra}` },
			lifeUsedPct,
			canOverride,
			overridden: true
		};
	}
	const refuse = refusal && { code: refusal.code, message: `${refusal.what}: ${refusal.todo}` };
	return {
		...(refuse && { refuse }),
		...(warn && { warn }),
		lifeUsedPct,
		canOverride,
		overridden: false
	};
}

/** True for a finite whole number (narrows the type). */
function isWholeNumber(value: unknown): value is number {
	return typeof value === 'number' && Number.isInteger(value);
}

/** Percent for messages: one decimal, trailing .0 dropped. */
function formatPct(pct: number): string {
	return (Math.floor(pct * 10) / 10).toFixed(1).replace(/\.0$/, '');
}
