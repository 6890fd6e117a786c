/**
 * Last line of defence for the web server: an error event from a request's stream that nobody
 * listened to (a client gone mid-upload, a body cut off) is logged and survived, because one
 * request must never take the product down. Any other uncaught error still ends the process,
 * loudly, so bugs are not hidden (and `npm start` restarts the server). Off under vitest.
 */
const STREAM_CODES = new Set([
	'ECONNRESET',
	'EPIPE',
	'ECONNABORTED',
	'ERR_STREAM_PREMATURE_CLOSE',
	'ERR_STREAM_DESTROYED'
]);
// busboy's messages for a multipart body that breaks off or is malformed.
const MULTIPART_MESSAGES =
	/^(Unexpected end of (form|file)|Malformed part header|Malformed urlencoded form)$/;

export function isStrayStreamError(err: unknown): boolean {
	if (!(err instanceof Error)) return false;
	const code = (err as NodeJS.ErrnoException).code;
	return (code !== undefined && STREAM_CODES.has(code)) || MULTIPART_MESSAGES.test(err.message);
}

let installed = false;

export function installProcessGuard(): void {
	if (installed || process.env.VITEST) return;
	installed = true;
	process.on('uncaughtException', (err) => {
		if (isStrayStreamError(err)) {
			console.error('[guard] a request stream failed; the server keeps running:', err.message);
			return;
		}
		console.error('[fatal] uncaught error; stopping', err);
		process.exit(1);
	});
}
