/**
 * Words for a stored point key ("run:15", "board:88"): what a user calls the point when the
 * chart's own label (board serial, run and line) is not at hand. Unknown keys are returned as
 * they are, without the colon.
 * @example pointKeyWords('run:15') // 'print run 15'
 */
export function pointKeyWords(key: string): string {
	const m = /^(run|board):(\d+)$/.exec(key);
	if (!m) return key.replace(/:/g, ' ');
	return m[1] === 'run' ? `print run ${m[2]}` : `board ${m[2]}`;
}
