import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: adapter(),
		// Form posts are checked against ORIGIN; API clients use Bearer tokens, not cookies.
		csrf: { checkOrigin: true }
	}
};

export default config;
