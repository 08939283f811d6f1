import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: adapter(),
		// instrumentation.server.ts runs before adapter-node reads its environment, which is how
		// `node build` gets Rollbead's defaults for ORIGIN and BODY_SIZE_LIMIT.
		experimental: { instrumentation: { server: true } }
	}
};

export default config;
