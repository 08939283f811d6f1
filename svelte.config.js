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
		experimental: { instrumentation: { server: true } }
	}
};

export default config;
