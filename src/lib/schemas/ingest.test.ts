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
			'serialFromFileName.pattern: serial pattern must be a valid regular expression with exactly one (capture group)'
		],
		[
			{ serialFromFileName: { pattern: '^(RB)-(\\d+)' } },
			'serialFromFileName.pattern: serial pattern must be a valid regular expression with exactly one (capture group)'
		],
		[
			{ serialFromFileName: { pattern: '(unclosed' } },
			'serialFromFileName.pattern: serial pattern must be a valid regular expression with exactly one (capture group)'
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
