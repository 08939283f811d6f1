import tailwindcss from '@tailwindcss/vite';
import { sveltekit } from '@sveltejs/kit/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	test: {
		include: ['src/**/*.{test,spec}.{js,ts}', 'tests/unit/**/*.{test,spec}.{js,ts}'],
		environment: 'node',
		// Database tests each open their own temporary file; keep workers modest on 2 cores.
		maxWorkers: 2,
		// Password hashing, SQLite files and child processes are slow on a loaded 2-core CI machine.
		testTimeout: 20_000
	}
});
