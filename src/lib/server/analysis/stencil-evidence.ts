import {
	areaRatioBin,
	linearRegression,
	MIN_PADS_PER_FITTED_BIN,
	predictTe,
	studentTQuantile,
	teBandAt
} from '$lib/analysis';
import type { Db } from '../db';
import { checkStoredStencil } from '../stencils/evaluation';
import { getStencil } from '../stencils/stencils';
import { QueryReader } from './query';
import { transferEfficiencyOffThread } from './te-thread';

/** Default TE loss since new (as a fraction, 0.05 = 5 points of TE) that raises the wear flag. */
export const DEFAULT_WEAR_DROP = 0.05;
/** Runs read per stencil (newest kept). */
export const MAX_WEAR_RUNS = 5000;
/** Apertures listed in the predicted-TE answer (lowest predicted TE first). */
export const MAX_LISTED_APERTURES = 200;

export function readStencilQuery(
	url: URL,
	withDrop: boolean
): { stencilId: number; drop: number; floor: number } {
	const q = new QueryReader(url, withDrop ? ['stencil', 'drop'] : ['stencil', 'floor']);
	const stencilId = q.integer('stencil', 1, 999_999_999);
	if (stencilId === null && !q.problems.some((p) => p.field === 'stencil'))
		q.problems.push({ field: 'stencil', message: 'is required (a stencil id)' });
	const drop = withDrop ? q.decimal('drop', 0, 1, DEFAULT_WEAR_DROP) : DEFAULT_WEAR_DROP;
	const floor = withDrop ? 0.7 : q.decimal('floor', 0, 1.5, 0.7);
	q.finish();
	return { stencilId: stencilId as number, drop, floor };
}

export interface WearAnswer {
	stencilId: number;
	/** One point per run with inspected boards: prints on the stencil before the run started. */
	points: {
		runId: number;
		startedAt: string;
		printsBefore: number;
		teMean: number | null;
		volumeMean: number | null;
		boards: number;
	}[];
	fit: { intercept: number; slope: number; slopeSe: number; perThousandPrints: number } | null;
	/** Fitted TE at the first run minus fitted TE at the latest (positive = lost). */
	teDrop: number | null;
	drop: number;
	/** The loss exceeds `drop` and the slope's 95 % upper bound is below zero. */
	flagged: boolean;
	reason: string | null;
	/**
	 * Boards grouped by prints since the last under-stencil wipe (1 = first print after a wipe),
	 * assuming boards are inspected in print order and the run wipes every `wipeIntervalPrints`
	 * from its start; runs without a logged interval are left out.
	 */
	sinceWipe: {
		printsSinceWipe: number;
		boards: number;
		teMean: number | null;
		volumeMean: number | null;
	}[];
}

/** Boards read for the since-wipe grouping (newest first). */
export const MAX_WIPE_BOARDS = 200_000;

/**
 * TE and volume against the stencil's print count. A run's print count is the sum of
 * `boardsPrinted` of the stencil's earlier runs; its TE and volume are pad-weighted means of its
 * inspected boards' stored aggregates. The flag needs both a fitted loss larger than `drop` and a
 * slope whose 95 % confidence interval lies below zero, so noise alone does not raise it.
 */
export function stencilWear(db: Db, stencilId: number, drop: number): WearAnswer {
	getStencil(db, stencilId); // an unknown id is a StencilNotFoundError: 404 with { error }
	const rows = db.$client
		.prepare(
			`select r.id, r.started_at, r.boards_printed,
			   (select count(*) from spi_boards b where b.print_run_id = r.id) as boards,
			   (select sum(b.te_mean * b.te_count) / nullif(sum(b.te_count), 0) from spi_boards b where b.print_run_id = r.id) as te,
			   (select sum(b.volume_pct_mean * b.volume_pct_count) / nullif(sum(b.volume_pct_count), 0) from spi_boards b where b.print_run_id = r.id) as vol
			 from print_runs r where r.stencil_id = ? order by r.started_at, r.id`
		)
		.all(stencilId) as {
		id: number;
		started_at: number;
		boards_printed: number;
		boards: number;
		te: number | null;
		vol: number | null;
	}[];
	let prints = 0;
	const all = rows.map((r) => {
		const p = {
			runId: r.id,
			startedAt: new Date(r.started_at).toISOString(),
			printsBefore: prints,
			teMean: r.te,
			volumeMean: r.vol,
			boards: r.boards
		};
		prints += r.boards_printed;
		return p;
	});
	const points = all.filter((p) => p.boards > 0).slice(-MAX_WEAR_RUNS);
	const withTe = points.filter((p) => p.teMean !== null);
	const sinceWipe = (
		db.$client
			.prepare(
				`with b as (
				   select b.te_mean, b.te_count, b.volume_pct_mean, b.volume_pct_count,
				     cast(json_extract(r.parameters, '$.wipeIntervalPrints') as integer) as every,
				     row_number() over (partition by b.print_run_id order by b.inspected_at, b.id) - 1 as k
				   from (select * from spi_boards where print_run_id in (select id from print_runs where stencil_id = ?)
				         order by inspected_at desc limit ${MAX_WIPE_BOARDS}) b
				   join print_runs r on r.id = b.print_run_id)
				 select (k % every) + 1 as n, count(*) as boards,
				   sum(te_mean * te_count) / nullif(sum(te_count), 0) as te,
				   sum(volume_pct_mean * volume_pct_count) / nullif(sum(volume_pct_count), 0) as vol
				 from b where every >= 1 group by 1 order by 1`
			)
			.all(stencilId) as { n: number; boards: number; te: number | null; vol: number | null }[]
	).map((r) => ({ printsSinceWipe: r.n, boards: r.boards, teMean: r.te, volumeMean: r.vol }));
	const base = { stencilId, points, drop, sinceWipe };
	const xs = withTe.map((p) => p.printsBefore);
	if (withTe.length < 3 || !(Math.max(...xs) > Math.min(...xs)))
		return {
			...base,
			fit: null,
			teDrop: null,
			flagged: false,
			reason: `${withTe.length} runs with transfer efficiency; a trend needs 3 at different print counts`
		};
	const line = linearRegression(
		xs,
		withTe.map((p) => p.teMean as number)
	);
	const teDrop = -line.slope * (Math.max(...xs) - Math.min(...xs));
	const upper = line.slope + studentTQuantile(0.975, line.degreesOfFreedom) * line.slopeSe;
	return {
		...base,
		fit: {
			intercept: line.intercept,
			slope: line.slope,
			slopeSe: line.slopeSe,
			perThousandPrints: line.slope * 1000
		},
		teDrop,
		flagged: teDrop > drop && upper < 0,
		reason: null
	};
}

export interface PredictedTeAnswer {
	stencilId: number;
	technology: string;
	floor: number;
	model: {
		coefficients: { upper: number; lower: number; knee: number; scale: number };
		areaRatioMin: number;
		areaRatioMax: number;
	} | null;
	learnedMinAreaRatio: number | null;
	reason: string | null;
	apertures: number;
	/** Apertures whose predicted TE is below the floor / whose AR lies outside the site's data. */
	belowFloor: number;
	notCovered: number;
	/** The lowest predicted TE first, at most MAX_LISTED_APERTURES. */
	listed: {
		id: number;
		refdes: string;
		pad: string;
		areaRatio: number;
		predictedTe: number;
		lower: number;
		upper: number;
		covered: boolean;
	}[];
}

/**
 * Each aperture's predicted TE from the site's own model for the stencil's technology (all
 * pastes and dates), with its 95 % band and whether the site's data cover its area ratio (its
 * 0.05-wide AR bin was one of the fitted bins); elsewhere the curve is an extrapolation.
 */
export async function predictedTeForStencil(
	db: Db,
	stencilId: number,
	floor: number
): Promise<PredictedTeAnswer> {
	const check = checkStoredStencil(db, stencilId);
	const technology = check.stencil.technology;
	const te = await transferEfficiencyOffThread(db, {
		technology,
		paste: null,
		powder: null,
		fromMs: null,
		toMs: null,
		floor
	});
	const base = {
		stencilId,
		technology,
		floor,
		learnedMinAreaRatio: te.learnedMinAreaRatio,
		apertures: check.apertures.length
	};
	if (!te.fit)
		return {
			...base,
			model: null,
			reason: te.reason,
			belowFloor: 0,
			notCovered: check.apertures.length,
			listed: []
		};
	const arMin = te.fit.areaRatioMin;
	const arMax = te.fit.areaRatioMax;
	const fitLike = {
		model: 'logistic-4' as const,
		coefficients: te.fit.coefficients,
		covariance: te.fit.covariance,
		residualSd: te.fit.residualSd,
		degreesOfFreedom: te.fit.degreesOfFreedom,
		sse: 0,
		iterations: 0,
		bins: te.bins.length,
		areaRatioMin: arMin,
		areaRatioMax: arMax
	};
	// Covered: the aperture's own AR bin was among the fitted bins (enough pads printed there).
	const fittedBins = new Set(
		te.bins.filter((b) => b.n >= MIN_PADS_PER_FITTED_BIN).map((b) => areaRatioBin(b.areaRatio))
	);
	const all = check.apertures.map((a) => {
		const band = teBandAt(fitLike, a.areaRatio);
		return {
			id: a.id,
			refdes: a.refdes,
			pad: a.pad,
			areaRatio: a.areaRatio,
			predictedTe: predictTe(te.fit!.coefficients, a.areaRatio),
			lower: band.lower,
			upper: band.upper,
			covered: fittedBins.has(areaRatioBin(a.areaRatio))
		};
	});
	all.sort((x, y) => x.predictedTe - y.predictedTe);
	return {
		...base,
		model: { coefficients: te.fit.coefficients, areaRatioMin: arMin, areaRatioMax: arMax },
		reason: te.reason,
		belowFloor: all.filter((a) => a.predictedTe < floor).length,
		notCovered: all.filter((a) => !a.covered).length,
		listed: all.slice(0, MAX_LISTED_APERTURES)
	};
}
