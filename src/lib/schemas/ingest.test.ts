import { describe, expect, it } from 'vitest';
import { CANONICAL_PROFILE, type MappingProfile } from '../ingest/mapping-profile';
import { mappingProfileSchema } from './ingest';

const messages = (profile: unknown) => {
	const r = mappingProfileSchema.safeParse(profile);
	return r.success ? [] : r.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
};

describe('mappingProfileSchema', () => {
	it('accepts the canonical profile', () => {
		expect(messages(CANONICAL_PROFILE)).toEqual([]);
	});

	it('accepts a full profile with a serial pattern and constants', () => {
		const profile: MappingProfile = {
			...CANONICAL_PROFILE,
			delimiter: '\t',
			columns: { inspected_at: 'Time', refdes: 'Ref' },
			lengthUnit: 'mil',
			volumeMode: 'absolute-mil3',
			timestampFormat: 'MM/DD/YYYY hh:mm:ss A',
			timeZone: 'America/New_York',
			serialFromFileName: { pattern: '^(RB-\\d+)_' },
			constants: { line: 'L3', product: 'PB-200', panelIndex: 0 },
			onBadRow: 'skip-row'
		};
		expect(mappingProfileSchema.parse(profile)).toEqual(profile);
	});

	it.each([
		[
			{ timeZone: 'Mars/Olympus' },
			'timeZone: unknown time zone (use an IANA name like Europe/Berlin)'
		],
		[{ timestampFormat: 'HH:mm' }, 'timestampFormat: timestamp pattern "HH:mm" lacks YYYY'],
		[
			{ serialFromFileName: { pattern: '^RB-\\d+' } },
			'serialFromFileName.pattern: serial pattern must have exactly one (capture group) for the serial; it has 0'
		],
		[
			{ serialFromFileName: { pattern: '^(RB)-(\\d+)' } },
			'serialFromFileName.pattern: serial pattern must have exactly one (capture group) for the serial; it has 2'
		],
		[
			{ serialFromFileName: { pattern: '(unclosed' } },
			'serialFromFileName.pattern: serial pattern is not valid RE2 syntax: missing closing ): `(unclosed` (back-references and look-around are not supported)'
		],
		// RE2 cannot match these in linear time, so they are refused on save, with the reason.
		[
			{ serialFromFileName: { pattern: '^(RB)-\\1' } },
			'serialFromFileName.pattern: serial pattern is not valid RE2 syntax: invalid escape sequence: `\\1` (back-references and look-around are not supported)'
		],
		[
			{ serialFromFileName: { pattern: '^(RB-\\d+)(?=_)' } },
			'serialFromFileName.pattern: serial pattern is not valid RE2 syntax: invalid or unsupported Perl syntax: `(?=` (back-references and look-around are not supported)'
		],
		[
			{ serialFromFileName: { pattern: '(a{1001})' } },
			'serialFromFileName.pattern: serial pattern is not valid RE2 syntax: invalid repeat count: `{1001}` (back-references and look-around are not supported)'
		],
		[
			{ serialFromFileName: { pattern: '(' + 'x'.repeat(200) + ')' } },
			'serialFromFileName.pattern: serial pattern is longer than 200 characters'
		],
		[
			{ serialFromFileName: { pattern: '' } },
			'serialFromFileName.pattern: serial pattern is empty'
		],
		[
			{ resultWords: { pass: ['OK'], warn: ['ok'], fail: ['NG'] } },
			'resultWords.warn: result word "ok" is also listed under pass'
		],
		[{ columns: { height: 'H' } }, 'columns: Unrecognized key: "height"'],
		[
			{ constants: { panelIndex: -1 } },
			'constants.panelIndex: Too small: expected number to be >=0'
		]
	])('refuses %j', (change, message) => {
		expect(messages({ ...CANONICAL_PROFILE, ...change })).toEqual([message]);
	});

	it('accepts a non-capturing group next to the one capture group', () => {
		expect(
			messages({
				...CANONICAL_PROFILE,
				serialFromFileName: { pattern: '^(?:SPI_)?(RB-\\d+)\\.csv$' }
			})
		).toEqual([]);
	});
});
