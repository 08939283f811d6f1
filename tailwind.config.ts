/**
 * Tailwind CSS 4 reads its theme from CSS (`@theme` in src/app.css); this file exists so editors
 * and tooling that look for a Tailwind config find where the palette lives. It is not loaded by
 * the build (no `@config` directive), so there is one source of truth for colours.
 */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	darkMode: 'class'
};
