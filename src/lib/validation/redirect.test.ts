import { describe, expect, it } from 'vitest';
import { safeRedirect } from './redirect';

describe('safeRedirect', () => {
	it('keeps paths on this site, with their query and fragment', () => {
		expect(safeRedirect('/fleet')).toBe('/fleet');
		expect(safeRedirect('/fleet/vans/3?tab=story#chart')).toBe('/fleet/vans/3?tab=story#chart');
		expect(safeRedirect('/fleet/%2F%2Fevil.example')).toBe('/fleet/%2F%2Fevil.example');
	});

	// The bypass forms below are the usual ones listed in OWASP's "Unvalidated Redirects and
	// Forwards Cheat Sheet" and the WHATWG URL Standard's parsing rules (tabs and newlines are
	// removed, a backslash counts as a slash in http(s) URLs).
	it.each([
		['', 'empty'],
		['https://evil.example', 'absolute URL'],
		['//evil.example', 'scheme-relative'],
		['/\\evil.example', 'backslash read as slash'],
		['\\\\evil.example', 'two backslashes'],
		['/\t/evil.example', 'tab removed by the URL parser'],
		['/\n/evil.example', 'newline removed by the URL parser'],
		['/\r/evil.example', 'carriage return'],
		['/%09/evil.example'.replace('%09', '\u0009'), 'decoded tab'],
		['/ /evil.example', 'space'],
		['javascript:alert(1)', 'script scheme'],
		['data:text/html,hi', 'data scheme'],
		['evil.example', 'no leading slash'],
		['/\u0000/evil.example', 'NUL'],
		['/\u007f', 'DEL'],
		['/' + 'a'.repeat(3000), 'over-long']
	])('refuses %j (%s)', (target) => {
		expect(safeRedirect(target)).toBeNull();
	});

	it('refuses nothing given', () => {
		expect(safeRedirect(null)).toBeNull();
		expect(safeRedirect(undefined)).toBeNull();
	});
});
