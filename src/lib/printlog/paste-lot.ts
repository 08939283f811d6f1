/**
 * Solder paste lot model and its handling settings. A lot record is what the technician scans
 * at the printer: lot number, alloy, J-STD-005 powder type, J-STD-004 flux class, container
 * size and dates. Handling limits default to common practice (REFERENCE-FACTS §e "Paste
 * handling") and are meant to be edited from the paste data sheet; see
 * reference/printlog/defaults.md.
 */
import type { FieldError } from './field-error';
import { describeValue } from './field-error';
import { toEpochMs } from './to-epoch-ms';

/** A paste lot as stored and sent to the API. Dates are ISO 8601 (`2026-06-30`). */
export interface PasteLot {
	lotNumber: string;
	/** Alloy designation, e.g. `SAC305`, `Sn63Pb37`, `Sn42Bi58`. */
	alloy: string;
	/** IPC J-STD-005 powder type 1–8. */
	powderType: number;
	/** IPC J-STD-004 flux classification, e.g. `ROL0`; optional. */
	fluxClass?: string | null;
	containerGrams?: number | null;
	receivedOn?: string | null;
	/** Last day of use (date) or the exact expiry instant (date-time with zone). */
	expiresOn: string;
}

/** Room-temperature handling limits for a paste, in minutes. */
export interface PasteHandlingSettings {
	/** Minimum time between leaving cold storage and opening, so no condensation forms inside. */
	warmUpMinutes: number;
	/** Maximum time on the stencil ("stencil life" of the paste). */
	maxOnStencilMinutes: number;
	/** Maximum total time out of cold storage, summed over every period out. */
	maxOutOfColdMinutes: number;
}

/**
 * Common-practice defaults: warm-up 4 h (REFERENCE-FACTS §e, typical, 2–8 h by jar size),
 * 8 h on the stencil (upper end of the typical 4–8 h), 24 h out of cold storage (a Rollbead
 * choice, common practice, no sourced figure). Replace them with the data sheet's figures.
 */
export const DEFAULT_PASTE_HANDLING: Readonly<PasteHandlingSettings> = Object.freeze({
	warmUpMinutes: 4 * 60,
	maxOnStencilMinutes: 8 * 60,
	maxOutOfColdMinutes: 24 * 60
});

/** Plausibility ceilings for the handling settings (Rollbead choice, catches h/min mix-ups). */
const SETTING_CEILING_MINUTES: Readonly<PasteHandlingSettings> = {
	warmUpMinutes: 48 * 60,
	maxOnStencilMinutes: 72 * 60,
	maxOutOfColdMinutes: 30 * 24 * 60
};

/**
 * IPC J-STD-004 flux classification: composition RO (rosin), RE (resin), OR (organic),
 * IN (inorganic); activity L, M, H; halide 0 or 1 (from memory; e.g. ROL0, REL0, ORM1).
 */
export const FLUX_CLASS_PATTERN = /^(RO|RE|OR|IN)(L|M|H)(0|1)$/i;

/** Alloy designations: letters, digits and . / - space, up to 40 characters. */
const ALLOY_PATTERN = /^[A-Za-z][A-Za-z0-9./\- ]{0,39}$/;

const DATE_ONLY = /^\d{4}-\d{2}-\d{2}$/;

/**
 * Merge data-sheet overrides into the defaults and validate the result: every limit a whole,
 * positive number of minutes below a plausibility ceiling, and warm-up shorter than the
 * time allowed out of cold storage (otherwise every run would be warned).
 * @example resolvePasteHandling({ warmUpMinutes: 120 }).settings.warmUpMinutes // 120
 */
export function resolvePasteHandling(
	overrides: Partial<Record<keyof PasteHandlingSettings, unknown>> = {}
): { settings: PasteHandlingSettings; errors: FieldError[] } {
	const settings = { ...DEFAULT_PASTE_HANDLING } as PasteHandlingSettings;
	const errors: FieldError[] = [];
	for (const key of Object.keys(DEFAULT_PASTE_HANDLING) as (keyof PasteHandlingSettings)[]) {
		const value = overrides[key];
		if (value === undefined || value === null) continue;
		const ceiling = SETTING_CEILING_MINUTES[key];
		if (typeof value !== 'number' || !Number.isInteger(value) || value <= 0 || value > ceiling) {
			errors.push({
				field: key,
				message: `must be a whole number of minutes from 1 to ${ceiling} (got ${describeValue(value)})`
			});
		} else settings[key] = value;
	}
	if (errors.length === 0 && settings.warmUpMinutes >= settings.maxOutOfColdMinutes) {
		errors.push({
			field: 'warmUpMinutes',
			message: `must be shorter than maxOutOfColdMinutes (${settings.maxOutOfColdMinutes})`
		});
	}
	return { settings, errors };
}

/**
 * Instant (epoch ms) from which a lot counts as expired. A bare date is the last day of use,
 * so the lot expires at the start of the next day (UTC); a date-time is the expiry instant.
 * @throws {PrintlogInputError} when `expiresOn` is not an ISO date or date-time with zone.
 * @example lotExpiresAtMs('2026-06-30') === Date.parse('2026-07-01T00:00:00Z') // true
 */
export function lotExpiresAtMs(expiresOn: string): number {
	const ms = toEpochMs(expiresOn, 'expiresOn');
	return DATE_ONLY.test(expiresOn.trim()) ? ms + 24 * 60 * 60 * 1000 : ms;
}

/**
 * Validate a paste lot: non-blank lot number, plausible alloy text, powder type 1–8
 * (J-STD-005 incl. Type 8 of revision A), flux class by the J-STD-004 pattern, positive
 * container size, real dates with received ≤ expires.
 * @example validatePasteLot({ lotNumber: 'P-1', alloy: 'SAC305', powderType: 9, expiresOn: '2026-06-30' })
 * // [{ field: 'powderType', message: 'must be a J-STD-005 type, a whole number 1–8 (got 9)' }]
 */
export function validatePasteLot(lot: Partial<Record<keyof PasteLot, unknown>>): FieldError[] {
	const errors: FieldError[] = [];
	const { lotNumber, alloy, powderType, fluxClass, containerGrams, receivedOn, expiresOn } = lot;
	if (typeof lotNumber !== 'string' || lotNumber.trim() === '') {
		const message = `must not be blank (got ${describeValue(lotNumber)})`;
		errors.push({ field: 'lotNumber', message });
	}
	if (typeof alloy !== 'string' || !ALLOY_PATTERN.test(alloy.trim())) {
		errors.push({
			field: 'alloy',
			message: `must be an alloy designation such as SAC305 or Sn63Pb37 (got ${describeValue(alloy)})`
		});
	}
	const isPowderType = Number.isInteger(powderType) && Number(powderType) >= 1;
	if (!isPowderType || Number(powderType) > 8) {
		errors.push({
			field: 'powderType',
			message: `must be a J-STD-005 type, a whole number 1–8 (got ${describeValue(powderType)})`
		});
	}
	if (fluxClass !== undefined && fluxClass !== null && fluxClass !== '') {
		if (typeof fluxClass !== 'string' || !FLUX_CLASS_PATTERN.test(fluxClass.trim())) {
			errors.push({
				field: 'fluxClass',
				message: `must be a J-STD-004 class: RO/RE/OR/IN + L/M/H + 0/1, e.g. ROL0 (got ${describeValue(fluxClass)})`
			});
		}
	}
	if (containerGrams !== undefined && containerGrams !== null) {
		if (!Number.isFinite(containerGrams) || Number(containerGrams) <= 0) {
			const message = `must be a number of grams > 0 (got ${describeValue(containerGrams)})`;
			errors.push({ field: 'containerGrams', message });
		}
	}
	const expiresMs = dateField(expiresOn, 'expiresOn', true, errors);
	const receivedMs = dateField(receivedOn, 'receivedOn', false, errors);
	if (expiresMs !== null && receivedMs !== null && receivedMs > expiresMs) {
		const message = `must not be before receivedOn (${String(receivedOn)})`;
		errors.push({ field: 'expiresOn', message });
	}
	return errors;
}

/** Expiry further ahead than this at receipt is implausible (pastes keep months, not years). */
export const MAX_EXPIRY_AHEAD_DAYS = 2 * 365;

/**
 * Dates of a lot being received that are valid but implausible, to be confirmed before the lot
 * is registered: already past its expiry; expiry more than two years ahead (solder paste keeps
 * about six months refrigerated, so this is a typing slip, Rollbead plausibility limit); received
 * in the future or more than two years ago. Unreadable dates are `validatePasteLot`'s errors.
 * @example lotDateWarnings({ expiresOn: '2020-06-30' }, Date.parse('2026-12-03'))[0].field // 'expiresOn'
 */
export function lotDateWarnings(
	lot: { expiresOn?: unknown; receivedOn?: unknown },
	nowMs: number
): FieldError[] {
	const out: FieldError[] = [];
	const day = 24 * 60 * 60 * 1000;
	const read = (v: unknown): number | null => {
		if (typeof v !== 'string' || !v.trim()) return null;
		try {
			return toEpochMs(v, 'date');
		} catch {
			return null;
		}
	};
	const today = new Date(nowMs).toISOString().slice(0, 10);
	if (typeof lot.expiresOn === 'string' && read(lot.expiresOn) !== null) {
		const expiresAtMs = lotExpiresAtMs(lot.expiresOn);
		if (expiresAtMs <= nowMs) {
			out.push({
				field: 'expiresOn',
				message: `the lot expired on ${lot.expiresOn.trim()}, before today (${today}): it may not be used`
			});
		} else if (expiresAtMs - nowMs > MAX_EXPIRY_AHEAD_DAYS * day) {
			out.push({
				field: 'expiresOn',
				message: `${lot.expiresOn.trim()} is more than 2 years ahead: solder paste keeps months, check the date`
			});
		}
	}
	const receivedMs = read(lot.receivedOn);
	if (receivedMs !== null) {
		if (receivedMs > nowMs + day)
			out.push({
				field: 'receivedOn',
				message: `${String(lot.receivedOn).trim()} is in the future`
			});
		else if (nowMs - receivedMs > MAX_EXPIRY_AHEAD_DAYS * day) {
			out.push({
				field: 'receivedOn',
				message: `${String(lot.receivedOn).trim()} is more than 2 years ago: check the date`
			});
		}
	}
	return out;
}

/** Parse an optional/required date field, pushing an error instead of throwing. */
function dateField(
	value: unknown,
	field: string,
	required: boolean,
	errors: FieldError[]
): number | null {
	if (value === undefined || value === null || value === '') {
		if (required) errors.push({ field, message: 'is required: an ISO date such as 2026-06-30' });
		return null;
	}
	const message = `must be an ISO date such as 2026-06-30 (got ${describeValue(value)})`;
	if (typeof value !== 'string') {
		errors.push({ field, message });
		return null;
	}
	try {
		return toEpochMs(value, field);
	} catch {
		errors.push({ field, message });
		return null;
	}
}
