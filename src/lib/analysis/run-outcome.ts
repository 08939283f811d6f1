import { AnalysisInputError } from './analysis-input-error';

/**
 * Per-run SPI outcome from its boards' stored aggregates (never from pads again).
 * - `volumeMean`: pad-weighted mean volume (%);
 * - `volumeCpk`: min(USL − mean, mean − LSL)/(3·σ_within) against the volume window
 *   (default 50–150 % of aperture volume, REFERENCE-FACTS §e), σ_within pooled from the
 *   boards' own SDs (Σ(nᵢ − 1)sᵢ² / Σ(nᵢ − 1)), so board-to-board drift is not counted;
 * - `passRate`: share of boards with no failing pad (first-pass SPI yield).
 */
export interface RunOutcomeSums {
	boards: number;
	passBoards: number;
	/** Σnᵢ, Σnᵢ·meanᵢ, Σ(nᵢ − 1)sᵢ², Σ(nᵢ − 1) over boards. */
	pads: number;
	volumeSum: number;
	withinSs: number;
	withinDf: number;
}

export interface RunOutcome {
	volumeMean: number | null;
	volumeCpk: number | null;
	passRate: number | null;
}

export const VOLUME_WINDOW_PCT = { lower: 50, upper: 150 } as const;

export function runOutcome(s: RunOutcomeSums, window = VOLUME_WINDOW_PCT): RunOutcome {
	if (!(window.upper > window.lower)) throw new AnalysisInputError('the volume window is empty');
	const volumeMean = s.pads > 0 ? s.volumeSum / s.pads : null;
	const sigma = s.withinDf > 0 ? Math.sqrt(s.withinSs / s.withinDf) : null;
	const volumeCpk =
		volumeMean !== null && sigma !== null && sigma > 0
			? Math.min(window.upper - volumeMean, volumeMean - window.lower) / (3 * sigma)
			: null;
	return { volumeMean, volumeCpk, passRate: s.boards > 0 ? s.passBoards / s.boards : null };
}
