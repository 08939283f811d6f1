import { describe, it, expect } from 'vitest';
import gerberParser from 'gerber-parser';
import { rewriteMacroUnaryMinus } from './gerber-unary-minus';

describe('rewriteMacroUnaryMinus', () => {
	const cases: [string, string, string][] = [
		['a negated variable', '%AMR*1,1,$1,-$2,-$3*%', '%AMR*1,1,$1,(0-1)x$2,(0-1)x$3*%'],
		['subtraction stays', '%AMR*1,1,$1,0-$2,$1-$3*%', '%AMR*1,1,$1,0-$2,$1-$3*%'],
		['a sign after a product', '%AMR*1,1,$1x-$2,0*%', '%AMR*1,1,$1x(0-1)x$2,0*%'],
		['a unary plus is dropped', '%AMR*1,1,+$1,0,0*%', '%AMR*1,1,$1,0,0*%'],
		['plain negative numbers stay', '%AMR*21,1,1,0.5,-0.25,-1,0*%', '%AMR*21,1,1,0.5,-0.25,-1,0*%'],
		['a variable definition', '%AMR*$4=-$1*1,1,$4,0,0*%', '%AMR*$4=(0-1)x$1*1,1,$4,0,0*%'],
		[
			'comments stay',
			'%AMR*0 size -$1 mm, see -note*1,1,1,0,0*%',
			'%AMR*0 size -$1 mm, see -note*1,1,1,0,0*%'
		],
		['newlines stay', '%AMR*\n1,1,1,\n-$1,0*%', '%AMR*\n1,1,1,\n(0-1)x$1,0*%'],
		[
			'coordinates outside macros stay',
			'X-100Y-200D03*\n%ADD10C,0.5*%',
			'X-100Y-200D03*\n%ADD10C,0.5*%'
		],
		['empty text', '', '']
	];
	for (const [name, input, want] of cases) {
		it(name, () => {
			expect(rewriteMacroUnaryMinus(input)).toBe(want);
		});
	}

	it('makes gerber-parser evaluate signs as the Gerber spec defines them', () => {
		// Circle primitive 1: exposure, diameter, cx, cy. With $1 = 0.3 and $2 = 0.2, by hand:
		// cx = −$1×2 = −0.6 and cy = −($1+$2) = −0.5.
		const text = rewriteMacroUnaryMinus('%FSLAX26Y26*%\n%MOMM*%\n%AMT*1,1,1,-$1x2,-($1+$2)*%\n');
		const parser = gerberParser({}) as unknown as {
			parseSync(t: string): { type: string; blocks?: Record<string, unknown>[] }[];
		};
		const macro = parser.parseSync(text).find((c) => c.type === 'macro');
		const block = macro?.blocks?.[0] as { cx: (m: object) => number; cy: (m: object) => number };
		const mods = { $1: 0.3, $2: 0.2 };
		expect(block.cx(mods)).toBeCloseTo(-0.6, 12);
		expect(block.cy(mods)).toBeCloseTo(-0.5, 12);
	});
});
