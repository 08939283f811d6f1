import { describe, expect, it } from 'vitest';
import { pointKeyWords } from './point-key';

describe('pointKeyWords', () => {
	it.each([
		['run:15', 'print run 15'],
		['board:88', 'board 88'],
		['row:3', 'row 3']
	])('%s → %s', (key, words) => expect(pointKeyWords(key)).toBe(words));
});
