/**
 * The corpus half of `npm run bench:voice`: every file of .data/voice-corpus/corpus.json (made
 * by `npm run voice:corpus`) through `hearCall` — RNNoise, the decoder, the phrase engine and
 * the gate — and a table per voice × noise level for the tuning and the held-out split:
 *
 *   right    accepted by the gate and what was said (intent, step, value, unit)
 *   WRONG    accepted, would be logged, and not what was said: the figure that must stay ≤ 1 %
 *   again    refused by the gate ("say it again")
 *   p50/p95  noise suppression + decoding, ms
 *
 * and the shop-talk sentences' false accepts (anything the gate lets through). Prints measured
 * figures only.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { SoundSwallowerModule } from 'soundswallower';
import type { StepSpec } from '../../src/lib/phrase/index';
import { readWavForModel } from '../../src/lib/voice/audio';
import { createDecoder, DECODER_SETTINGS, useGrammar } from '../../src/lib/voice/decoder';
import { loadRnnoise } from '../../src/lib/voice/denoise';
import { MIN_CONFIDENCE } from '../../src/lib/voice/gate';
import { hearCall, LOGGING_INTENTS, sameCall } from '../../src/lib/voice/pipeline';

interface Item {
	file: string;
	id: string;
	voice: string;
	snr: number | null;
}
interface Phrase {
	id: string;
	job: number;
	text: string;
	held?: boolean;
}
interface Row {
	voice: string;
	level: string;
	split: 'tune' | 'held' | 'talk';
	right: boolean;
	wrong: boolean;
	again: boolean;
	accepted: boolean;
	ms: number;
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
	/** weight of the out-of-grammar path; undefined: the grammar's default */
	garbage: number | undefined;
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
		garbage: arg('garbage') === undefined ? undefined : Number(arg('garbage'))
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
			`garbage weight ${o.garbage ?? 'default'}, settings ${JSON.stringify(o.settings)}`
	);
	const rows: Row[] = [];
	// one grammar per job: sort so each job's grammar is set once per voice
	const items = corpus.items
		.filter((it) => !o.only || it.voice.includes(o.only))
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
		const h = hearCall(decoder, samples, steps, { rnnoise, minConfidence: o.minConfidence });
		const level = it.snr === null ? 'clean' : `${it.snr} dB`;
		if (!p) {
			rows.push({
				voice: it.voice,
				level,
				split: 'talk',
				right: false,
				wrong: h.gate.ok,
				again: !h.gate.ok,
				accepted: h.gate.ok,
				ms: h.ms,
				heard: h.text,
				said: it.id,
				confidence: h.confidence
			});
			continue;
		}
		const right = sameCall(h.text, p.text, steps);
		const logs = h.parsed !== null && LOGGING_INTENTS.has(h.parsed.intent);
		rows.push({
			voice: it.voice,
			level,
			split: p.held ? 'held' : 'tune',
			right: h.gate.ok && right,
			wrong: h.gate.ok && !right && logs,
			again: !h.gate.ok,
			accepted: h.gate.ok,
			ms: h.ms,
			heard: h.text,
			said: p.text,
			confidence: h.confidence
		});
	}
	decoder.delete();
	report(rows, o);
}

function report(rows: Row[], o: CorpusBenchOptions) {
	const voices = [...new Set(rows.map((r) => r.voice))];
	const levels = ['clean', '10 dB', '5 dB'];
	const head = (s: string) => `${s} right WRONG again`;
	console.log(
		`\n${'voice'.padEnd(18)} ${'level'.padEnd(6)} │ ${head('tune:')} │ ${head('held:')} │ p50 ms p95 ms`
	);
	const line = (name: string, level: string, rs: Row[]) => {
		const t = rs.filter((r) => r.split === 'tune');
		const h = rs.filter((r) => r.split === 'held');
		const ms = rs.map((r) => r.ms).sort((a, b) => a - b);
		const cells = (x: Row[]) =>
			`${String(x.length).padStart(5)} ${share(x, (r) => r.right)} ${share(x, (r) => r.wrong)} ${share(x, (r) => r.again)}`;
		console.log(
			`${name.padEnd(18)} ${level.padEnd(6)} │ ${cells(t)} │ ${cells(h)} │ ${pct(ms, 50).toFixed(0).padStart(6)} ${pct(ms, 95).toFixed(0).padStart(6)}`
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
	const talk = rows.filter((r) => r.split === 'talk');
	if (talk.length) {
		console.log('\nshop talk (hands-free false accepts: the gate let it through)');
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
