// Rollbead's server: `npm start`, the end-to-end tests and the benchmarks all run this file
// (`node server.js`, or `node server.js OTHER_BUILD_FOLDER`). It is adapter-node's own server
// (build/index.js, with its PORT, HOST, SOCKET_PATH, graceful shutdown and the environment
// defaults of src/instrumentation.server.ts) with one addition, the adapter's documented "custom
// server" seam: the base security headers are set on every response before anything answers it.
// adapter-node serves static files (/_app/immutable/…, favicon.svg) before SvelteKit's hooks
// run, so without this they would carry none; SvelteKit's own answers set theirs over these
// (hooks.server.ts adds the CSP and Cache-Control), and static files keep adapter-node's caching.
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { baseSecurityHeaders } from './src/lib/server/base-headers.js';

const buildFolder = resolve(process.argv[2] ?? join(import.meta.dirname, 'build'));
const { server } = await import(pathToFileURL(join(buildFolder, 'index.js')).href);

// Read after the build's start-up code has filled in ORIGIN's default.
const headers = baseSecurityHeaders(process.env.ORIGIN);

// The first 'request' listener, so it runs before the adapter's handler sees the request. It is
// added before the first connection can arrive: the import above resolves without waiting on I/O.
server.server.prependListener(
	'request',
	/** @param {import('node:http').IncomingMessage} _req @param {import('node:http').ServerResponse} res */
	(_req, res) => {
		for (const [name, value] of headers) res.setHeader(name, value);
	}
);
