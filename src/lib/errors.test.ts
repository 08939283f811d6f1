import { describe, expect, it } from 'vitest';
import { isRefusal, Refusal, refusalAnswer, type FieldProblem } from './errors';

class NoSuchThing extends Refusal {
	readonly status = 404;
	constructor(id: number) {
		super(`No thing #${id}.`);
	}
}

class BadThing extends Refusal {
	readonly status = 422;
	constructor(readonly problems: FieldProblem[]) {
		super(problems.map((p) => `${p.field}: ${p.message}`).join('; '));
	}
	override get fieldProblems() {
		return this.problems;
	}
}

describe('Refusal', () => {
	it('answers its status with { error } when no field is named', () => {
		const err = new NoSuchThing(7);
		expect(isRefusal(err)).toBe(true);
		expect(err.status).toBe(404);
		expect(err.body()).toEqual({ error: 'No thing #7.' });
		expect(refusalAnswer(err)).toEqual({ status: 404, message: 'No thing #7.' });
	});
	it('lists field problems under fields', () => {
		const err = new BadThing([{ field: 'widthUm', message: 'must be greater than 0' }]);
		expect(err.body()).toEqual({
			error: 'widthUm: must be greater than 0',
			fields: [{ field: 'widthUm', message: 'must be greater than 0' }]
		});
	});
	it('is not claimed by plain errors or look-alikes', () => {
		expect(isRefusal(new Error('boom'))).toBe(false);
		expect(isRefusal({ status: 404, message: 'duck' })).toBe(false);
		expect(isRefusal(undefined)).toBe(false);
	});
});
