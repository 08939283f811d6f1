import { describe, expect, it } from 'vitest';
import { readIdealCycleTimeS } from './ideal-cycle-time';

describe('readIdealCycleTimeS', () => {
	it('leaves a blank field out, so the current version keeps its value (as the API does)', () => {
		expect(readIdealCycleTimeS('')).toEqual({ ok: true, value: undefined });
		expect(readIdealCycleTimeS('   ')).toEqual({ ok: true, value: undefined });
	});

	it('reads plain decimal seconds, spaces around allowed', () => {
		expect(readIdealCycleTimeS('22.5')).toEqual({ ok: true, value: 22.5 });
		expect(readIdealCycleTimeS(' 40 ')).toEqual({ ok: true, value: 40 });
		expect(readIdealCycleTimeS('0.25')).toEqual({ ok: true, value: 0.25 });
	});

	it('refuses what Number() would guess at, naming the unit', () => {
		for (const text of ['0x10', '12 s', '1_000', 'Infinity', 'NaN', '1e400', '22,5', '--1']) {
			const read = readIdealCycleTimeS(text);
			expect(read, text).toEqual({ ok: false, message: expect.stringContaining('seconds') });
		}
	});

	it('passes zero and negatives on for the recipe schema to refuse (its range, one place)', () => {
		expect(readIdealCycleTimeS('0')).toEqual({ ok: true, value: 0 });
		expect(readIdealCycleTimeS('-3')).toEqual({ ok: true, value: -3 });
	});
});
