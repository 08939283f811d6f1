/**
 * Shapes the chart pages render (client-safe types only: components import them with
 * `import type`, which is erased before bundling). Numbers are unrounded; the UI rounds.
 */
import type { CapabilityAssessment } from './capability-assessment';
import type { CapabilityHistogram } from './capability-histogram';
import type { CapabilityResult } from './capability';
import type { ChartKind, ChartLimits } from './chart-types';
import type { RuleId } from './run-rules';
import type { Violation } from './evaluate-chart';

/** One plotted subgroup with what the tooltip and click-through need. */
export interface ChartViewPoint {
	index: number;
	/** Stable point key ("run:12", "board:88"); absent in ad-hoc studies. */
	key?: string;
	location: number;
	dispersion: number | null;
	movingRange?: number | null;
	size: number;
	/** Board serial, run id or row number, shown in the tooltip. */
	label: string;
	/** Board to open on click (SPI data), or null. */
	boardId: number | null;
	at: Date | null;
	/** Left out of the Phase I baseline (with the reason). */
	excluded: boolean;
	excludeReason?: string | null;
}

/** A chart ready to draw: points, the limits they are judged against, and the signals. */
export interface ChartView {
	kind: ChartKind;
	title: string;
	unit: string;
	points: ChartViewPoint[];
	limits: ChartLimits;
	violations: Violation[];
	rules: RuleId[];
	/** 'I' while limits are computed from the shown points; 'II' against a frozen version. */
	phase: 'I' | 'II';
	limitsVersion: number | null;
}

/** Capability with its histogram and spec limits, or why it is missing. */
export interface CapabilityView {
	result: CapabilityResult | null;
	histogram: CapabilityHistogram | null;
	lsl: number | null;
	usl: number | null;
	target: number | null;
	message: string | null;
	/** The one verdict (stability first); every view of this chart shows this. */
	assessment: CapabilityAssessment;
}
