/** Kept for scripts that import it here; the mappings are pure and live in `$lib/spc/api-json`. */
export {
	acknowledgeBodySchema,
	chartJson,
	chartQuery,
	signalJson,
	signalQuery
} from '$lib/spc/api-json';
