import { json } from '@sveltejs/kit';
import type { FieldError } from '$lib/printlog';
import { assessStencil, type StencilLife } from './stencil-life';

/** A stencil's life as `GET /api/stencil-life` answers it. */
export type StencilLifeApiView = {
	id: number;
	name: string;
	revision: string;
	state: string;
	printCount: number;
	ratedLifePrints: number | null;
	/** printCount ÷ ratedLifePrints × 100 (unrounded), null without a rated life. */
	lifeUsedPct: number | null;
	nearLife: boolean;
	latestTension: {
		at: string;
		readingsNPerCm: number[];
		minimumNPerCm: number;
		meanNPerCm: number;
		pass: boolean;
	} | null;
	/** What a run on it would be told now: a refusal or a warning, else null. */
	forRun: { refuse: string | null; warn: string | null };
};

/**
 * The API shape of a stencil's life figures (times as ISO 8601 UTC).
 * @example stencilLifeApiView(life).lifeUsedPct // 90 for 9000 of 10000 prints
 */
export function stencilLifeApiView(life: StencilLife): StencilLifeApiView {
	const assessment = assessStencil(life);
	return {
		id: life.id,
		name: life.name,
		revision: life.revision,
		state: life.state,
		printCount: life.printCount,
		ratedLifePrints: life.ratedLifePrints,
		lifeUsedPct: life.lifeUsedPct,
		nearLife: life.nearLife,
		latestTension: life.lastTension && {
			...life.lastTension,
			at: life.lastTension.at.toISOString()
		},
		forRun: {
			refuse: assessment.refuse?.message ?? null,
			warn: assessment.warn?.message ?? null
		}
	};
}

/**
 * The error answer of the stencil-life entry route: `{ error, errors: [{ field, message }] }`
 * (`error` repeats the problems in one line for people reading logs).
 */
export function stencilEntryErrors(status: number, errors: readonly FieldError[]): Response {
	const error = errors.map((e) => `${e.field}: ${e.message}`).join('; ');
	return json({ error, errors }, { status });
}
