const MEGABYTE = 1024 * 1024;

/** The largest upload accepted, from `MAX_UPLOAD_MB` (default 1024). */
export function maxUploadBytes(env: NodeJS.ProcessEnv = process.env): number {
	const mb = Number(env.MAX_UPLOAD_MB ?? 1024);
	return (Number.isFinite(mb) && mb > 0 ? mb : 1024) * MEGABYTE;
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
