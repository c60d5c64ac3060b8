// The app's route tree, read from src/routes at test time: every page, every form action and
// every method of every endpoint. The role × route matrix runs over this list, so a route added
// to the app without a rule in ./rules.ts fails the matrix.
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';

export const routesDir = fileURLToPath(new URL('../../src/routes', import.meta.url));

export interface RouteCase {
	/** `GET /(app)/jobs`, `POST /(app)/shop?/create`, `POST /sign-out?/default`, `POST /api/staff`. */
	key: string;
	/** SvelteKit's route id: the folder path under src/routes, groups included. */
	routeId: string;
	kind: 'page' | 'action' | 'endpoint';
	method: string;
	action?: string;
}

const endpointMethods = ['GET', 'HEAD', 'POST', 'PUT', 'PATCH', 'DELETE', 'OPTIONS', 'fallback'];

/** The names a module exports (const, let, function), read with the TypeScript parser. */
function exportedNames(source: ts.SourceFile): Map<string, ts.Node> {
	const out = new Map<string, ts.Node>();
	for (const st of source.statements) {
		const exported = ts
			.getModifiers(st as ts.HasModifiers)
			?.some((m) => m.kind === ts.SyntaxKind.ExportKeyword);
		if (ts.isFunctionDeclaration(st) && exported && st.name) out.set(st.name.text, st);
		if (ts.isVariableStatement(st) && exported) {
			for (const d of st.declarationList.declarations) {
				if (ts.isIdentifier(d.name)) out.set(d.name.text, d.initializer ?? d);
			}
		}
		if (ts.isExportDeclaration(st) && st.exportClause && ts.isNamedExports(st.exportClause)) {
			for (const e of st.exportClause.elements) out.set(e.name.text, e);
		}
	}
	return out;
}

/** The keys of `export const actions = { … } satisfies Actions`. */
function actionNames(node: ts.Node | undefined): string[] {
	let n = node;
	while (
		n &&
		(ts.isSatisfiesExpression(n) || ts.isAsExpression(n) || ts.isParenthesizedExpression(n))
	)
		n = n.expression;
	if (!n || !ts.isObjectLiteralExpression(n)) {
		throw new Error(
			'an `actions` export that is not an object literal: teach routes.ts to read it'
		);
	}
	return n.properties.map((p) => {
		if (!p.name || !(ts.isIdentifier(p.name) || ts.isStringLiteral(p.name))) {
			throw new Error('an action with a computed name: teach routes.ts to read it');
		}
		return p.name.text;
	});
}

function parse(file: string): ts.SourceFile {
	return ts.createSourceFile(file, readFileSync(file, 'utf8'), ts.ScriptTarget.Latest, true);
}

function walk(dir: string, out: RouteCase[]) {
	const rel = relative(routesDir, dir).split(sep).filter(Boolean).join('/');
	const routeId = '/' + rel;
	const has = (name: string) => existsSync(join(dir, name));
	const pageFiles = ['+page.svelte', '+page.server.ts', '+page.ts', '+page.server.js', '+page.js'];
	if (pageFiles.some(has)) {
		out.push({ key: `GET ${routeId}`, routeId, kind: 'page', method: 'GET' });
	}
	for (const server of ['+page.server.ts', '+page.server.js']) {
		if (!has(server)) continue;
		const exports = exportedNames(parse(join(dir, server)));
		if (!exports.has('actions')) continue;
		for (const action of actionNames(exports.get('actions'))) {
			out.push({
				key: `POST ${routeId}?/${action}`,
				routeId,
				kind: 'action',
				method: 'POST',
				action
			});
		}
	}
	for (const server of ['+server.ts', '+server.js']) {
		if (!has(server)) continue;
		const exports = exportedNames(parse(join(dir, server)));
		const methods = endpointMethods.filter((m) => exports.has(m));
		if (methods.length === 0) throw new Error(`${dir}/${server} exports no HTTP method`);
		for (const method of methods) {
			out.push({ key: `${method} ${routeId}`, routeId, kind: 'endpoint', method });
		}
	}
	for (const entry of readdirSync(dir, { withFileTypes: true })) {
		if (entry.isDirectory()) walk(join(dir, entry.name), out);
	}
}

/** Every page, action and endpoint method under src/routes, sorted by key. */
export function routeCases(): RouteCase[] {
	const out: RouteCase[] = [];
	walk(routesDir, out);
	return out.sort((a, b) => a.key.localeCompare(b.key));
}

/**
 * The URL path of a route id with its params filled in: groups `(app)` drop out, `[name]` takes
 * `params[name]` (a missing one throws, so a new param needs a value in the matrix).
 */
export function pathOf(routeId: string, params: Record<string, string>): string {
	const parts = routeId
		.split('/')
		.filter((p) => p && !/^\(.+\)$/.test(p))
		.map((p) => {
			const m = /^\[(\w+)\]$/.exec(p);
			if (!m) {
				if (p.includes('[')) throw new Error(`a route segment the matrix cannot fill: ${p}`);
				return p;
			}
			const v = params[m[1]];
			if (v === undefined) throw new Error(`no value for [${m[1]}] in ${routeId}`);
			return encodeURIComponent(v);
		});
	return '/' + parts.join('/');
}
