/**
 * Words for a stored point key ("run:15", "board:88", "cfx-unit:12"): what a user calls the point
 * when the chart's own label (board serial, run and line) is not at hand. A board a machine
 * reported over CFX is named by its serial when the caller knows it, else as the machine's board
 * with our row number (never the internal key). Unknown keys are returned as they are, without
 * the colon.
 * @example pointKeyWords('run:15') // 'print run 15'
 * @example pointKeyWords('cfx-unit:12', 'FW-LM48-000777') // 'board FW-LM48-000777'
 * @example pointKeyWords('cfx-unit:12') // 'machine board #12'
 */
export function pointKeyWords(key: string, serial?: string | null): string {
	const cfxUnit = /^cfx-unit:(\d+)$/.exec(key);
	if (cfxUnit) return serial?.trim() ? `board ${serial.trim()}` : `machine board #${cfxUnit[1]}`;
	const m = /^(run|board):(\d+)$/.exec(key);
	if (!m) return key.replace(/:/g, ' ');
	return m[1] === 'run' ? `print run ${m[2]}` : `board ${m[2]}`;
}
