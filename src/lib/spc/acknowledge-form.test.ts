import { describe, expect, it } from 'vitest';
import { readAcknowledgeForm } from './acknowledge-form';

const form = (fields: Record<string, string>) => {
	const f = new FormData();
	for (const [k, v] of Object.entries(fields)) f.set(k, v);
	return f;
};

describe('readAcknowledgeForm', () => {
	it('reads one signal with the chosen cause, action and note', () => {
		expect(
			readAcknowledgeForm(
				form({ id: '12', cause: ' Aperture clogged ', action: 'Clean apertures', note: 'U7' })
			)
		).toEqual({
			ok: true,
			id: 12,
			input: {
				cause: 'Aperture clogged',
				action: 'Clean apertures',
				note: 'U7',
				wholeRun: false,
				expectedCount: undefined
			}
		});
	});

	it('the wider scope carries the count the person was shown', () => {
		const out = readAcknowledgeForm(
			form({ id: '3', cause: 'c', action: 'a', scope: 'pattern', count: '4' })
		);
		expect(out.ok && out.input).toMatchObject({ wholeRun: true, expectedCount: 4 });
		const noCount = readAcknowledgeForm(
			form({ id: '3', cause: 'c', action: 'a', scope: 'pattern' })
		);
		expect(noCount.ok && noCount.input.expectedCount).toBeUndefined();
	});

	it('names an empty cause or action instead of choosing one, and a missing signal', () => {
		expect(readAcknowledgeForm(form({ id: '5', cause: '', action: 'a' }))).toMatchObject({
			ok: false,
			id: 5,
			field: 'cause'
		});
		expect(readAcknowledgeForm(form({ id: '5', cause: 'c', action: '  ' }))).toMatchObject({
			ok: false,
			field: 'action'
		});
		expect(readAcknowledgeForm(form({ id: 'x', cause: 'c', action: 'a' }))).toMatchObject({
			ok: false,
			field: 'id'
		});
	});
});
