import { describe, it, expect } from 'vitest';
import {
	fieldErrorsFromZod,
	pasteEventSchema,
	pasteLotSchema,
	printRunSchema,
	recipeSchema
} from './printlog';
import { formatFieldError } from '../printlog/field-error';

/** Parse and return the errors in the print log's message format ([] when valid). */
function errorsOf(
	schema: { safeParse: (v: unknown) => { success: boolean; error?: unknown } },
	value: unknown
): string[] {
	const result = schema.safeParse(value);
	return result.success ? [] : fieldErrorsFromZod(result.error as never).map(formatFieldError);
}

const window = (min: number, target: number, max: number) => ({ min, target, max });
const recipe = {
	product: 'BRD-100',
	line: 'L1',
	parameters: {
		squeegeeAngleDeg: window(45, 60, 60),
		squeegeeSpeedMmS: window(20, 40, 100),
		squeegeePressureKg: window(4.6, 7.6, 10.7),
		separationSpeedMmS: window(0.5, 1, 3),
		printStroke: { value: 'Alternating' },
		wipeMode: 'dry+wet'
	}
};

describe('recipeSchema', () => {
	it('parses a recipe, normalising categoricals in both forms', () => {
		const parsed = recipeSchema.parse(recipe);
		expect(parsed.parameters.printStroke).toBe('alternating');
		expect(parsed.parameters.wipeMode).toBe('wet-dry');
		expect(parsed.parameters.squeegeeAngleDeg).toEqual(window(45, 60, 60));
	});

	const cases: [string, Record<string, unknown>, string[]][] = [
		[
			'max below target',
			{ squeegeeAngleDeg: window(45, 60, 55) },
			['parameters.squeegeeAngleDeg.max: must be ≥ target (60)']
		],
		[
			'angle above 90°',
			{ squeegeeAngleDeg: window(45, 60, 95) },
			['parameters.squeegeeAngleDeg.max: must be ≤ 90° (got 95)']
		],
		[
			'missing required',
			{ squeegeeSpeedMmS: undefined },
			['parameters.squeegeeSpeedMmS: is required: give a window { min, target, max }']
		],
		[
			'unknown stroke',
			{ printStroke: 'sideways' },
			[
				'parameters.printStroke: must be one of front-to-back, back-to-front, alternating (got "sideways")'
			]
		],
		[
			'unknown wipe step',
			{ wipeMode: 'wet-steam' },
			[
				"parameters.wipeMode: unknown wipe step 'steam' in \"wet-steam\": use wet, vacuum, dry, e.g. 'wet-vacuum-dry'"
			]
		]
	];
	it.each(cases)('%s', (_name, change, expected) => {
		expect(
			errorsOf(recipeSchema, { ...recipe, parameters: { ...recipe.parameters, ...change } })
		).toEqual(expected);
	});

	it('refuses unknown parameters and blank codes', () => {
		const errors = errorsOf(recipeSchema, {
			...recipe,
			line: '  ',
			parameters: { ...recipe.parameters, squeegeeColour: 'red' }
		});
		expect(errors).toContain('line: must not be blank');
		expect(errors.some((e) => e.startsWith('parameters: ') && e.includes('squeegeeColour'))).toBe(
			true
		);
	});
});

const run = {
	line: 'L1',
	product: 'BRD-100',
	stencil: 'ST-0007',
	pasteLot: 'PL-2026-0042',
	parameters: {
		squeegeeAngleDeg: 60,
		squeegeeSpeedMmS: 40,
		squeegeePressureKg: 7.5,
		separationSpeedMmS: 1,
		printStroke: 'alternating'
	},
	deviationReasons: { squeegeeAngleDeg: 'new blade holder' },
	ambientTempC: 23.5,
	relativeHumidityPct: 45,
	boardsPrinted: 120,
	startedAt: '2026-03-02T08:00:00+01:00',
	bladeCode: 'BL-03'
};

describe('printRunSchema', () => {
	it('parses a full run', () => {
		expect(errorsOf(printRunSchema, run)).toEqual([]);
	});
	it('parses the minimal run', () => {
		const { line, product, stencil, pasteLot } = run;
		expect(errorsOf(printRunSchema, { line, product, stencil, pasteLot, parameters: {} })).toEqual(
			[]
		);
	});

	const cases: [string, Record<string, unknown>, string[]][] = [
		[
			'negative speed',
			{ parameters: { ...run.parameters, squeegeeSpeedMmS: -40 } },
			['parameters.squeegeeSpeedMmS: must be > 0 mm/s (got -40)']
		],
		[
			'humidity over 100 %',
			{ relativeHumidityPct: 120 },
			['relativeHumidityPct: must be ≤ 100% (got 120)']
		],
		['fractional boards', { boardsPrinted: 1.5 }, ['boardsPrinted: must be a whole number']],
		[
			'start without zone',
			{ startedAt: '2026-03-02T08:00:00' },
			['startedAt: must be an ISO 8601 date-time with a time zone, e.g. 2026-03-02T08:00:00Z']
		],
		['blank stencil', { stencil: '' }, ['stencil: must not be blank']]
	];
	it.each(cases)('%s', (_name, change, expected) => {
		expect(errorsOf(printRunSchema, { ...run, ...change })).toEqual(expected);
	});

	it('refuses a reason for an unknown parameter', () => {
		const errors = errorsOf(printRunSchema, { ...run, deviationReasons: { squeegeeColour: 'x' } });
		expect(errors).toHaveLength(1);
		expect(errors[0]).toMatch(/^deviationReasons/);
	});
	it('refuses a string where a number belongs', () => {
		const errors = errorsOf(printRunSchema, { ...run, parameters: { squeegeeAngleDeg: '60' } });
		expect(errors).toHaveLength(1);
		expect(errors[0]).toMatch(/^parameters\.squeegeeAngleDeg: /);
	});
});

const lot = { lotNumber: 'PL-2026-0042', alloy: 'SAC305', powderType: 4, expiresOn: '2026-06-30' };

describe('pasteLotSchema', () => {
	it('parses a minimal and a full lot', () => {
		expect(errorsOf(pasteLotSchema, lot)).toEqual([]);
		expect(
			errorsOf(pasteLotSchema, {
				...lot,
				fluxClass: 'rol0',
				containerGrams: 500,
				receivedOn: '2026-01-15',
				warmUpMinutes: 120,
				maxOnStencilMinutes: 360,
				maxOutOfColdMinutes: 2880
			})
		).toEqual([]);
		expect(pasteLotSchema.parse({ ...lot, fluxClass: 'rol0' }).fluxClass).toBe('ROL0');
	});

	const cases: [string, Record<string, unknown>, string[]][] = [
		['blank lot number', { lotNumber: ' ' }, ['lotNumber: must not be blank (got "")']],
		[
			'powder type 9',
			{ powderType: 9 },
			['powderType: must be a J-STD-005 type, a whole number 1–8 (got 9)']
		],
		[
			'flux class',
			{ fluxClass: 'XYZ' },
			['fluxClass: must be a J-STD-004 class: RO/RE/OR/IN + L/M/H + 0/1, e.g. ROL0 (got "XYZ")']
		],
		[
			'bad expiry',
			{ expiresOn: '30/06/2026' },
			['expiresOn: must be an ISO date such as 2026-06-30 (got "30/06/2026")']
		],
		[
			'warm-up 0',
			{ warmUpMinutes: 0 },
			['warmUpMinutes: must be a whole number of minutes from 1 to 2880 (got 0)']
		],
		[
			'missing expiry',
			{ expiresOn: undefined },
			['expiresOn: Invalid input: expected string, received undefined']
		]
	];
	it.each(cases)('%s', (_name, change, expected) => {
		expect(errorsOf(pasteLotSchema, { ...lot, ...change })).toEqual(expected);
	});
});

describe('pasteEventSchema', () => {
	const cases: [unknown, string[]][] = [
		[{ event: 'opened' }, []],
		[{ event: 'out-of-cold-storage', at: '2026-03-02T06:00:00Z', note: 'fridge 2' }, []],
		[
			{ event: 'thawed' },
			['event: must be one of out-of-cold-storage, opened, on-stencil, returned, discarded']
		],
		[
			{ event: 'opened', at: 'now' },
			['at: must be an ISO 8601 date-time with a time zone, e.g. 2026-03-02T08:00:00Z']
		],
		[{}, ['event: must be one of out-of-cold-storage, opened, on-stencil, returned, discarded']]
	];
	it.each(cases)('%j', (value, expected) => {
		expect(errorsOf(pasteEventSchema, value)).toEqual(expected);
	});
});

describe('fieldErrorsFromZod', () => {
	it('writes array indexes in brackets and names a root error (body)', () => {
		const list = printRunSchema.array().safeParse([run, { ...run, stencil: '' }]);
		expect(fieldErrorsFromZod(list.error as never).map((e) => e.field)).toEqual(['[1].stencil']);
		const root = pasteEventSchema.safeParse('opened');
		expect(fieldErrorsFromZod(root.error as never)[0].field).toBe('(body)');
	});
});
