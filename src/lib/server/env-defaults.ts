const MEGABYTE = 1024 * 1024;

/** The largest upload accepted, from `MAX_UPLOAD_MB` (default 1024). */
export function maxUploadBytes(env: NodeJS.ProcessEnv = process.env): number {
	const mb = Number(env.MAX_UPLOAD_MB ?? 1024);
	return (Number.isFinite(mb) && mb > 0 ? mb : 1024) * MEGABYTE;
}

/** Positive number from the environment, else the default (a typo never removes a limit). */
function positiveSetting(value: string | undefined, fallback: number): number {
	const n = Number(value);
	return value !== undefined && value.trim() !== '' && Number.isFinite(n) && n > 0 ? n : fallback;
}

/** The largest JSON or form body on ordinary routes, from `MAX_JSON_KB` (default 1024 = 1 MB). */
export function jsonBodyLimitBytes(env: NodeJS.ProcessEnv = process.env): number {
	return Math.floor(positiveSetting(env.MAX_JSON_KB, 1024) * 1024);
}

/** The largest stencil file or study body, from `MAX_FILE_MB` (default 25). */
export function fileBodyLimitBytes(env: NodeJS.ProcessEnv = process.env): number {
	return Math.floor(positiveSetting(env.MAX_FILE_MB, 25) * MEGABYTE);
}

/**
 * Fill in adapter-node settings Rollbead relies on, unless the operator set them:
 * - BODY_SIZE_LIMIT: uploads up to MAX_UPLOAD_MB must reach the import route, which then
 *   answers 413 itself with a clear message; other routes refuse large bodies in hooks.
 * - ORIGIN: without it adapter-node assumes https and refuses every form post over plain http.
 *   The default suits a browser on the same machine; on the floor set the address people type.
 */
export function applyServerEnvDefaults(env: NodeJS.ProcessEnv): void {
	// A little headroom above the limit so the route, not the adapter, reports an oversized file.
	env.BODY_SIZE_LIMIT ??= String(maxUploadBytes(env) + 4 * MEGABYTE);
	if (!env.ORIGIN && !env.PROTOCOL_HEADER && !env.HOST_HEADER) {
		env.ORIGIN = `http://localhost:${env.PORT ?? '3000'}`;
	}
}
