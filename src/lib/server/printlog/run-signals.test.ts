import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { printRunSchema } from '$lib/schemas/printlog';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { createCharacteristic } from '../spc/characteristics';
import { freezeLimits } from '../spc/limits-lifecycle';
import { listSignals } from '../spc/signals';
import { lineByCode, productByCode } from './lookups';
import { correctRun, endRun, startRun } from './print-runs';
import { runPayload, seedPrintlogFixture } from './test-fixtures';

let db: Db;
let close: () => void;
let fx: ReturnType<typeof seedPrintlogFixture>;
beforeEach(() => {
	({ db, close } = openTestDatabase());
	fx = seedPrintlogFixture(db);
});
afterEach(() => close());

const T0 = Date.parse('2026-03-02T08:00:00Z');
const HOUR = 3_600_000;

/** A squeegee-speed I-MR chart on P1/L1, frozen on ten ended runs around 40 mm/s. */
function frozenSpeedChart(): number {
	const chart = createCharacteristic(
		db,
		{
			name: 'Squeegee speed · P1 · L1',
			productId: productByCode(db, 'P1')!.id,
			lineIds: [lineByCode(db, 'L1')!.id],
			measure: 'print-parameter',
			parameterKey: 'squeegeeSpeedMmS',
			chartKind: 'i-mr',
			rules: ['we-1']
		},
		null
	);
	const speeds = [40, 41, 39, 40, 42, 38, 40, 41, 39, 40];
	speeds.forEach((speed, i) => {
		const payload = runPayload({
			parameters: { ...runPayload().parameters, squeegeeSpeedMmS: speed }
		});
		const { id } = startRun(db, printRunSchema.parse(payload), fx.actors.technician, T0 + i * HOUR);
		endRun(db, id, { boardsPrinted: 10 }, fx.actors.technician, T0 + i * HOUR + HOUR / 2);
	});
	freezeLimits(db, chart.id, { baselineTo: new Date(T0 + 10 * HOUR), minSubgroups: 10 }, null);
	return chart.id;
}

describe('print-run signals are raised by the service', () => {
	it('a run far outside the frozen limits is a stored signal when startRun returns', () => {
		const chartId = frozenSpeedChart();
		expect(listSignals(db, { characteristicId: chartId })).toHaveLength(0);
		const payload = runPayload({
			parameters: { ...runPayload().parameters, squeegeeSpeedMmS: 90 },
			deviationReasons: undefined
		});
		const { id } = startRun(
			db,
			printRunSchema.parse(payload),
			fx.actors.technician,
			T0 + 11 * HOUR
		);
		const signals = listSignals(db, { characteristicId: chartId });
		expect(signals.map((s) => [s.rule, s.pointKey])).toContainEqual(['we-1', `run:${id}`]);
	});

	it('a corrected value is judged again (outside the limits: a signal); ending adds none', () => {
		const chartId = frozenSpeedChart();
		const { id } = startRun(
			db,
			printRunSchema.parse(
				runPayload({ parameters: { ...runPayload().parameters, squeegeeSpeedMmS: 40 } })
			),
			fx.actors.technician,
			T0 + 11 * HOUR
		);
		expect(listSignals(db, { characteristicId: chartId })).toHaveLength(0);
		correctRun(
			db,
			id,
			{ reason: 'speed misread', parameters: { squeegeeSpeedMmS: 95 } },
			fx.actors.technician
		);
		expect(listSignals(db, { characteristicId: chartId }).map((s) => s.pointKey)).toContain(
			`run:${id}`
		);
		const count = listSignals(db, { characteristicId: chartId }).length;
		endRun(db, id, { boardsPrinted: 5 }, fx.actors.technician, T0 + 12 * HOUR);
		expect(listSignals(db, { characteristicId: chartId })).toHaveLength(count);
	});
});
