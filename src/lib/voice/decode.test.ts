/**
 * Decodes the committed spoken test phrases (tests/fixtures/voice, made with flite) with the
 * grammar of their demo job, reads the words with the phrase engine and checks intent, step,
 * value, unit and verdict. Prints accuracy and decode time per phrase (measured, not asserted).
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import createModule from 'soundswallower';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isCancel, parsePhrase, type StepSpec } from '../phrase/index';
import {
	createDecoder,
	decodePhrase,
	readWav,
	useGrammar,
	SAMPLE_RATE,
	type Decoder
} from './decoder';
import type { VoiceGrammar } from './grammar';

interface Phrase {
	file: string;
	job: number;
	text: string;
	intent: string;
	step: string | null;
	value: number | null;
	unit: string | null;
	verdict: string | null;
	noise?: boolean;
	fluid?: string;
	fluidVerdict?: string;
}
type FixtureStep = Omit<StepSpec, 'id'>;

const dir = fileURLToPath(new URL('../../../tests/fixtures/voice/', import.meta.url));
const manifest = JSON.parse(readFileSync(dir + 'manifest.json', 'utf8')) as {
	jobs: Record<string, FixtureStep[]>;
	phrases: Phrase[];
};
const specsOf = (job: number): StepSpec[] =>
	manifest.jobs[String(job)].map((s) => ({ ...s, id: s.label }));

let decoder: Decoder;
let currentJob = -1;
const grammars = new Map<number, VoiceGrammar>();
const rows: { file: string; ok: boolean; ms: number; heard: string }[] = [];

beforeAll(async () => {
	const modelBase = fileURLToPath(
		new URL('../../../node_modules/soundswallower/model/', import.meta.url)
	);
	const ss = await createModule({ modelBase } as never);
	decoder = await createDecoder(ss);
}, 30_000);

afterAll(() => {
	const ok = rows.filter((r) => r.ok).length;
	console.log(
		`offline voice: ${ok}/${rows.length} phrases right (${Math.round((100 * ok) / Math.max(1, rows.length))} %)`
	);
	for (const r of rows)
		console.log(
			`  ${r.ok ? 'ok  ' : 'MISS'} ${String(Math.round(r.ms)).padStart(4)} ms  ${r.file}: "${r.heard}"`
		);
	decoder?.delete();
});

describe('the demo jobs’ grammars', () => {
	it('need no word the model cannot say', () => {
		for (const job of Object.keys(manifest.jobs).map(Number)) {
			const g = useGrammar(decoder, { steps: specsOf(job) });
			grammars.set(job, g);
			currentJob = job;
			expect(g.missing, `job ${job}`).toEqual([]);
		}
	}, 30_000);
});

describe('a job without steps', () => {
	it('still hears the calls that need no step', () => {
		useGrammar(decoder, { steps: [] });
		currentJob = -1;
		for (const [file, words] of [
			['next.wav', 'next'],
			['undo.wav', 'undo']
		]) {
			const { samples } = readWav(readFileSync(dir + file));
			expect(decodePhrase(decoder, samples).text, file).toBe(words);
		}
	}, 30_000);
});

describe('spoken phrases', () => {
	for (const p of manifest.phrases) {
		it(`${p.file}: "${p.text}"`, () => {
			const steps = specsOf(p.job);
			if (p.job !== currentJob) {
				useGrammar(decoder, { steps });
				currentJob = p.job;
			}
			const { sampleRate, samples } = readWav(readFileSync(dir + p.file));
			expect(sampleRate).toBe(SAMPLE_RATE);
			const t0 = performance.now();
			const heard = decodePhrase(decoder, samples).text;
			const ms = performance.now() - t0;
			const row = { file: p.file, ok: false, ms, heard };
			rows.push(row);
			if (p.intent === 'cancel') {
				expect(isCancel(heard), heard).toBe(true);
			} else {
				const r = parsePhrase(heard, { steps, tolerancePct: 10 });
				expect(r.intent, heard).toBe(p.intent);
				expect(r.stepId, heard).toBe(p.step);
				expect(r.quantity?.value ?? null, heard).toBe(p.value);
				expect(r.quantity?.unit ?? null, heard).toBe(p.unit);
				expect(r.verdict, heard).toBe(p.verdict);
				// the grade said after the unit (grammar.ts), judged apart from the quantity
				if (p.fluid) {
					expect(r.fluid, heard).toBe(p.fluid);
					expect(r.fluidVerdict, heard).toBe(p.fluidVerdict);
				}
			}
			row.ok = true;
		}, 30_000);
	}
});
