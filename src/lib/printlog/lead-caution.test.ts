import { describe, it, expect } from 'vitest';
import { isLeadBearing, leadHandlingCaution, solventCleaningCaution } from './lead-caution';

describe('isLeadBearing', () => {
	// Designations by element symbol and mass %: Sn63Pb37 eutectic tin-lead, Sn62Pb36Ag2,
	// SAC305 = Sn96.5Ag3.0Cu0.5 (lead-free), Sn42Bi58 (lead-free), Sn99.3Cu0.7 (lead-free).
	const cases: [string, boolean][] = [
		['Sn63Pb37', true],
		['sn63pb37', true],
		['SN63PB37', true],
		['Sn62Pb36Ag2', true],
		['Sn10Pb90', true],
		['63/37', true],
		['62/36/2 SnPbAg', true],
		['tin-lead', true],
		['SAC305', false],
		['SAC305 Pb-free', false],
		['lead-free SAC387', false],
		['Sn96.5Ag3.0Cu0.5', false],
		['Sn42Bi58', false],
		['Sn42Bi57.6Ag0.4', false],
		['Sn99.3Cu0.7', false],
		['', false],
		['163/370', false]
	];
	it.each(cases)('%j → %s', (alloy, leaded) => {
		expect(isLeadBearing(alloy)).toBe(leaded);
	});
});

describe('caution texts', () => {
	it('lead caution defers to regulations, SDS and site procedures and covers the usual points', () => {
		const text = leadHandlingCaution().join(' ');
		for (const phrase of [
			/local regulations/,
			/safety data sheet/,
			/site procedures/,
			/gloves/,
			/hazardous waste/,
			/segregated/,
			/fume extraction/
		]) {
			expect(text).toMatch(phrase);
		}
	});
	it('solvent caution covers ventilation, protection and ignition sources and defers to the SDS', () => {
		const text = solventCleaningCaution().join(' ');
		for (const phrase of [
			/ventilation/,
			/gloves/,
			/eye protection/,
			/ignition sources/,
			/safety data sheet/,
			/site procedures/
		]) {
			expect(text).toMatch(phrase);
		}
	});
});
