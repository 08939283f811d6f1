import { describe, expect, it } from 'vitest';
import { jsonTooDeep, MAX_JSON_DEPTH } from './json-depth';

describe('jsonTooDeep', () => {
	it('accepts ordinary bodies', () => {
		expect(jsonTooDeep('{"a":[1,2,{"b":[3]}]}')).toBeNull();
		expect(jsonTooDeep('')).toBeNull();
		expect(jsonTooDeep('42')).toBeNull();
	});

	it('names the character where the limit is passed', () => {
		expect(jsonTooDeep('[[1]]', 1)).toEqual({ depth: 2, at: 2 });
		expect(jsonTooDeep('{"a":{"b":1}}', 1)).toEqual({ depth: 2, at: 6 });
	});

	it('ignores brackets inside strings, escaped quotes included', () => {
		expect(jsonTooDeep('["[[[[", "\\"[[[[", "{{{"]', 1)).toBeNull();
		expect(jsonTooDeep('["\\\\", [1]]', 1)).toEqual({ depth: 2, at: 8 });
	});

	it('refuses a million nested arrays at the limit, without recursion', () => {
		const text = '['.repeat(1_000_000) + ']'.repeat(1_000_000);
		expect(jsonTooDeep(text)).toEqual({ depth: MAX_JSON_DEPTH + 1, at: MAX_JSON_DEPTH + 1 });
	});

	it('accepts exactly the limit', () => {
		const text = '['.repeat(MAX_JSON_DEPTH) + ']'.repeat(MAX_JSON_DEPTH);
		expect(jsonTooDeep(text)).toBeNull();
	});
});
