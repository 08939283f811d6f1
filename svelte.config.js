import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: adapter(),
		// Kit's own origin check also refuses multipart posts from scripts and machines, which send
		// no Origin header; hooks.server.ts applies the same check to cookie-authenticated requests
		// only, and Bearer-token API calls (not forgeable cross-site) pass.
		csrf: { checkOrigin: false },
		// instrumentation.server.ts runs before adapter-node reads its environment, which is how
		// `node build` gets Rollbead's defaults for ORIGIN and BODY_SIZE_LIMIT.
		experimental: { instrumentation: { server: true } },
		// Content-Security-Policy on every page: scripts only from Rollbead itself or with the
		// per-answer nonce kit adds (no inline scripts otherwise, no eval). Styles allow inline
		// `style` attributes, which Svelte and the charts set on elements. Other answers get a
		// stricter fallback in $lib/server/security-headers.ts.
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				'font-src': ['self', 'data:'],
				'connect-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
