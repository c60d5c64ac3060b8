/**
 * The corpus half of `npm run bench:voice`: every file of .data/voice-corpus/corpus.json (made
 * by `npm run voice:corpus`) through `hearCall` — RNNoise, the decoder, the phrase engine and
 * the gate — and a table per voice × noise level for the tuning and the held-out split:
 *
 *   right    accepted by the gate and what was said (intent, step, value, unit)
 *   WRONG    accepted, would be logged, and not what was said: the figure that must stay ≤ 1 %
 *   again    not acted on: refused by the gate ("say it again"), or a note heard offline, which
 *            goes to the call bar to be checked (heard.ts, decideHeard)
 *   p50/p95  noise suppression + decoding, ms (wall clock)
 *   cpu95    the same, CPU time of this process: what p95 is on an idle core, when others load it
 *
 * and the shop-talk sentences' false accepts (anything the gate lets through). Prints measured
 * figures only.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { SoundSwallowerModule } from 'soundswallower';
import type { StepSpec } from '../../src/lib/phrase/index';
import { readWavForModel } from '../../src/lib/voice/audio';
import { createDecoder, DECODER_SETTINGS, useGrammar } from '../../src/lib/voice/decoder';
import { loadRnnoise } from '../../src/lib/voice/denoise';
import { MIN_CONFIDENCE } from '../../src/lib/voice/gate';
import { decideHeard } from '../../src/lib/voice/heard';
import { LevelEndpoint, VadEndpoint, type Endpoint } from '../../src/lib/voice/endpoint';
import {
	hearCall,
	hearStream,
	LOGGING_INTENTS,
	sameCall,
	type HeardCall
} from '../../src/lib/voice/pipeline';
import { isCancel } from '../../src/lib/phrase/index';

interface Item {
	file: string;
	id: string;
	voice: string;
	snr: number | null;
	noise: string | null;
	/** made by `voice:corpus -- --curve`: each phrase at every level and noise, for the curve */
	curve?: boolean;
}
interface Phrase {
	id: string;
	job: number;
	text: string;
	held?: boolean;
}
interface Row {
	file: string;
	voice: string;
	level: string;
	/** pink, brown or impact; null for clean speech */
	noise: string | null;
	split: 'tune' | 'held' | 'talk';
	right: boolean;
	wrong: boolean;
	again: boolean;
	accepted: boolean;
	ms: number;
	/** CPU time of this process over the same call (what the wall time is on an idle core). */
	cpuMs: number;
	heard: string;
	said: string;
	confidence: number;
}

const root = fileURLToPath(new URL('../../', import.meta.url));

export interface CorpusBenchOptions {
	denoise: boolean;
	settings: Record<string, string | number | boolean>;
	minConfidence: number;
	only: string | null;
	split: 'tune' | 'held' | 'all';
	verbose: boolean;
	/** use every n-th phrase only */
	every: number;
	/** only these levels ('clean', '10', '5', …) and noises ('pink', …); null: all */
	levels: string[] | null;
	noises: string[] | null;
	/** the SNR curve (`voice:corpus -- --curve`) instead of the corpus */
	curve: boolean;
	/** weight of the out-of-grammar path; undefined: the grammar's default */
	garbage: number | undefined;
	/** write every row (file, heard, confidence, verdicts) to this JSON file */
	dump: string | null;
	/**
	 * Hands-free instead of push-to-talk: each file with a second of its own noise either side,
	 * streamed through the capture worklet's code and cut into calls by this endpoint
	 * ('level', or 'vad' with an optional WebRTC mode, e.g. 'vad:3'); all judged hands-free.
	 */
	endpoint: string | null;
}

export function corpusOptions(argv: string[]): CorpusBenchOptions {
	const arg = (name: string) => argv.find((a) => a.startsWith(`--${name}=`))?.split('=')[1];
	const settings: Record<string, string | number | boolean> = { ...DECODER_SETTINGS };
	for (const a of argv.filter((a) => a.startsWith('--set=')))
		for (const kv of a.slice(6).split(',')) {
			const [k, v] = kv.split(':');
			settings[k] = v === 'true' ? true : v === 'false' ? false : isNaN(Number(v)) ? v : Number(v);
		}
	return {
		denoise: !argv.includes('--no-denoise'),
		settings,
		minConfidence: Number(arg('min-confidence') ?? MIN_CONFIDENCE),
		only: arg('only') ?? null,
		split: (arg('split') as 'tune' | 'held' | undefined) ?? 'all',
		verbose: argv.includes('--verbose'),
		every: Number(arg('every') ?? 1),
		levels: arg('level')?.split(',') ?? null,
		noises: arg('noise')?.split(',') ?? null,
		curve: argv.includes('--curve'),
		garbage: arg('garbage') === undefined ? undefined : Number(arg('garbage')),
		dump: arg('dump') ?? null,
		endpoint: arg('endpoint') ?? null
	};
}

const pct = (sorted: number[], p: number) =>
	sorted.length
		? sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]
		: NaN;
const share = (rows: Row[], f: (r: Row) => boolean) =>
	rows.length ? `${((100 * rows.filter(f).length) / rows.length).toFixed(1)}`.padStart(5) : '    -';

export async function corpusBench(ss: SoundSwallowerModule, o: CorpusBenchOptions): Promise<void> {
	let corpus: { items: Item[] };
	try {
		corpus = JSON.parse(readFileSync(root + '.data/voice-corpus/corpus.json', 'utf8'));
	} catch {
		console.error(
			'No voice corpus yet: run `npm run voice:corpus` first (needs flite, espeak-ng, sox).'
		);
		process.exit(1);
	}
	const list = JSON.parse(readFileSync(root + 'scripts/voice-corpus/phrases.json', 'utf8')) as {
		phrases: Phrase[];
		shopTalk: string[];
	};
	const jobs = JSON.parse(readFileSync(root + 'tests/fixtures/voice/manifest.json', 'utf8'))
		.jobs as Record<string, Omit<StepSpec, 'id'>[]>;
	const stepsOf = (job: number): StepSpec[] =>
		jobs[String(job)].map((s) => ({ ...s, id: s.label }));
	const phrases = new Map(list.phrases.map((p, i) => [p.id, { ...p, n: i }]));

	const decoder = await createDecoder(ss, o.settings);
	const rnnoise = o.denoise ? await loadRnnoise() : null;
	console.log(
		`corpus: noise suppression ${o.denoise ? 'on' : 'off'}, min confidence ${o.minConfidence}, ` +
			`garbage weight ${o.garbage ?? 'default'}, settings ${JSON.stringify(o.settings)}` +
			(o.endpoint ? `, hands-free through endpoint ${o.endpoint}` : ', push-to-talk')
	);
	const rows: Row[] = [];
	const makeEndpoint = (): Endpoint => {
		const [kind, mode] = (o.endpoint ?? 'level').split(':');
		if (kind === 'vad') return new VadEndpoint(ss, { mode: mode ? Number(mode) : undefined });
		if (kind === 'level') return new LevelEndpoint();
		throw new Error(`--endpoint=${o.endpoint}: use level, vad or vad:<0-3>`);
	};
	const hearStreamOf = (samples: Float32Array, steps: StepSpec[]) =>
		hearStream(decoder, withOwnNoise(samples), steps, makeEndpoint(), {
			rnnoise,
			minConfidence: o.minConfidence
		});
	// one grammar per job: sort so each job's grammar is set once per voice
	const items = corpus.items
		.filter((it) => !o.only || it.voice.includes(o.only))
		// the curve: its own files, and the clean phrases of the same voices as its top
		.filter((it) =>
			o.curve
				? it.curve || (it.snr === null && it.voice.startsWith('flite-') && phrases.has(it.id))
				: !it.curve
		)
		.filter((it) => !o.levels || o.levels.includes(it.snr === null ? 'clean' : String(it.snr)))
		.filter((it) => !o.noises || !it.noise || o.noises.includes(it.noise))
		.map((it) => {
			const p = phrases.get(it.id);
			return { it, p, job: p?.job ?? 1041, n: p ? p.n : Number(it.id.slice(5)) };
		})
		.filter((x) => x.n % o.every === 0)
		.filter((x) => {
			if (o.split === 'all' || !x.p) return true;
			return o.split === 'held' ? !!x.p.held : !x.p.held;
		})
		.sort((a, b) => a.job - b.job);
	let job = -1;
	for (const { it, p, job: j } of items) {
		const steps = stepsOf(j);
		if (j !== job) {
			useGrammar(decoder, { steps, garbage: o.garbage });
			job = j;
		}
		const samples = readWavForModel(readFileSync(root + '.data/voice-corpus/' + it.file));
		if (o.endpoint) {
			rows.push(handsFreeRow(it, p, steps, o, () => hearStreamOf(samples, steps)));
			continue;
		}
		const cpu0 = process.cpuUsage();
		const h = hearCall(decoder, samples, steps, { rnnoise, minConfidence: o.minConfidence });
		const cpu = process.cpuUsage(cpu0);
		const cpuMs = (cpu.user + cpu.system) / 1000;
		const level = it.snr === null ? 'clean' : `${it.snr} dB`;
		// what the Bench does with it (heard.ts): shop talk is judged as hands-free hears it,
		// calls as push-to-talk does; only 'confirm' (and 'cancel') act, a note heard offline
		// goes to the call bar to be checked and is not logged by itself
		const answer = { ...h.gate, intent: h.parsed?.intent ?? ('unknown' as const) };
		const out = decideHeard({ text: h.text, confidence: h.confidence, offline: true }, answer, {
			handsFree: !p,
			isCancel
		});
		const acted = out.kind === 'confirm' || out.kind === 'cancel';
		const common = {
			file: it.file,
			voice: it.voice,
			level,
			noise: it.noise,
			again: !acted,
			accepted: acted,
			ms: h.ms,
			cpuMs,
			heard: h.text,
			confidence: h.confidence
		};
		if (!p) {
			rows.push({ ...common, split: 'talk', right: false, wrong: acted, said: it.id });
			continue;
		}
		const right = sameCall(h.text, p.text, steps);
		const logs = LOGGING_INTENTS.has(answer.intent);
		rows.push({
			...common,
			split: p.held ? 'held' : 'tune',
			right: acted && right,
			wrong: acted && !right && logs,
			said: p.text
		});
	}
	decoder.delete();
	if (o.dump) writeFileSync(o.dump, JSON.stringify(rows, null, 1));
	report(rows, o);
}

/**
 * A recording with a second of its own noise either side (its first and last quarter second,
 * which carry no speech, repeated), so an endpoint has quiet to learn from and to end on.
 */
function withOwnNoise(samples: Float32Array): Float32Array {
	const q = Math.min(4000, Math.floor(samples.length / 4));
	const head = samples.subarray(0, q);
	const tail = samples.subarray(samples.length - q);
	const out = new Float32Array(samples.length + 8 * q);
	for (let k = 0; k < 4; k++) out.set(head, k * q);
	out.set(samples, 4 * q);
	for (let k = 0; k < 4; k++) out.set(tail, 4 * q + samples.length + k * q);
	return out;
}

/** One file heard hands-free: right if a call acted on is what was said and none is wrong. */
function handsFreeRow(
	it: Item,
	p: (Phrase & { n: number }) | undefined,
	steps: StepSpec[],
	o: CorpusBenchOptions,
	hear: () => HeardCall[]
): Row {
	const cpu0 = process.cpuUsage();
	const t0 = performance.now();
	const calls = hear();
	const ms = performance.now() - t0;
	const cpu = process.cpuUsage(cpu0);
	const acted = calls.filter((h) => {
		const answer = { ...h.gate, intent: h.parsed?.intent ?? ('unknown' as const) };
		const out = decideHeard({ text: h.text, confidence: h.confidence, offline: true }, answer, {
			handsFree: true,
			isCancel
		});
		return out.kind === 'confirm' || out.kind === 'cancel';
	});
	const right = p ? acted.filter((h) => sameCall(h.text, p.text, steps)) : [];
	const wrong = acted.filter(
		(h) => !right.includes(h) && (!p || LOGGING_INTENTS.has(h.parsed?.intent ?? 'unknown'))
	);
	if (o.verbose)
		console.log(`${it.file}: ${calls.map((c) => `"${c.text}"`).join(' | ') || '(no call)'}`);
	return {
		file: it.file,
		voice: it.voice,
		level: it.snr === null ? 'clean' : `${it.snr} dB`,
		noise: it.noise,
		split: p ? (p.held ? 'held' : 'tune') : 'talk',
		right: right.length > 0 && wrong.length === 0,
		wrong: wrong.length > 0,
		again: acted.length === 0,
		accepted: acted.length > 0,
		ms,
		cpuMs: (cpu.user + cpu.system) / 1000,
		heard: calls.map((c) => c.text).join(' | '),
		said: p?.text ?? it.id,
		confidence: Math.max(0, ...calls.map((c) => c.confidence))
	};
}

function report(rows: Row[], o: CorpusBenchOptions) {
	const voices = [...new Set(rows.map((r) => r.voice))];
	// clean first, then from the highest SNR down
	const levels = [...new Set(rows.map((r) => r.level))].sort(
		(a, b) => (b === 'clean' ? 1 : 0) - (a === 'clean' ? 1 : 0) || parseFloat(b) - parseFloat(a)
	);
	const noises = [...new Set(rows.map((r) => r.noise).filter((n) => n !== null))].sort();
	const head = (s: string) => `${s} right WRONG again`;
	console.log(
		`\n${'voice'.padEnd(18)} ${'level'.padEnd(6)} │ ${head('tune:')} │ ${head('held:')} │ p50 ms p95 ms cpu95`
	);
	const line = (name: string, level: string, rs: Row[]) => {
		if (!rs.length) return;
		const t = rs.filter((r) => r.split === 'tune');
		const h = rs.filter((r) => r.split === 'held');
		const ms = rs.map((r) => r.ms).sort((a, b) => a - b);
		const cpu = rs.map((r) => r.cpuMs).sort((a, b) => a - b);
		const cells = (x: Row[]) =>
			`${String(x.length).padStart(5)} ${share(x, (r) => r.right)} ${share(x, (r) => r.wrong)} ${share(x, (r) => r.again)}`;
		console.log(
			`${name.padEnd(18)} ${level.padEnd(6)} │ ${cells(t)} │ ${cells(h)} │ ${pct(ms, 50).toFixed(0).padStart(6)} ${pct(ms, 95).toFixed(0).padStart(6)} ${pct(cpu, 95).toFixed(0).padStart(5)}`
		);
	};
	const calls = rows.filter((r) => r.split !== 'talk');
	for (const v of voices)
		for (const l of levels)
			line(
				v,
				l,
				calls.filter((r) => r.voice === v && r.level === l)
			);
	console.log('─'.repeat(96));
	for (const fam of ['flite', 'espeak'])
		for (const l of levels)
			line(
				`all ${fam}`,
				l,
				calls.filter((r) => r.voice.startsWith(fam) && r.level === l)
			);
	for (const l of levels)
		line(
			'all voices',
			l,
			calls.filter((r) => r.level === l)
		);
	line('everything', 'all', calls);
	// the same phrase at one level meets one noise only, so a split's level mixes noises unevenly:
	// per noise, the figures compare
	console.log('─'.repeat(96));
	for (const fam of ['flite', 'espeak'])
		for (const n of noises)
			for (const l of levels.filter((l) => l !== 'clean'))
				line(
					`${fam} ${n}`,
					l,
					calls.filter((r) => r.voice.startsWith(fam) && r.level === l && r.noise === n)
				);
	const talk = rows.filter((r) => r.split === 'talk');
	if (talk.length) {
		console.log('\nshop talk (hands-free false accepts: hands-free would act on it)');
		for (const l of levels) {
			const t = talk.filter((r) => r.level === l);
			const n = t.filter((r) => r.accepted).length;
			console.log(
				`  ${l.padEnd(6)} ${n} of ${t.length} sentences accepted (${share(t, (r) => r.accepted).trim()} %)`
			);
		}
		const sentences = new Set(talk.map((r) => r.said)).size;
		console.log(`  per voice and level: ${sentences} sentences each`);
	}
	if (o.verbose) {
		console.log('\nwrong values logged and shop talk accepted:');
		for (const r of rows.filter((r) => r.wrong))
			console.log(
				`  ${r.voice} ${r.level} c=${r.confidence.toFixed(2)} said "${r.said}" heard "${r.heard}"`
			);
	}
}
