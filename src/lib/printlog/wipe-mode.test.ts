import { describe, it, expect } from 'vitest';
import { allWipeModes, parseWipeMode, wipeModeString } from './wipe-mode';

describe('parseWipeMode', () => {
	const valid: [string, string][] = [
		['dry', 'dry'],
		['wet', 'wet'],
		['vacuum', 'vacuum'],
		['wet-vacuum', 'wet-vacuum'],
		['wet-vacuum-dry', 'wet-vacuum-dry'],
		['dry-vacuum-wet', 'wet-vacuum-dry'],
		['  Dry + WET ', 'wet-dry'],
		['vacuum, dry', 'vacuum-dry'],
		['wet/wet/dry', 'wet-dry']
	];
	it.each(valid)('%j → %s', (text, canonical) => {
		const result = parseWipeMode(text);
		expect(result).toMatchObject({ ok: true, canonical });
	});

	const invalid: [unknown, RegExp][] = [
		['', /must name at least one of wet, vacuum, dry \(got ""\)/],
		['   ', /must name at least one/],
		[undefined, /got missing/],
		[3, /got 3/],
		['wet-steam', /unknown wipe step 'steam'/],
		['--', /unknown wipe step/]
	];
	it.each(invalid)('%j → error', (text, message) => {
		const result = parseWipeMode(text, 'parameters.wipeMode');
		expect(result.ok).toBe(false);
		if (!result.ok) {
			expect(result.error.field).toBe('parameters.wipeMode');
			expect(result.error.message).toMatch(message);
		}
	});
});

describe('wipeModeString and allWipeModes', () => {
	it('orders steps canonically', () => {
		expect(wipeModeString(['dry', 'vacuum'])).toBe('vacuum-dry');
	});
	it('lists the 2³ − 1 = 7 non-empty subsets, each canonical and distinct', () => {
		const modes = allWipeModes();
		expect(modes).toHaveLength(7);
		expect(new Set(modes).size).toBe(7);
		for (const mode of modes)
			expect(parseWipeMode(mode)).toMatchObject({ ok: true, canonical: mode });
	});
});
