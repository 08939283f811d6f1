import { describe, expect, it } from 'vitest';
import ref from '../../../reference/stencil/worked-examples.json';
import { inAreaRatioBand } from './pad-selection';

// reference/stencil/worked-examples.json: the 0201 pad 300 × 280 µm at 100 µm has
// AR = 84000 / (1160 · 100) = 0.7241; at 120 µm 0.6034.
const pad = {
	refdes: 'C1',
	pad: '1',
	shape: 'rectangle' as const,
	lengthUm: 300,
	widthUm: 280,
	xUm: 0,
	yUm: 0,
	rotationDeg: 0
};

describe('inAreaRatioBand', () => {
	it('selects by the area ratio at the stencil thickness, ends included', () => {
		expect(JSON.stringify(ref)).toContain('84000 / (1160 · 100) = 0.7241');
		expect(inAreaRatioBand(pad, 100, { min: 0.72, max: 0.73 })).toBe(true);
		expect(inAreaRatioBand(pad, 120, { min: 0.66 })).toBe(false);
		expect(inAreaRatioBand(pad, 120, { max: 0.66 })).toBe(true);
		expect(inAreaRatioBand(pad, 100, {})).toBe(true);
	});

	it('leaves out an aperture the stencil module cannot read', () => {
		expect(inAreaRatioBand({ ...pad, lengthUm: -5 }, 100, {})).toBe(false);
	});
});
