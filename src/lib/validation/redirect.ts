/**
 * The one check for a destination that arrives with a request (`?redirectTo=` after sign-in):
 * only a path on this site is allowed, so a link can never send someone elsewhere once signed in.
 * Browsers drop tabs and newlines from URLs and read `\` as `/`, so `/\t/evil.example` or
 * `/\evil.example` would leave the site: anything but a plain path is refused.
 */
const PROBE_ORIGIN = 'http://sootcast.invalid';

export function safeRedirect(target: string | undefined | null): string | null {
	if (!target || target.length > 2048) return null;
	if (!target.startsWith('/') || target.startsWith('//')) return null;
	// Control characters (tab, CR, LF, NUL …), DEL, backslashes and spaces: never in our paths.
	if (/[\u0000-\u0020\u007f\\]/.test(target)) return null;
	let resolved: URL;
	try {
		resolved = new URL(target, PROBE_ORIGIN);
	} catch {
		return null;
	}
	if (resolved.origin !== PROBE_ORIGIN) return null;
	return resolved.pathname + resolved.search + resolved.hash;
}
