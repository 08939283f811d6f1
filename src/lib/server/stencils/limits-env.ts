import { DEFAULT_STENCIL_LIMITS, withLimits, type StencilLimits } from '$lib/stencil/limits';

/**
 * Environment variables a site may set to raise (or lower) a stencil work budget, and the budget
 * each sets. Others stay fixed: they are documented contracts (1,000 vertices per outline,
 * 50,000 apertures per stencil) or protect the format parsers.
 */
export const STENCIL_LIMIT_ENV: Readonly<Record<string, keyof StencilLimits>> = Object.freeze({
	STENCIL_MAX_VERTICES_PER_IMPORT: 'maxVerticesPerImport',
	STENCIL_MAX_VERTICES_PER_STENCIL: 'maxVerticesPerStencil',
	STENCIL_PARSE_TIMEOUT_MS: 'parseDeadlineMs',
	STENCIL_PARSE_HEAP_MB: 'parseHeapMb'
});

const warned = new Set<string>();

/**
 * The stencil budgets with the environment's overrides; a value that is not a whole number > 0
 * keeps the default (a typo never removes a limit) and is reported once on the console.
 * @example stencilLimitsFromEnv({ STENCIL_PARSE_TIMEOUT_MS: '60000' }).parseDeadlineMs // 60000
 */
export function stencilLimitsFromEnv(env: NodeJS.ProcessEnv = process.env): StencilLimits {
	const overrides: Partial<StencilLimits> = {};
	for (const [name, key] of Object.entries(STENCIL_LIMIT_ENV)) {
		const raw = env[name];
		if (raw === undefined || raw.trim() === '') continue;
		const n = /^\d+$/.test(raw.trim()) ? Number(raw.trim()) : NaN;
		if (Number.isSafeInteger(n) && n > 0) overrides[key] = n;
		else if (!warned.has(name)) {
			warned.add(name);
			console.warn(
				`${name}=${JSON.stringify(raw)} is not a whole number > 0; ` +
					`using the default ${DEFAULT_STENCIL_LIMITS[key]}`
			);
		}
	}
	return withLimits(overrides);
}
