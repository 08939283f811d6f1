/** Verdict bands of a capability index. */
export type CapabilityLevel =
	| 'not-capable'
	| 'marginal'
	| 'capable'
	| 'highly-capable'
	| 'undefined';

/** Common minimum Cpk for an existing process (common practice; customers set their own). */
export const CAPABLE_MINIMUM = 1.33;
/** Commonly asked for new or critical processes and initial studies (common practice). */
export const HIGHLY_CAPABLE_MINIMUM = 1.67;

/**
 * Plain-language reading of a capability index (Cpk or Ppk) against the usual 1.33 and
 * 1.67 thresholds (Montgomery ISQC §8.3 recommendations and AIAG PPAP initial-study
 * practice, both from memory; treat as common practice, the customer's limit rules).
 * Bands: < 1.00 not capable, 1.00–1.33 marginal, 1.33–1.67 capable, ≥ 1.67 highly capable;
 * a value on a threshold belongs to the higher band.
 * @example capabilityReading(1.45, 'Cpk').level // 'capable'
 */
export function capabilityReading(
	index: number | null,
	label = 'Cpk'
): { level: CapabilityLevel; text: string } {
	if (index === null || !Number.isFinite(index)) {
		return { level: 'undefined', text: `${label} could not be computed (see the notes).` };
	}
	const v = index.toFixed(2);
	if (index >= HIGHLY_CAPABLE_MINIMUM) {
		return {
			level: 'highly-capable',
			text: `${label} ${v} meets 1.67, the level often asked for new or critical processes.`
		};
	}
	if (index >= CAPABLE_MINIMUM) {
		return {
			level: 'capable',
			text: `${label} ${v} meets the common 1.33 minimum, not the 1.67 often asked for new processes.`
		};
	}
	if (index >= 1) {
		return {
			level: 'marginal',
			text: `${label} ${v} is below the common 1.33 minimum: spread or centring leave little margin.`
		};
	}
	return {
		level: 'not-capable',
		text: `${label} ${v} is below 1.00: out-of-spec parts expected; reduce spread or re-centre.`
	};
}
