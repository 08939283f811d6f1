// `npm start` builds first when there is no build yet or the sources are newer than it,
// so the README's single start line works on a fresh clone.
import { execSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

const BUILD_ENTRY = 'build/index.js';
const SOURCES = ['src', 'static', 'drizzle', 'package.json', 'svelte.config.js', 'vite.config.ts'];

function newestMtime(path) {
	const stat = statSync(path);
	if (!stat.isDirectory()) return stat.mtimeMs;
	let newest = stat.mtimeMs;
	for (const entry of readdirSync(path)) newest = Math.max(newest, newestMtime(join(path, entry)));
	return newest;
}

const builtAt = existsSync(BUILD_ENTRY) ? statSync(BUILD_ENTRY).mtimeMs : 0;
const changedAt = Math.max(...SOURCES.filter(existsSync).map(newestMtime));
if (changedAt > builtAt) {
	console.log(
		builtAt ? 'Sources changed since the last build; rebuilding…' : 'No build yet; building…'
	);
	execSync('npm run build', { stdio: 'inherit' });
}
