import { describe, it, expect } from 'vitest';
import { classifyGerberParserWarning } from './gerber-parser-warning';

const unrecognized = (block: string) => `block "${block}" was not recognized and was ignored`;

describe('classifyGerberParserWarning', () => {
	const ignored = [
		'%TF.FileFunction,Paste,Top',
		'%TA.AperFunction,SMDPad,CuDef',
		'%TD',
		'%INPASTE_TOP',
		'%LNTOP',
		'%IPPOS',
		'%ASAXBY',
		'%MIA0B0',
		'%OFA0B0',
		'%OFA0.0B0.000',
		'%SFA1B1',
		'%SFA1.0B1.0',
		'%IR0',
		'G55',
		'M01'
	];
	for (const block of ignored) {
		it(`ignores ${block}`, () => {
			expect(classifyGerberParserWarning(unrecognized(block))).toEqual({ kind: 'ignore' });
		});
	}

	const refused: [string, RegExp][] = [
		['%IPNEG', /negative image polarity/],
		['%ASAYBX', /axis swap/],
		['%MIA1B0', /mirroring/],
		['%OFA1.0B0', /offset/],
		['%SFA2B2', /scaling/],
		['%IR90', /image rotation/],
		['%LMX', /aperture transformations/],
		['%LR45', /aperture transformations/],
		['%LS0.8', /aperture transformations/],
		['%ABD12', /block apertures/],
		['XYZ', /^unsupported or unknown command "XYZ"$/]
	];
	for (const [block, message] of refused) {
		it(`refuses ${block}`, () => {
			const action = classifyGerberParserWarning(unrecognized(block));
			expect(action.kind).toBe('error');
			expect(action.kind === 'error' && action.message).toMatch(message);
		});
	}

	it('shortens a long block in the message', () => {
		const action = classifyGerberParserWarning(unrecognized('Q'.repeat(500)));
		expect(action.kind === 'error' && action.message.length).toBeLessThan(100);
	});

	it('refuses an unknown macro primitive', () => {
		expect(
			classifyGerberParserWarning('9 is an unrecognized primitive for a macro aperture')
		).toEqual({
			kind: 'error',
			message: 'macro primitive code "9" is not supported'
		});
	});

	it('passes recoverable warnings on unchanged', () => {
		const text = 'trailing zero suppression has been deprecated';
		expect(classifyGerberParserWarning(text)).toEqual({ kind: 'warning', message: text });
	});
});
