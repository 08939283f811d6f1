import { describe, expect, it } from 'vitest';
import { pointKeyWords } from './point-key';

describe('pointKeyWords', () => {
	it.each([
		['run:15', 'print run 15'],
		['board:88', 'board 88'],
		['row:3', 'row 3']
	])('%s → %s', (key, words) => expect(pointKeyWords(key)).toBe(words));

	it('words a board a machine reported over CFX as the trade does, never as the internal key', () => {
		expect(pointKeyWords('cfx-unit:12', 'FW-LM48-000777')).toBe('board FW-LM48-000777');
		expect(pointKeyWords('cfx-unit:12', ' FW-LM48-000777 ')).toBe('board FW-LM48-000777');
		expect(pointKeyWords('cfx-unit:12')).toBe('machine board #12');
		expect(pointKeyWords('cfx-unit:12', null)).toBe('machine board #12');
		expect(pointKeyWords('cfx-unit:12', '  ')).toBe('machine board #12');
	});

	it('leaves a serial aside for keys that are not CFX boards', () => {
		expect(pointKeyWords('run:15', 'FW-1')).toBe('print run 15');
	});
});
