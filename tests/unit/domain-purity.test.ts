import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

/**
 * src/lib/domain is pure computation: the web app, the jobs and the benchmarks share it, so it
 * may import only other domain modules — no server code, database, framework or I/O.
 */
const DOMAIN = path.resolve('src/lib/domain');

function sources(dir: string): string[] {
	return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
		const full = path.join(dir, e.name);
		if (e.isDirectory()) return sources(full);
		return /\.ts$/.test(e.name) && !/\.test\.ts$|\.d\.ts$/.test(e.name) ? [full] : [];
	});
}

function importsOf(file: string): string[] {
	const source = ts.createSourceFile(
		file,
		fs.readFileSync(file, 'utf8'),
		ts.ScriptTarget.Latest,
		true
	);
	const found: string[] = [];
	const visit = (node: ts.Node) => {
		if (
			(ts.isImportDeclaration(node) || ts.isExportDeclaration(node)) &&
			node.moduleSpecifier &&
			ts.isStringLiteral(node.moduleSpecifier)
		) {
			found.push(node.moduleSpecifier.text);
		}
		if (
			ts.isCallExpression(node) &&
			node.expression.kind === ts.SyntaxKind.ImportKeyword &&
			ts.isStringLiteral(node.arguments[0])
		) {
			found.push(node.arguments[0].text);
		}
		if (
			ts.isCallExpression(node) &&
			ts.isIdentifier(node.expression) &&
			node.expression.text === 'require'
		)
			found.push('require()');
		ts.forEachChild(node, visit);
	};
	visit(source);
	return found;
}

/** An import that stays inside src/lib/domain. */
export function isPureImport(fromFile: string, specifier: string): boolean {
	if (!specifier.startsWith('.')) return false;
	const target = path.resolve(path.dirname(fromFile), specifier);
	return target === DOMAIN || target.startsWith(DOMAIN + path.sep);
}

describe('the domain is pure', () => {
	const files = sources(DOMAIN);

	it('has modules to check', () => expect(files.length).toBeGreaterThan(15));

	for (const file of files) {
		it(`${path.relative(process.cwd(), file)} imports only domain modules`, () => {
			expect(importsOf(file).filter((s) => !isPureImport(file, s))).toEqual([]);
		});
	}

	it('flags server, framework, database and Node imports', () => {
		const probe = path.join(DOMAIN, 'probe.ts');
		for (const bad of [
			'../server/db',
			'$app/server',
			'@sveltejs/kit',
			'sequelize',
			'node:fs',
			'../../routes/x'
		]) {
			expect(isPureImport(probe, bad), bad).toBe(false);
		}
		expect(isPureImport(probe, './stats/ols')).toBe(true);
	});

	it('reads no clock: Date.now() and argument-less new Date() stay out', () => {
		const offenders = files.filter((f) =>
			/Date\.now\(\)|new Date\(\)/.test(fs.readFileSync(f, 'utf8'))
		);
		expect(offenders.map((f) => path.relative(process.cwd(), f))).toEqual([]);
	});
});
