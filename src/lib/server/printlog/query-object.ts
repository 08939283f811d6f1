/** Search parameters as a plain object, blank values dropped. */
export function queryObject(url: URL): Record<string, string> {
	return Object.fromEntries([...url.searchParams].filter(([, v]) => v.trim() !== ''));
}
