/**
 * Can this paste lot be used for a print run now? Combines the lot's expiry with its handling
 * history and the paste's room-temperature limits. Refusals block the run; warnings are shown
 * and recorded but let the technician go on.
 */
import { describeValue, PrintlogInputError } from './field-error';
import type { PasteHandlingSettings, PasteLot } from './paste-lot';
import { lotExpiresAtMs } from './paste-lot';
import type { PasteEvent } from './paste-events';
import { formatMinutes, minutesOutOfCold, replayPasteEvents } from './paste-events';
import type { Instant } from './to-epoch-ms';
import { toEpochMs } from './to-epoch-ms';

/** One reason to refuse or warn, with a stable code for the UI and a sentence for people. */
export interface LotReason {
	code:
		| 'expired'
		| 'discarded'
		| 'invalid-lot'
		| 'invalid-history'
		| 'never-out-of-cold-storage'
		| 'back-in-cold-storage'
		| 'warming-up'
		| 'over-time-on-stencil'
		| 'over-time-out-of-cold';
	message: string;
	/** An engineer may use the lot anyway with a note (expired, over its time on the stencil). */
	canOverride?: boolean;
}

/** Result of assessing a lot: refuse reasons block the run, warn reasons are shown. */
export interface LotAssessment {
	refuse: LotReason[];
	warn: LotReason[];
}

/**
 * Assess a paste lot for a run at time `at`. Boundaries: a lot is usable through its expiry day
 * (see lotExpiresAtMs); warm-up is complete at exactly `warmUpMinutes`; time on the stencil and
 * out of cold storage are over only when strictly longer than their limits.
 * - refuse: expired or over its time on the stencil (an engineer may override these with a
 *   note: `canOverride`); discarded; unreadable expiry; inconsistent event history.
 * - warn: never taken out of cold storage (or put back); still warming up; over total time out
 *   of cold storage.
 * @throws {PrintlogInputError} when `at` is not a valid instant.
 * @example
 * assessLotForRun(lot, [{ event: 'out-of-cold-storage', at: '2026-03-02T06:00:00Z' }], DEFAULT_PASTE_HANDLING, '2026-03-02T09:00:00Z').warn[0].code // 'warming-up'
 */
export function assessLotForRun(
	lot: Pick<PasteLot, 'lotNumber' | 'expiresOn'>,
	events: readonly PasteEvent[],
	settings: PasteHandlingSettings,
	at: Instant
): LotAssessment {
	const atMs = toEpochMs(at, 'at');
	for (const key of ['warmUpMinutes', 'maxOnStencilMinutes', 'maxOutOfColdMinutes'] as const) {
		const value = settings[key];
		if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
			throw new PrintlogInputError([
				{
					field: `settings.${key}`,
					message: `must be a number of minutes > 0 (got ${describeValue(value)})`
				}
			]);
		}
	}
	const refuse: LotReason[] = [];
	const warn: LotReason[] = [];
	const lotName = `paste lot ${lot.lotNumber}`;

	let expiresAtMs: number | null = null;
	try {
		expiresAtMs = lotExpiresAtMs(lot.expiresOn);
	} catch {
		refuse.push({
			code: 'invalid-lot',
			message: `${lotName} has no readable expiry date (got ${describeValue(lot.expiresOn)})`
		});
	}
	if (expiresAtMs !== null && atMs >= expiresAtMs) {
		refuse.push({
			code: 'expired',
			message: `${lotName} expired (expiry ${lot.expiresOn})`,
			canOverride: true
		});
	}

	const replay = replayPasteEvents(events, atMs);
	if (!replay.ok) {
		const detail = replay.errors.map((e) => `${e.field}: ${e.message}`).join('; ');
		refuse.push({
			code: 'invalid-history',
			message: `${lotName} has an inconsistent handling log: ${detail}`
		});
		return { refuse, warn };
	}
	const { timeline } = replay;
	if (timeline.state === 'discarded') {
		const discardedAt = new Date(timeline.discardedAtMs ?? atMs).toISOString();
		refuse.push({ code: 'discarded', message: `${lotName} was discarded at ${discardedAt}` });
		return { refuse, warn };
	}
	if (timeline.state === 'cold-storage') {
		const todo = `log it out and let it warm up for ${formatMinutes(settings.warmUpMinutes)} before opening`;
		if (timeline.outOfColdPeriods.length === 0) {
			warn.push({
				code: 'never-out-of-cold-storage',
				message: `${lotName} was never logged out of cold storage: ${todo}`
			});
		} else {
			warn.push({
				code: 'back-in-cold-storage',
				message: `${lotName} was returned to cold storage: ${todo}`
			});
		}
	} else {
		const currentPeriod = timeline.outOfColdPeriods[timeline.outOfColdPeriods.length - 1];
		const warmedMinutes = (atMs - currentPeriod.fromMs) / 60_000;
		if (warmedMinutes < settings.warmUpMinutes) {
			const progress = `${formatMinutes(warmedMinutes)} of ${formatMinutes(settings.warmUpMinutes)}`;
			warn.push({
				code: 'warming-up',
				message: `${lotName} is still warming up: ${progress} since it left cold storage`
			});
		}
	}
	if (timeline.onStencilAtMs !== null) {
		const onStencilMinutes = (atMs - timeline.onStencilAtMs) / 60_000;
		if (onStencilMinutes > settings.maxOnStencilMinutes) {
			const limit = formatMinutes(settings.maxOnStencilMinutes);
			refuse.push({
				code: 'over-time-on-stencil',
				message: `${lotName} has been on the stencil for ${formatMinutes(onStencilMinutes)}, over the ${limit} limit`,
				canOverride: true
			});
		}
	}
	const outMinutes = minutesOutOfCold(timeline, atMs);
	if (outMinutes > settings.maxOutOfColdMinutes) {
		const limit = formatMinutes(settings.maxOutOfColdMinutes);
		warn.push({
			code: 'over-time-out-of-cold',
			message: `${lotName} has been out of cold storage for ${formatMinutes(outMinutes)} in total, over the ${limit} limit`
		});
	}
	return { refuse, warn };
}
