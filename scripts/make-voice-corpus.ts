/**
 * Makes the voice test corpus under .data/voice-corpus/ (git-ignored): every phrase of
 * scripts/voice-corpus/phrases.json and every shop-talk sentence, spoken by every flite voice
 * and by espeak-ng in two accents at two speeds, clean and mixed with workshop-like noise
 * (pink, brown and impact-like bursts, made with sox in repeatable mode) at a measured
 * signal-to-noise ratio of 10 dB and 5 dB. Writes corpus.json, which `npm run bench:voice`
 * reads.
 *
 *   npm run voice:corpus             (everything)
 *   npm run voice:corpus -- --quick  (two voices only: a quick look while tuning)
 *   npm run voice:corpus -- --curve  (also: every phrase by every flite voice in each noise at
 *                                     20, 15, 10, 5 and 0 dB, for `bench:voice -- --curve`)
 *
 * Needs Debian's flite, espeak-ng and sox (`sudo apt-get install flite espeak-ng sox`).
 * Each voice × noise cell uses every phrase once, the noise type rotating phrase by phrase;
 * the noise segment is picked by a seeded generator, so a rerun makes the same files.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { isCancel, parsePhrase, type StepSpec } from '../src/lib/phrase/index';
import { readWavForModel, SAMPLE_RATE } from '../src/lib/voice/audio';
import { writeWav16 } from './lib/wav';

export interface CorpusPhrase {
	id: string;
	job: number;
	text: string;
	intent: string;
	held?: boolean;
}
export interface CorpusItem {
	file: string;
	/** phrase id, or "talk-NN" for shop talk */
	id: string;
	voice: string;
	snr: number | null;
	noise: string | null;
	/** the SNR measured after mixing, dB */
	measuredSnr: number | null;
	/** part of the SNR curve (`--curve`), not of the corpus the main table reads */
	curve?: boolean;
}

const root = fileURLToPath(new URL('..', import.meta.url));
const out = root + '.data/voice-corpus/';
const list = JSON.parse(readFileSync(root + 'scripts/voice-corpus/phrases.json', 'utf8')) as {
	phrases: CorpusPhrase[];
	shopTalk: string[];
};
const manifest = JSON.parse(readFileSync(root + 'tests/fixtures/voice/manifest.json', 'utf8')) as {
	jobs: Record<string, Omit<StepSpec, 'id'>[]>;
};
export const stepsOf = (job: number): StepSpec[] =>
	manifest.jobs[String(job)].map((s) => ({ ...s, id: s.label }));

const quick = process.argv.includes('--quick');

function need(tool: string, probe: string[]) {
	const r = spawnSync(tool, probe, { stdio: 'ignore' });
	if (r.error) {
		console.error(
			`${tool} is not installed. On Debian or Ubuntu: sudo apt-get install flite espeak-ng sox`
		);
		process.exit(1);
	}
}
need('flite', ['--version']);
need('espeak-ng', ['--version']);
need('sox', ['--version']);

// Every phrase must read, from its own text, as the intent the list says.
for (const p of list.phrases) {
	const got = isCancel(p.text) ? 'cancel' : parsePhrase(p.text, { steps: stepsOf(p.job) }).intent;
	if (got !== p.intent) {
		console.error(`${p.id} "${p.text}": the phrase engine reads ${got}, the list says ${p.intent}`);
		process.exit(1);
	}
}
for (const t of list.shopTalk) {
	const r = parsePhrase(t, { steps: stepsOf(1041) });
	if (r.intent !== 'unknown') console.warn(`shop talk "${t}" reads as ${r.intent} from its text`);
}

interface Voice {
	name: string;
	say(text: string, file: string): void;
}
const flite = (v: string): Voice => ({
	name: `flite-${v}`,
	say: (text, file) => execFileSync('flite', ['-voice', v, '-t', text, '-o', file])
});
const espeak = (v: string, wpm: number): Voice => ({
	name: `espeak-${v}-${wpm}`,
	say: (text, file) => execFileSync('espeak-ng', ['-v', v, '-s', String(wpm), '-w', file, text])
});
// awb_time is a limited-domain voice (it can only tell the time): left out.
const voices: Voice[] = quick
	? [flite('slt'), espeak('en-us', 150)]
	: [
			flite('kal'),
			flite('kal16'),
			flite('awb'),
			flite('rms'),
			flite('slt'),
			espeak('en-us', 140),
			espeak('en-us', 180),
			espeak('en-gb', 140),
			espeak('en-gb', 180)
		];

// --- noise --------------------------------------------------------------------------------------
const NOISE_SECONDS = 40;
mkdirSync(out + 'noise', { recursive: true });
const noiseDefs: Record<string, string[]> = {
	pink: ['synth', String(NOISE_SECONDS), 'pinknoise'],
	brown: ['synth', String(NOISE_SECONDS), 'brownnoise'],
	// an impact wrench's hammering: noise bursts 8 times a second, 30 % duty, mid-band
	impact: [
		'synth',
		String(NOISE_SECONDS),
		'whitenoise',
		'synth',
		String(NOISE_SECONDS),
		'square',
		'amod',
		'8',
		'0',
		'0',
		'30',
		'bandpass',
		'1500',
		'1.5q'
	]
};
const noises: Record<string, Float32Array> = {};
for (const [name, effects] of Object.entries(noiseDefs)) {
	const file = `${out}noise/${name}.wav`;
	if (!existsSync(file))
		execFileSync('sox', [
			'-R',
			'-n',
			'-r',
			String(SAMPLE_RATE),
			'-b',
			'16',
			'-c',
			'1',
			file,
			...effects
		]);
	noises[name] = readWavForModel(readFileSync(file));
}
const NOISE_NAMES = Object.keys(noiseDefs);

/** RMS over the 30 ms frames within 35 dB of the loudest: the speech, not the pauses. */
export function activeRms(x: Float32Array): number {
	const win = 480;
	const frames: number[] = [];
	for (let at = 0; at + win <= x.length; at += win) {
		let s = 0;
		for (let i = at; i < at + win; i++) s += x[i] * x[i];
		frames.push(s / win);
	}
	const peak = Math.max(...frames, 0);
	const keep = frames.filter((e) => e >= peak * 10 ** (-35 / 10));
	return Math.sqrt(keep.reduce((a, b) => a + b, 0) / Math.max(1, keep.length));
}
const rms = (x: Float32Array) =>
	Math.sqrt(x.reduce((a, v) => a + v * v, 0) / Math.max(1, x.length));

let seed = 20261204;
const rand = () => ((seed = (seed * 16807) % 2147483647) - 1) / 2147483646;

/** Speech with noise at `snr` dB (speech's active RMS over the noise's RMS), measured after. */
function mix(speech: Float32Array, noise: Float32Array, snr: number) {
	const start = Math.floor(rand() * (noise.length - speech.length - 1));
	const seg = noise.slice(start, start + speech.length);
	const gain = activeRms(speech) / (rms(seg) * 10 ** (snr / 20));
	const outS = new Float32Array(speech.length);
	let peak = 0;
	for (let i = 0; i < speech.length; i++) {
		outS[i] = speech[i] + seg[i] * gain;
		peak = Math.max(peak, Math.abs(outS[i]));
	}
	const norm = peak > 0.95 ? 0.95 / peak : 1;
	for (let i = 0; i < outS.length; i++) outS[i] *= norm;
	// measured on what was written: speech part and noise part scaled the same way
	const s2 = speech.map((v) => v * norm);
	const n2 = seg.map((v) => v * gain * norm);
	return { samples: outS, measured: 20 * Math.log10(activeRms(s2) / rms(n2)) };
}

// --- speak and mix ------------------------------------------------------------------------------
const texts: { id: string; text: string }[] = [
	...list.phrases.map((p) => ({ id: p.id, text: p.text })),
	...list.shopTalk.map((t, i) => ({ id: `talk-${String(i + 1).padStart(2, '0')}`, text: t }))
];
const items: CorpusItem[] = [];
const snrs: number[] = [];
const tmp = out + 'tmp.wav';
for (const v of voices) {
	mkdirSync(`${out}${v.name}`, { recursive: true });
	let k = 0;
	for (const t of texts) {
		const clean = `${v.name}/${t.id}.wav`;
		if (!existsSync(out + clean)) {
			v.say(t.text, tmp);
			// to 16 kHz mono 16-bit with a quarter second of quiet either side, as a key press gives
			execFileSync('sox', [
				tmp,
				'-r',
				String(SAMPLE_RATE),
				'-c',
				'1',
				'-b',
				'16',
				out + clean,
				'pad',
				'0.25',
				'0.25'
			]);
		}
		items.push({ file: clean, id: t.id, voice: v.name, snr: null, noise: null, measuredSnr: null });
		const speech = readWavForModel(readFileSync(out + clean));
		for (const snr of [10, 5]) {
			const noise = NOISE_NAMES[k++ % NOISE_NAMES.length];
			const file = `${v.name}/${t.id}-${noise}-${snr}db.wav`;
			const m = mix(speech, noises[noise], snr);
			if (!existsSync(out + file)) writeWav16(out + file, m.samples, SAMPLE_RATE);
			snrs.push(m.measured - snr);
			items.push({
				file,
				id: t.id,
				voice: v.name,
				snr,
				noise,
				measuredSnr: Math.round(m.measured * 100) / 100
			});
		}
	}
	console.log(`${v.name}: ${texts.length} texts, clean and at 10 and 5 dB`);
}

// --- the SNR curve: each phrase in each noise at each level, so no level mixes noises unevenly
export const CURVE_SNRS = [20, 15, 10, 5, 0];
if (process.argv.includes('--curve')) {
	seed = 20261205;
	for (const v of voices.filter((v) => v.name.startsWith('flite-'))) {
		mkdirSync(`${out}${v.name}/curve`, { recursive: true });
		for (const t of list.phrases) {
			const speech = readWavForModel(readFileSync(`${out}${v.name}/${t.id}.wav`));
			for (const noise of NOISE_NAMES)
				for (const snr of CURVE_SNRS) {
					const file = `${v.name}/curve/${t.id}-${noise}-${snr}db.wav`;
					const m = mix(speech, noises[noise], snr);
					if (!existsSync(out + file)) writeWav16(out + file, m.samples, SAMPLE_RATE);
					snrs.push(m.measured - snr);
					const measuredSnr = Math.round(m.measured * 100) / 100;
					items.push({ file, id: t.id, voice: v.name, snr, noise, measuredSnr, curve: true });
				}
		}
		console.log(`${v.name}: the SNR curve, ${CURVE_SNRS.join(', ')} dB in each noise`);
	}
}
const worst = Math.max(...snrs.map(Math.abs));
console.log(
	`measured SNR within ±${worst.toFixed(2)} dB of the target over ${snrs.length} mixes ` +
		`(speech RMS over its active frames, noise RMS over the same span)`
);
writeFileSync(out + 'corpus.json', JSON.stringify({ quick, items }, null, 1));
console.log(`${items.length} files listed in ${out}corpus.json`);

// --- the small set CI decodes (committed) ---------------------------------------------------------
if (process.argv.includes('--fixtures')) {
	const dest = root + 'tests/fixtures/voice/corpus/';
	mkdirSync(dest, { recursive: true });
	const pick = (voice: string, id: string, level: string) => {
		const it = items.find(
			(x) =>
				x.voice === voice &&
				x.id === id &&
				(level === 'clean' ? x.snr === null : `${x.snr}` === level)
		);
		if (!it) throw new Error(`no corpus item ${voice} ${id} ${level}: make the full corpus first`);
		const name = `${voice}-${id}-${level === 'clean' ? 'clean' : it.noise + '-' + level + 'db'}.wav`;
		execFileSync('cp', [out + it.file, dest + name]);
		return { file: name, id, voice, level: level === 'clean' ? 'clean' : `${level} dB` };
	};
	const set = [
		pick('flite-kal16', 'p19', 'clean'),
		pick('flite-slt', 'p07', 'clean'),
		pick('espeak-en-us-140', 'p30', 'clean'),
		pick('flite-awb', 'p45', 'clean'),
		pick('flite-kal16', 'p17', '10'),
		pick('flite-rms', 'p25', '10'),
		pick('flite-slt', 'p03', '10'),
		pick('flite-kal', 'p21', '5'),
		pick('espeak-en-gb-140', 'p49', '10'),
		pick('flite-awb', 'p27', '5'),
		pick('flite-kal16', 'talk-01', 'clean'),
		pick('flite-slt', 'talk-16', '10'),
		pick('espeak-en-us-180', 'talk-30', '5')
	];
	// bad input, made from one clean phrase
	const src = out + 'flite-kal16/p19.wav';
	const sox = (args: string[]) =>
		execFileSync('sox', args, { stdio: ['ignore', 'ignore', 'ignore'] });
	sox(['-n', '-r', '16000', '-b', '16', '-c', '1', dest + 'bad-silence.wav', 'trim', '0', '2']);
	sox([src, dest + 'bad-clipped.wav', 'gain', '24']);
	sox([src, dest + 'bad-30s.wav', 'pad', '0', '27']);
	sox([src, '-r', '8000', dest + 'rate-8k-p19.wav']);
	sox([src, '-r', '44100', '-c', '2', dest + 'rate-44k-stereo-p19.wav']);
	sox([src, '-b', '8', '-e', 'unsigned-integer', dest + 'bits-8-p19.wav']);
	writeFileSync(
		dest + 'set.json',
		JSON.stringify(
			{
				_about:
					'A small part of the voice corpus for CI (made by `npm run voice:corpus -- --fixtures`): phrases by id from scripts/voice-corpus/phrases.json, shop talk as talk-NN, and bad input made with sox from p19.',
				calls: set.filter((s) => !s.id.startsWith('talk-')),
				shopTalk: set.filter((s) => s.id.startsWith('talk-')),
				bad: ['bad-silence.wav', 'bad-clipped.wav', 'bad-30s.wav'],
				resampled: [
					{ file: 'rate-8k-p19.wav', id: 'p19' },
					{ file: 'rate-44k-stereo-p19.wav', id: 'p19' },
					{ file: 'bits-8-p19.wav', id: 'p19' }
				]
			},
			null,
			'\t'
		) + '\n'
	);
	console.log(`CI set written to ${dest}`);
}
