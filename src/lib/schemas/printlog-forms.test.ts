import { describe, expect, it } from 'vitest';
import { printRunSchema, fieldErrorsFromZod } from './printlog';
import {
	correctRunSchema,
	runFormErrors,
	runFormField,
	runFormSchema,
	runFormToPayload
} from './printlog-forms';

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
			runFormSchema.parse({
				line: 'L',
				product: 'P',
				stencil: 'S',
				pasteLot: 'L',
				squeegeeSpeedMmS: -5,
				relativeHumidityPct: 120
			})
		);
		const errors = runFormErrors(fieldErrorsFromZod(printRunSchema.safeParse(payload).error!));
		expect(errors.squeegeeSpeedMmS[0]).toContain('must be > 0 mm/s (got -5)');
		expect(errors.relativeHumidityPct[0]).toContain('must be ≤ 100% (got 120)');
	});

	it('a scanned board serial is cleaned (AIM prefix, CR) and kept in its case', () => {
		const payload = runFormToPayload(
			runFormSchema.parse({
				line: 'L',
				product: 'P',
				stencil: 'S',
				pasteLot: 'L',
				boardSerial: ']C1Fw-PB100-000123\r'
			})
		);
		expect(printRunSchema.parse(payload).boardSerial).toBe('Fw-PB100-000123');
		const blank = runFormToPayload(
			runFormSchema.parse({
				line: 'L',
				product: 'P',
				stencil: 'S',
				pasteLot: 'L',
				boardSerial: '  '
			})
		);
		expect(blank).not.toHaveProperty('boardSerial');
	});

	it('a board serial with a control character or over 100 characters lands on its form field', () => {
		for (const [serial, message] of [
			['FW\u00071', 'U+0007 at position 3'],
			['9'.repeat(101), 'at most 100 characters (got 101)']
		]) {
			const payload = runFormToPayload(
				runFormSchema.parse({
					line: 'L',
					product: 'P',
					stencil: 'S',
					pasteLot: 'L',
					boardSerial: serial
				})
			);
			const errors = runFormErrors(fieldErrorsFromZod(printRunSchema.safeParse(payload).error!));
			expect(errors.boardSerial[0]).toContain(message);
		}
	});
});

describe('correctRunSchema', () => {
	it('takes every recorded field; null clears an optional one', () => {
		const parsed = correctRunSchema.parse({
			reason: 'wrong stencil scanned',
			stencil: 'ST-PB100',
			pasteLot: 'PL-2026-0412',
			boardSerial: null,
			bladeCode: 'BL-300-07',
			parameters: { printStroke: 'Front-to-back', wipeMode: 'dry-wet' },
			ambientTempC: null,
			startedAt: '2026-03-02T06:00:00Z',
			endedAt: '2026-03-02T08:00:00+01:00'
		});
		expect(parsed.boardSerial).toBeNull();
		expect(parsed.parameters).toEqual({ printStroke: 'front-to-back', wipeMode: 'wet-dry' });
	});

	it('names each bad field', () => {
		const result = correctRunSchema.safeParse({
			reason: ' ',
			stencil: '',
			boardSerial: 'FW\n1',
			endedAt: 'yesterday'
		});
		const fields = fieldErrorsFromZod(result.error!).map((e) => e.field);
		expect(fields).toEqual(['reason', 'stencil', 'boardSerial', 'endedAt']);
	});
});
