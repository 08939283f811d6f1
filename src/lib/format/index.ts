/** Display helpers. Stored values stay unrounded; rounding happens only here. */

const dateTime = new Intl.DateTimeFormat('en-GB', {
	year: 'numeric',
	month: 'short',
	day: '2-digit',
	hour: '2-digit',
	minute: '2-digit'
});

/** e.g. "02 Dec 2026, 14:05" in the viewer's time zone. */
export function formatDateTime(value: Date | number | string | null | undefined): string {
	if (value == null) return '';
	const date = value instanceof Date ? value : new Date(value);
	return Number.isNaN(date.getTime()) ? '' : dateTime.format(date);
}

/** A number with fixed decimals, or an en dash when it is missing or not finite. */
export function formatNumber(value: number | null | undefined, decimals = 2): string {
	if (value == null || !Number.isFinite(value)) return '–';
	return value.toLocaleString('en-GB', {
		minimumFractionDigits: decimals,
		maximumFractionDigits: decimals
	});
}

/** A share (0..1) as a percentage. */
export function formatPercent(share: number | null | undefined, decimals = 1): string {
	if (share == null || !Number.isFinite(share)) return '–';
	return `${formatNumber(share * 100, decimals)} %`;
}
