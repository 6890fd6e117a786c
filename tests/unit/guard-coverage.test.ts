import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';
import { AREA_ROLES } from '../../src/lib/server/auth/guards';

/**
 * Every load, action and HTTP handler of the signed-in areas and the API must call one of the
 * guards itself, so a route added later cannot forget access control.
 */
const GUARDS = ['requireUser', 'requireRole', 'requireApiUser'];
const HTTP_METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'];
/** Public on purpose, with the reason. */
const PUBLIC_ENDPOINTS: Record<string, string> = {
	'src/routes/api/health/+server.ts': 'health check for load balancers and benchmarks',
	'src/routes/api/v1/openapi.json/+server.ts':
		'the API description, read by integrators before they have a token'
};
/** Folders of (app) that every signed-in role may open (not an area of one role). */
const SHARED_APP_FOLDERS = ['settings'];

const ROUTES = path.resolve('src/routes');

function walk(dir: string): string[] {
	return fs
		.readdirSync(dir, { withFileTypes: true })
		.flatMap((e) => (e.isDirectory() ? walk(path.join(dir, e.name)) : [path.join(dir, e.name)]));
}

function callsGuard(node: ts.Node): boolean {
	let found = false;
	const visit = (n: ts.Node) => {
		if (
			ts.isCallExpression(n) &&
			ts.isIdentifier(n.expression) &&
			GUARDS.includes(n.expression.text)
		)
			found = true;
		if (!found) ts.forEachChild(n, visit);
	};
	visit(node);
	return found;
}

/** Names of the exported handlers in a route module that do not call a guard. */
export function unguardedHandlers(source: string, fileName = 'x.ts'): string[] {
	const file = ts.createSourceFile(fileName, source, ts.ScriptTarget.Latest, true);
	const missing: string[] = [];
	const check = (name: string, body: ts.Node | undefined) => {
		if (!body || !callsGuard(body)) missing.push(name);
	};
	for (const stmt of file.statements) {
		const exported =
			ts.canHaveModifiers(stmt) &&
			ts.getModifiers(stmt)?.some((m) => m.kind === ts.SyntaxKind.ExportKeyword);
		if (!exported) continue;
		if (ts.isFunctionDeclaration(stmt) && stmt.name) {
			const name = stmt.name.text;
			if (HTTP_METHODS.includes(name) || name === 'load') check(name, stmt.body);
		}
		if (ts.isVariableStatement(stmt)) {
			for (const decl of stmt.declarationList.declarations) {
				if (!ts.isIdentifier(decl.name)) continue;
				const name = decl.name.text;
				if (HTTP_METHODS.includes(name) || name === 'load') check(name, decl.initializer);
				if (name === 'actions' && decl.initializer) {
					const init =
						ts.isSatisfiesExpression(decl.initializer) || ts.isAsExpression(decl.initializer)
							? decl.initializer.expression
							: decl.initializer;
					if (!ts.isObjectLiteralExpression(init)) {
						missing.push('actions (not an object literal the check can read)');
						continue;
					}
					for (const prop of init.properties) {
						const propName =
							prop.name && (ts.isIdentifier(prop.name) || ts.isStringLiteral(prop.name))
								? prop.name.text
								: '?';
						if (ts.isPropertyAssignment(prop)) check(`actions.${propName}`, prop.initializer);
						else if (ts.isMethodDeclaration(prop)) check(`actions.${propName}`, prop.body);
						else missing.push(`actions.${propName} (shorthand: write the handler inline)`);
					}
				}
			}
		}
	}
	return missing;
}

const guarded = walk(ROUTES)
	.map((f) => path.relative(process.cwd(), f))
	.filter((f) => f.includes('/(app)/') || f.startsWith('src/routes/api/'))
	.filter((f) => /\+(page|layout)\.server\.ts$|\+server\.ts$/.test(f));

describe('guard coverage', () => {
	it('finds the route modules to check', () => {
		expect(guarded.length).toBeGreaterThan(8);
	});

	for (const file of guarded) {
		it(`${file} guards every load, action and handler`, () => {
			if (PUBLIC_ENDPOINTS[file]) return;
			expect(unguardedHandlers(fs.readFileSync(file, 'utf8'), file)).toEqual([]);
		});
	}

	it('every folder of the signed-in shell belongs to a role area or is shared on purpose', () => {
		const top = fs
			.readdirSync(path.join(ROUTES, '(app)'), { withFileTypes: true })
			.filter((e) => e.isDirectory())
			.map((e) => e.name);
		const unknown = top.filter(
			(name) => !(name in AREA_ROLES) && !SHARED_APP_FOLDERS.includes(name)
		);
		expect(unknown).toEqual([]);
	});

	it('reports a handler, an action and a load that skip the guard', () => {
		const source = `
			export const GET = async () => new Response('x');
			export const POST = async () => { requireRole('fleet_manager'); return new Response('ok'); };
			export async function load() { return {}; }
			export const actions = { save: async () => {}, remove: async () => { requireUser(); } };
		`;
		expect(unguardedHandlers(source)).toEqual(['GET', 'load', 'actions.save']);
	});
});
