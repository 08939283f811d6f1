/**
 * Axis tick labels with as many decimals as the tick step needs and never exponent notation:
 * d3's ticks of a tiny or flat range (e.g. moving ranges that are all 0) come out as 5e-10 or
 * 0.30000000000000004 when printed as they are.
 * @example tickLabels([0, 5e-10, 1e-9]) // ['0', '0', '0'] (a step below 1e-6 reads as 0)
 * @example tickLabels([0, 0.2, 0.4]) // ['0.0', '0.2', '0.4']
 */
export function tickLabels(ticks: readonly number[]): string[] {
	const step = ticks.length > 1 ? Math.abs(ticks[1] - ticks[0]) : 0;
	const decimals =
		step >= 1e-6 ? Math.min(6, Math.max(0, -Math.floor(Math.log10(step) + 1e-9))) : 0;
	return ticks.map((t) => {
		const v = Math.abs(t) < 1e-6 ? 0 : t;
		return v.toLocaleString('en-GB', {
			minimumFractionDigits: decimals,
			maximumFractionDigits: decimals,
			useGrouping: false
		});
	});
}
