import { describe, expect, it } from 'vitest';
import { isCancel } from '../phrase/index';
import type { Intent } from '../phrase/index';
import { MIN_CONFIDENCE, MIN_OUT_OF_SPEC_CONFIDENCE, type GateReason } from './gate';
import {
	WEB_SPEECH_MIN_CONFIDENCE,
	confidenceFor,
	decideHeard,
	pickAlternative,
	reasonOnly,
	sayAgainWords,
	speechConfidence,
	type GateAnswer,
	type Heard
} from './heard';
import { alternativesOf } from './recogniser';

const ok: GateAnswer = { ok: true, intent: 'measure' };
const okAs = (intent: Intent): GateAnswer => ({ ok: true, intent });
const refuse = (reason: GateReason, heard = 'x'): GateAnswer => ({
	intent: 'measure',
	ok: false,
	reason,
	heard,
	message: `refused: ${reason}`
});

describe('speechConfidence', () => {
	it('keeps a confidence in (0, 1] and treats 0, missing and nonsense as unknown', () => {
		expect(speechConfidence(0.82)).toBe(0.82);
		expect(speechConfidence(1)).toBe(1);
		// engines without an estimate report 0 (Web Speech API, SpeechRecognitionAlternative)
		expect(speechConfidence(0)).toBeNull();
		expect(speechConfidence(undefined)).toBeNull();
		expect(speechConfidence(Number.NaN)).toBeNull();
		expect(speechConfidence(1.5)).toBeNull();
		expect(speechConfidence('0.9')).toBeNull();
	});
});

describe('pickAlternative', () => {
	// a judge that passes only phrases with "eighty" heard with confidence ≥ 0.6
	const judge = (h: Heard): GateAnswer =>
		!h.text.includes('eighty')
			? refuse('implausible_value', h.text)
			: h.confidence !== null && h.confidence < 0.6
				? refuse('low_confidence', h.text)
				: ok;

	it('takes the best guess when the gate passes it', () => {
		const alts = [
			{ text: 'rear axle eighty newton metres', confidence: 0.9 },
			{ text: 'rear axle eighteen newton metres', confidence: 0.8 }
		];
		expect(pickAlternative(alts, judge)?.heard).toBe(alts[0]);
	});

	it('takes a later alternative only when it passes on its own confidence', () => {
		const alts = [
			{ text: 'rear axle eight hundred newton metres', confidence: 0.7 },
			{ text: 'rear axle eighty newton metres', confidence: 0.65 }
		];
		const r = pickAlternative(alts, judge);
		expect(r?.heard).toBe(alts[1]);
		expect(r?.answer.ok).toBe(true);
	});

	it('never takes a later alternative without a confidence: the refusal of the first stands', () => {
		const alts = [
			{ text: 'rear axle eight hundred newton metres', confidence: null },
			{ text: 'rear axle eighty newton metres', confidence: null }
		];
		const r = pickAlternative(alts, judge);
		expect(r?.heard).toBe(alts[0]);
		expect(r?.answer).toMatchObject({ ok: false, reason: 'implausible_value' });
	});

	it('answers the first refusal when no alternative passes', () => {
		const alts = [
			{ text: 'rear axle eighty newton metres', confidence: 0.3 },
			{ text: 'rear axle eighty newton metres', confidence: 0.2 }
		];
		expect(pickAlternative(alts, judge)?.answer).toMatchObject({ reason: 'low_confidence' });
	});

	it('has nothing to pick from empty words', () => {
		expect(pickAlternative([], judge)).toBeNull();
		expect(pickAlternative([{ text: '  ', confidence: 0.9 }], judge)).toBeNull();
	});
});

describe('decideHeard', () => {
	const push = { handsFree: false, isCancel };
	const free = { handsFree: true, isCancel };
	const h = (text: string): Heard => ({ text, confidence: 0.9 });

	it('sends a passed phrase to the confirm window', () => {
		expect(decideHeard(h(' next '), ok, push)).toEqual({ kind: 'confirm', text: 'next' });
		expect(decideHeard(h('next'), ok, free)).toEqual({ kind: 'confirm', text: 'next' });
	});

	it('cancel is cancel whatever the gate says', () => {
		expect(decideHeard(h('cancel'), refuse('not_understood'), push)).toEqual({ kind: 'cancel' });
		expect(decideHeard(h('never mind'), refuse('low_confidence'), free)).toEqual({
			kind: 'cancel'
		});
	});

	it('push-to-talk: every refusal is a "say it again" with what was heard', () => {
		for (const reason of [
			'low_confidence',
			'implausible_value',
			'wrong_scale',
			'not_understood'
		] as const) {
			expect(decideHeard(h('rear axle eight'), refuse(reason, 'rear axle 8 N·m'), push)).toEqual({
				kind: 'say_again',
				heard: 'rear axle 8 N·m',
				message: `refused: ${reason}`,
				reason
			});
		}
	});

	it('hands-free: shop talk and unsure phrases are ignored, a clear wrong value is refused aloud', () => {
		expect(decideHeard(h('pass me the socket'), refuse('not_understood'), free)).toMatchObject({
			kind: 'ignored',
			heard: 'pass me the socket'
		});
		expect(decideHeard(h('rear axle eighty'), refuse('low_confidence'), free).kind).toBe('ignored');
		expect(decideHeard(h('rear axle eight hundred'), refuse('implausible_value'), free).kind).toBe(
			'say_again'
		);
		expect(
			decideHeard(h('rear axle eighty newton centimetres'), refuse('wrong_scale'), free).kind
		).toBe('say_again');
	});

	it('hands-free acts on values, next and spec only: a note, part, done or undo is ignored', () => {
		// the offline decoder fits shop talk to "note …", "… replaced", "done …" with a
		// confidence as high as a real call's, so hands-free leaves those to push-to-talk
		for (const intent of ['note', 'part', 'done', 'undo'] as const) {
			expect(decideHeard(h('note dirty new test'), okAs(intent), free)).toEqual({
				kind: 'ignored',
				heard: 'note dirty new test',
				reason: 'not_hands_free'
			});
			expect(decideHeard(h('note chain guide worn'), okAs(intent), push).kind).toBe('confirm');
		}
		for (const intent of ['measure', 'next', 'spec', 'history'] as const) {
			expect(decideHeard(h('next'), okAs(intent), free).kind).toBe('confirm');
		}
	});

	it('a note heard offline goes to the call bar to be checked, never to the confirm window', () => {
		const offline = { text: 'note chain worn on the rear', confidence: 0.9, offline: true };
		expect(decideHeard(offline, okAs('note'), push)).toEqual({
			kind: 'check',
			text: 'note chain worn on the rear',
			why: 'note'
		});
		// a value heard offline, and a note dictated through the browser, are confirmed as before
		expect(decideHeard({ ...offline, text: 'chain 30' }, okAs('measure'), push).kind).toBe(
			'confirm'
		);
		expect(decideHeard(h('note chain worn'), okAs('note'), push).kind).toBe('confirm');
		// hands-free still ignores it
		expect(decideHeard(offline, okAs('note'), free).kind).toBe('ignored');
	});

	it('an out-of-spec value the gate passed unsure goes to the call bar, hands-free too', () => {
		const unsure = { ok: true as const, unsure: true as const, intent: 'measure' as const };
		const heard = { text: 'rear axle nut seventy newton metres', confidence: 0.85, offline: true };
		for (const mode of [push, free])
			expect(decideHeard(heard, unsure, mode)).toEqual({
				kind: 'check',
				text: heard.text,
				why: 'unsure_out_of_spec'
			});
	});

	it('reads the refusal aloud with what it heard', () => {
		expect(sayAgainWords({ heard: 'rear axle 800 N·m', message: 'Too high.' })).toBe(
			'Say it again. I heard: rear axle 800 N·m. Too high.'
		);
		expect(sayAgainWords({ heard: '', message: 'Not understood.' })).toBe(
			'Say it again. Not understood.'
		);
	});
});

describe('alternativesOf (a final Web Speech result)', () => {
	it('keeps every alternative in order, with its confidence or null', () => {
		const result = Object.assign(
			[
				{ transcript: ' rear axle 80 Nm ', confidence: 0.91 },
				{ transcript: 'rear axle 18 Nm', confidence: 0 },
				{ transcript: '' }
			],
			{ isFinal: true }
		);
		expect(alternativesOf(result)).toEqual([
			{ text: 'rear axle 80 Nm', confidence: 0.91 },
			{ text: 'rear axle 18 Nm', confidence: null }
		]);
	});
});

describe('confidenceFor', () => {
	it('offline voice: the decoder’s confidence against the gate’s own threshold', () => {
		expect(confidenceFor({ text: 'next', confidence: 0.8, offline: true })).toEqual({
			confidence: 0.8,
			minConfidence: MIN_CONFIDENCE,
			minOutOfSpecConfidence: MIN_OUT_OF_SPEC_CONFIDENCE
		});
		expect(confidenceFor({ text: 'next', confidence: null, offline: true }).confidence).toBe(0);
	});

	it('Web Speech: its own threshold, and no confidence test when the engine gave none', () => {
		expect(confidenceFor({ text: 'next', confidence: 0.4 })).toEqual({
			confidence: 0.4,
			minConfidence: WEB_SPEECH_MIN_CONFIDENCE,
			minOutOfSpecConfidence: WEB_SPEECH_MIN_CONFIDENCE
		});
		expect(confidenceFor({ text: 'next', confidence: null })).toEqual({
			confidence: 0,
			minConfidence: 0,
			minOutOfSpecConfidence: 0
		});
	});
});

describe('reasonOnly', () => {
	it('drops the gate’s own lead, so the Bench does not say "say it again" twice', async () => {
		const { gatePhrase } = await import('./gate');
		const { parsePhrase } = await import('../phrase/index');
		const step = { id: 'a', label: 'Rear axle nut', unit: 'N.m', min: 80, max: 96 };
		const heard = 'rear axle nut eight hundred newton metres';
		const answer = gatePhrase({
			heard,
			parsed: parsePhrase(heard, { steps: [step] }),
			step,
			confidence: 0.9
		});
		expect(answer.ok).toBe(false);
		const message = answer.ok ? '' : answer.message;
		expect(reasonOnly(message)).not.toMatch(/^say it again/i);
		expect(reasonOnly(message)).not.toContain(heard);
		expect(reasonOnly(message).length).toBeGreaterThan(10);
		expect(reasonOnly('Say it again — heard nothing clear. Nothing was understood.')).toBe(
			'Nothing was understood.'
		);
		expect(reasonOnly('Too far out.')).toBe('Too far out.');
	});
});
