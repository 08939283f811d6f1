import { describe, expect, it } from 'vitest';
import { printRunSchema, fieldErrorsFromZod } from './printlog';
import { runFormErrors, runFormField, runFormSchema, runFormToPayload } from './printlog-forms';

describe('run form ↔ API payload', () => {
	it('a filled form becomes the payload the API takes; blanks are left out', () => {
		const form = runFormSchema.parse({
			line: 'SMT-1',
			product: 'PB-100',
			stencil: 'ST-PB100',
			pasteLot: 'PL-1',
			squeegeeAngleDeg: 65,
			squeegeeSpeedMmS: 40,
			printStroke: 'alternating',
			wipeMode: '',
			reason_squeegeeAngleDeg: ' new holder ',
			ambientTempC: 23
		});
		const payload = runFormToPayload(form);
		expect(payload).toEqual({
			line: 'SMT-1',
			product: 'PB-100',
			stencil: 'ST-PB100',
			pasteLot: 'PL-1',
			parameters: { squeegeeAngleDeg: 65, squeegeeSpeedMmS: 40, printStroke: 'alternating' },
			deviationReasons: { squeegeeAngleDeg: 'new holder' },
			ambientTempC: 23
		});
		expect(printRunSchema.safeParse(payload).success).toBe(true);
	});

	it.each([
		['parameters.squeegeeSpeedMmS', 'squeegeeSpeedMmS'],
		['deviationReasons.squeegeeAngleDeg', 'reason_squeegeeAngleDeg'],
		['ambientTempC', 'ambientTempC'],
		['stencil', 'stencil'],
		['(body)', '(body)']
	])('API field %s shows on form field %s', (api, flat) => {
		expect(runFormField(api)).toBe(flat);
	});

	it('physical-range errors of the API schema land on the form field', () => {
		const payload = runFormToPayload(
			runFormSchema.parse({ line: 'L', product: 'P', stencil: 'S', pasteLot: 'L', squeegeeSpeedMmS: -5, relativeHumidityPct: 120 })
		);
		const errors = runFormErrors(fieldErrorsFromZod(printRunSchema.safeParse(payload).error!));
		expect(errors.squeegeeSpeedMmS[0]).toContain('must be > 0 mm/s (got -5)');
		expect(errors.relativeHumidityPct[0]).toContain('must be ≤ 100% (got 120)');
	});
});
