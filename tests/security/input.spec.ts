// Bad input through the real server, generated with fast-check: every JSON body the API takes,
// the phrase text of the job log, and the query strings the app reads. Never a 500; a refused
// request leaves the job as it was; a 201 adds exactly one whole entry.
import { randomUUID } from 'node:crypto';
import { expect, test } from '@playwright/test';
import fc from 'fast-check';
import { db } from '../helpers/bench-db';
import { demo } from '../helpers/auth';
import { jobRows, makeFuzzJob, securityTargets } from './data';
import { send, signInSession, type Body } from './http';
import { pathOf, routeCases } from './routes';

type FuzzJob = Awaited<ReturnType<typeof makeFuzzJob>>;

/**
 * Arbitrary text: any code units, a mix weighted toward the awkward ones (NUL, a lone surrogate,
 * the right-to-left override, line breaks), or very long.
 */
const anyText = fc.oneof(
	fc.string({ unit: 'binary', maxLength: 80 }),
	fc.string({ unit: 'grapheme', maxLength: 80 }),
	fc.string({
		unit: fc.constantFrom('\u0000', '\ud800', '\u202e', '\n', '\t', 'a', '1', ' ', '.', 'é', '€'),
		maxLength: 30
	}),
	fc.string({ unit: 'binary-ascii', minLength: 480, maxLength: 520 })
);

/** A JSON body: mostly the route's own shape with bad values, else any JSON, else not JSON. */
function bodies(shape: fc.Arbitrary<Record<string, unknown>>): fc.Arbitrary<Body> {
	return fc.oneof(
		{ weight: 6, arbitrary: shape.map((json): Body => ({ json })) },
		{ weight: 2, arbitrary: fc.jsonValue().map((json): Body => ({ json })) },
		{
			weight: 1,
			arbitrary: fc
				.string({ unit: 'binary', maxLength: 120 })
				.map((raw): Body => ({ raw, contentType: 'application/json' }))
		}
	);
}

const loose = <T extends Record<string, fc.Arbitrary<unknown>>>(model: T) =>
	fc.record(model, { requiredKeys: [] }) as fc.Arbitrary<Record<string, unknown>>;

/** A phrase built from the job's own step words, numbers and unit words, with noise. */
function phrases(job: FuzzJob): fc.Arbitrary<string> {
	const words = job.steps.flatMap((s) => [s.label.toLowerCase(), ...s.aliases]);
	const units = [
		'nm',
		'Nm',
		'N·m',
		'kgf m',
		'lbf ft',
		'mm',
		'L',
		'ml',
		'qt',
		'kPa',
		'psi',
		'bar',
		'V',
		'rpm',
		'°C',
		''
	];
	const number = fc.oneof(
		fc.double({ noDefaultInfinity: false }).map(String),
		fc.integer().map(String),
		fc.constantFrom('twenty four point five', 'one point one', '1,5', '-0', '1e309', '0x1f')
	);
	const lead = fc.constantFrom(
		'',
		'note ',
		'new ',
		'done ',
		'spec ',
		'undo',
		'next',
		'scratch that '
	);
	const tail = fc.constantFrom(
		'',
		' at 10:30',
		' 5 minutes ago',
		' yesterday',
		' at 25:99',
		' filled'
	);
	return fc.oneof(
		{
			weight: 3,
			arbitrary: fc
				.tuple(lead, fc.constantFrom(...words), number, fc.constantFrom(...units), tail)
				.map(([l, w, n, u, t]) => `${l}${w} ${n} ${u}${t}`)
		},
		{ weight: 1, arbitrary: anyText }
	);
}

/** A route to fuzz, asked by the foreman (who passes every role guard of the API's writes). */
interface FuzzTarget {
	path: (job: FuzzJob) => string;
	body: (job: FuzzJob) => fc.Arbitrary<Body>;
	headers?: () => Record<string, string>;
	/** Entries a 200 may add (a checklist tick is one); a 201 always adds exactly one. */
	on200?: number;
	/** Bodies to try (default 100; fewer for routes that read none). */
	runs?: number;
	/** Bodies always tried besides the generated ones: the awkward cases known to matter. */
	examples?: (job: FuzzJob) => Body[];
}

/** Text PostgreSQL cannot store (NUL), a lone surrogate, a hidden direction change. */
const awkward = ['a\u0000b', '\u0000', '\ud800', 'x\u202ey'];

const uuidish = fc.oneof(fc.uuid(), fc.string({ maxLength: 40 }), fc.integer(), fc.constant(null));
const recent = fc
	.integer({ min: 0, max: 7 * 24 * 3600 })
	.map((s) => new Date(Date.now() - s * 1000).toISOString());
const isoish = fc.oneof(
	fc.date({ noInvalidDate: true }).map((d) => d.toISOString()),
	fc.constantFrom(
		'2026-02-30T10:00:00Z',
		'+275760-09-13T00:00:00.000Z',
		'-271821-04-20T00:00:00.000Z',
		'0000-01-01T00:00:00Z'
	),
	fc.string({ maxLength: 30 })
);

/** Every JSON-body route of the API, keyed as tests/security/routes.ts names them. */
const targets: Record<string, FuzzTarget | 'uploads'> = {
	'POST /api/jobs/[jobId]/entries': {
		path: (j) => `/api/jobs/${j.id}/entries`,
		body: (j) =>
			bodies(
				// Mostly a well-formed envelope, so that the fuzz reaches the phrase engine and the
				// database, with each field sometimes wrong and the optional ones mixed in.
				fc
					.tuple(
						fc.record({
							id: fc.oneof({ weight: 5, arbitrary: fc.uuid() }, uuidish),
							text: fc.oneof({ weight: 5, arbitrary: phrases(j) }, fc.anything()),
							source: fc.oneof(
								{ weight: 5, arbitrary: fc.constantFrom('typed', 'voice') },
								fc.anything()
							)
						}),
						loose({
							occurredAt: fc.oneof({ weight: 3, arbitrary: recent }, isoish),
							torqueToolId: fc.oneof({ weight: 3, arbitrary: fc.constant(null) }, uuidish),
							stepId: fc.oneof(
								{ weight: 3, arbitrary: fc.constantFrom(...j.steps.map((s) => s.id)) },
								uuidish
							),
							retracts: fc.oneof(fc.constant(j.overEntryId), uuidish)
						})
					)
					.map(([envelope, extra]) => ({ ...envelope, ...extra }))
			),
		examples: (j) => [
			...awkward.map((w): Body => ({
				json: { id: randomUUID(), text: `note ${w}`, source: 'typed' }
			})),
			{
				json: {
					id: randomUUID(),
					text: 'rear axle 80 Nm',
					source: 'typed',
					occurredAt: '0001-01-01T00:00:00Z'
				}
			},
			{ json: { id: randomUUID(), text: 'done test ride', source: 'voice', stepId: j.steps[0].id } }
		]
	},
	'POST /api/jobs/[jobId]/final-inspection': {
		path: (j) => `/api/jobs/${j.id}/final-inspection`,
		body: () => bodies(loose({ reason: fc.oneof(anyText, fc.anything()) })),
		examples: () => awkward.map((w): Body => ({ json: { reason: `waiting ${w}` } }))
	},
	'POST /api/floor/entries/[entryId]/accept': {
		path: (j) => `/api/floor/entries/${j.overEntryId}/accept`,
		body: () => bodies(loose({ reason: fc.oneof(anyText, fc.anything()) })),
		examples: () => awkward.map((w): Body => ({ json: { reason: `fine as it is ${w}` } }))
	},
	'POST /api/floor/entries/[entryId]/redo': {
		path: (j) => `/api/floor/entries/${j.overEntryId}/redo`,
		body: () => bodies(loose({ note: fc.oneof(anyText, fc.anything()) })),
		examples: () => awkward.map((w): Body => ({ json: { note: `torque it again ${w}` } }))
	},
	'POST /api/floor/jobs/[jobId]/inspection': {
		path: (j) => `/api/floor/jobs/${j.id}/inspection`,
		body: () =>
			bodies(
				loose({
					itemId: fc.oneof(fc.constantFrom(...activeItems), uuidish),
					ticked: fc.oneof(fc.boolean(), fc.anything())
				})
			),
		on200: 1,
		examples: () => [
			{ json: { itemId: activeItems[0], ticked: '\u0000' } },
			{ json: { ['\u0000']: 1 } }
		]
	},
	// These two read no body: whatever is sent, the answer is about the job's state.
	'POST /api/floor/jobs/[jobId]/ready': {
		path: (j) => `/api/floor/jobs/${j.id}/ready`,
		body: () => bodies(fc.dictionary(fc.string(), fc.jsonValue())),
		runs: 25
	},
	'POST /api/floor/jobs/[jobId]/sign-off': {
		path: (j) => `/api/floor/jobs/${j.id}/sign-off`,
		body: () => bodies(fc.dictionary(fc.string(), fc.jsonValue())),
		runs: 25
	},
	// Not signed by the provider's secret: refused whatever it says.
	'POST /api/payments/webhook': {
		path: () => '/api/payments/webhook',
		body: () =>
			fc.oneof(
				bodies(
					loose({
						id: anyText,
						type: fc.constantFrom('checkout.session.completed', 'x'),
						data: fc.jsonValue()
					})
				),
				anyText.map((raw): Body => ({ raw, contentType: 'application/json' }))
			),
		headers: () => ({
			'stripe-signature': `t=${Math.floor(Date.now() / 1000)},v1=${'0'.repeat(64)}`
		})
	},
	// Multipart, not JSON: tests/security/uploads.spec.ts.
	'POST /api/jobs/[jobId]/entries/[entryId]/photos': 'uploads'
};

let activeItems: string[] = [];

test.beforeAll(async () => {
	const rows = await db()`
		select i.id from inspection_item i join shop s on s.id = i.shop_id
		where s.name like 'Kettle Street%' and i.active order by i.position`;
	activeItems = rows.map((r) => r.id as string);
});

test('every route of the API that takes a body has a fuzz target here', () => {
	const api = routeCases()
		.filter((c) => c.kind === 'endpoint' && c.routeId.startsWith('/api/'))
		.filter((c) => ['POST', 'PUT', 'PATCH', 'DELETE'].includes(c.method))
		.map((c) => c.key);
	expect(
		api.filter((k) => !(k in targets)),
		'add a fuzz target for these'
	).toEqual([]);
	expect(Object.keys(targets).filter((k) => !api.includes(k))).toEqual([]);
});

for (const [key, target] of Object.entries(targets)) {
	if (target === 'uploads') continue;
	test(`fuzz ${key}: never a 500, a refusal changes nothing`, async () => {
		test.setTimeout(120_000);
		const job = await makeFuzzJob();
		const session = await signInSession(demo.foreman);
		const path = target.path(job);
		// The route under test really is the one the route tree names.
		expect(pathOf(key.split(' ')[1], { jobId: job.id, entryId: job.overEntryId })).toBe(path);
		const runs = target.runs ?? 100;
		const seen = new Map<number, number>();
		await fc.assert(
			fc.asyncProperty(target.body(job), async (body) => {
				const before = await jobRows(job.id);
				const a = await send(path, { session, body, headers: target.headers?.() });
				const after = await jobRows(job.id);
				seen.set(a.status, (seen.get(a.status) ?? 0) + 1);
				expect(a.status, a.text).toBeLessThan(500);
				if (a.status >= 400) {
					expect(after, 'a refused request changed the job').toEqual(before);
					expect(a.text.length, 'a refusal says why').toBeGreaterThan(0);
				} else if (a.status === 201) {
					expect(after.entries).toBe(before.entries + 1);
				} else {
					// (the log refuses deletes, so only an upper bound says anything here)
					expect(after.entries - before.entries).toBeLessThanOrEqual(target.on200 ?? 0);
				}
			}),
			{ numRuns: runs, examples: (target.examples?.(job) ?? []).map((b) => [b]) }
		);
		console.log(`${key}: ${runs} bodies, answers ${JSON.stringify(Object.fromEntries(seen))}`);
	});
}

test("a request that breaks its route's rules answers a 400 of one shape on every API route", async () => {
	const job = await makeFuzzJob();
	const session = await signInSession(demo.foreman);
	// Valid JSON that no route takes (an array, not an object), and query values out of range.
	const notAnObject: Body = { raw: '[]', contentType: 'application/json' };
	const asked: [string, Body | undefined][] = [
		...Object.entries(targets)
			.filter(([key]) => key.startsWith('POST /api/') && !/ready|sign-off|webhook/.test(key))
			.flatMap(([, t]) =>
				t === 'uploads' ? [] : [[t.path(job), notAnObject] satisfies [string, Body]]
			),
		[`/api/jobs/${job.id}/entries?before=-1`, undefined],
		['/api/floor/log?before=-1', undefined],
		['/api/floor/board?queueAfter=x', undefined],
		['/api/floor/stream?after=x', undefined]
	];
	expect(asked.length).toBeGreaterThanOrEqual(9);
	// The same answer for the same Accept header: JSON with only words, or the error page.
	for (const accept of ['application/json', 'text/html']) {
		const shapes = new Map<string, string[]>();
		for (const [path, body] of asked) {
			const a = await send(path, { session, body, headers: { accept } });
			expect(a.status, `${path}: ${a.text}`).toBe(400);
			let shape = a.contentType.split(';')[0];
			if (shape === 'application/json') {
				const answer = JSON.parse(a.text) as Record<string, unknown>;
				expect(typeof answer.message === 'string' && answer.message.length > 0, path).toBe(true);
				shape += ` ${Object.keys(answer).sort().join(',')}`;
			}
			shapes.set(shape, [...(shapes.get(shape) ?? []), path]);
		}
		expect(
			[...shapes.keys()],
			`${accept}: ${JSON.stringify(Object.fromEntries(shapes))}`
		).toHaveLength(1);
	}
});

test('fuzz the phrase text through POST /api/jobs/[jobId]/entries: only a 201 stores, and stores it whole', async () => {
	test.setTimeout(120_000);
	const job = await makeFuzzJob();
	const session = await signInSession(demo.foreman);
	const seen = new Map<number, number>();
	await fc.assert(
		fc.asyncProperty(phrases(job), fc.constantFrom('typed', 'voice'), async (text, source) => {
			const id = randomUUID();
			const before = await jobRows(job.id);
			const a = await send(`/api/jobs/${job.id}/entries`, {
				session,
				body: { json: { id, text, source } }
			});
			const after = await jobRows(job.id);
			seen.set(a.status, (seen.get(a.status) ?? 0) + 1);
			expect(a.status, a.text).toBeLessThan(500);
			const [row] = await db()`select * from log_entry where id = ${id}`;
			if (a.status !== 201) {
				expect(row, `${a.status} stored a row`).toBeUndefined();
				expect(after).toEqual(before);
				return;
			}
			expect(after.entries).toBe(before.entries + 1);
			// A whole entry: what was said, who, and for a measurement its value, unit and verdict.
			// A lone surrogate cannot be UTF-8: it is kept as U+FFFD, as any UTF-8 store keeps it.
			expect(row.raw_text).toBe(text.trim().toWellFormed());
			expect(row.source).toBe(source);
			expect(['measure', 'done', 'part', 'note', 'retraction']).toContain(row.kind);
			if (row.kind === 'measure') {
				expect(Number.isFinite(row.value)).toBe(true);
				expect(row.unit).toBeTruthy();
				expect(row.verdict).toBeTruthy();
				expect(row.job_step_id).toBeTruthy();
			}
			if (row.kind === 'retraction') expect(row.retracts).toBeTruthy();
		}),
		{
			numRuns: 150,
			examples: [
				...awkward.map((w) => [`note ${w}`, 'typed'] as [string, string]),
				['rear axle 80\u0000 Nm', 'voice'],
				['rear axle 1e309 Nm', 'typed'],
				['rear axle 80 Nm at 25:99', 'typed']
			]
		}
	);
	console.log(`phrase text: 150 phrases, answers ${JSON.stringify(Object.fromEntries(seen))}`);
});

test('fuzz the query strings the app reads: never a 500, never a redirect off the site', async () => {
	test.setTimeout(120_000);
	const { kettle } = await securityTargets();
	const owner = await signInSession(demo.owner);
	const job = kettle.jobId;
	const reads: [string, string[], string | null][] = [
		[
			'/jobs',
			['q', 'state', 'technician', 'bay', 'from', 'to', 'sort', 'dir', 'page', 'size'],
			owner
		],
		['/jobs/new', ['find'], owner],
		['/floor', ['bay', 'technician', 'job', 'verdict', 'q'], owner],
		['/api/floor/log', ['bay', 'technician', 'job', 'verdict', 'q', 'before'], owner],
		['/api/floor/stream', ['after'], owner],
		['/floor/drift', ['step', 'tool'], owner],
		['/bench', ['job'], owner],
		['/procedures', ['archived'], owner],
		[`/api/jobs/${job}/entries`, ['before', 'after', 'limit'], owner],
		['/sign-in', ['next'], owner],
		['/sign-in', ['next'], null],
		[`/r/${kettle.token}`, ['payerror'], null]
	];
	const value = fc.oneof(
		fc.string({ unit: 'binary', maxLength: 40 }),
		fc.constantFrom(
			'\u0000',
			'-1',
			'0',
			'1e309',
			'NaN',
			'9'.repeat(25),
			'//evil.example',
			'/\\evil.example',
			'https://evil.example/'
		)
	);
	for (const [path, names, session] of reads) {
		await fc.assert(
			fc.asyncProperty(
				fc.dictionary(fc.constantFrom(...names), value, { maxKeys: 3 }),
				async (q) => {
					const url = `${path}?${new URLSearchParams(q)}`;
					const a = await send(url, { session });
					expect(a.status, url).toBeLessThan(500);
					if (a.location) expect(a.location, url).toMatch(/^\/(?![/\\])/);
				}
			),
			// Besides the generated ones: a NUL in each parameter the route reads.
			{ numRuns: 10, examples: names.map((n) => [{ [n]: '\u0000' }]) }
		);
	}
});
