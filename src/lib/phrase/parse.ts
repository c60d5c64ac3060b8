/**
 * The parse, stage by stage: a note keeps the technician's own words; otherwise the text is
 * normalised, the time clause, the fluid grade and the adapter are taken out, and what is left
 * is read as undo, next, spec, history, a part, a step done or a measurement. Never throws.
 */
import { formatQuantity, unitInfo } from '../units/index';
import { extractAdapter } from './adapter';
import { extractGrade, fluidJudgement } from './fluid';
import { historyWords } from './history';
import {
	CANCEL_PHRASES,
	DONE_PREFIXES,
	DONE_SUFFIXES,
	NEXT_PHRASES,
	NOTE_RE,
	PART_PREFIXES,
	PART_SUFFIXES,
	SPEC_PREFIXES,
	SPEC_SUFFIXES,
	UNDO_PHRASES,
	endsWith,
	startsWith
} from './intents';
import { toMatchTokens } from './similarity';
import { findNumbers } from './numbers';
import { readPair } from './pairs';
import { MATCH_THRESHOLD, pickStep, quote, stepLabel, toCandidates } from './pick';
import { MAX_PHRASE_CHARS, normalizeText, tokenize } from './text';
import { defaultTimeZone, extractTime } from './time';
import { emptyResult, type ParsedPhrase, type PhraseContext, type StepSpec } from './types';
import { chooseValue, measure, unitAfter } from './value';
import { numberNamesOf, stepById, type Vocabulary } from './vocabulary';

/** parse(), with any throw turned into a problem. */
export function safeParse(text: unknown, ctx: PhraseContext, vocabulary: Vocabulary): ParsedPhrase {
	try {
		return parse(text, ctx, vocabulary);
	} catch (e) {
		const r = emptyResult();
		r.problems.push(
			'Benchcall could not read that phrase' +
				(e instanceof Error && e.message ? ` (${e.message.slice(0, 120)}).` : '.')
		);
		return r;
	}
}

function parse(text: unknown, ctx: PhraseContext, vocabulary: Vocabulary): ParsedPhrase {
	const r = emptyResult();
	const { steps, index } = vocabulary;
	if (typeof text !== 'string') {
		r.problems.push('Nothing to read: the phrase is not text.');
		return r;
	}
	let raw = text;
	if (raw.length > MAX_PHRASE_CHARS) {
		raw = raw.slice(0, MAX_PHRASE_CHARS);
		r.problems.push(`Only the first ${MAX_PHRASE_CHARS} characters were read.`);
	}
	if (raw.trim() === '') {
		r.problems.push('Nothing heard. Call out a step and a value, e.g. "rear axle 80 Nm".');
		return r;
	}

	// note: keep the technician's own words and case
	const noteMatch = NOTE_RE.exec(raw.normalize('NFKC'));
	if (noteMatch) {
		r.intent = 'note';
		const body = (noteMatch[1] ?? '').replace(/\s+/g, ' ').trim();
		if (body) r.note = body;
		else r.problems.push('Say what to note after "note", e.g. "note left fork seal weeping".');
		return r;
	}

	const now = ctx.now instanceof Date && !Number.isNaN(ctx.now.getTime()) ? ctx.now : new Date();
	if (ctx.now !== undefined && now !== ctx.now) {
		r.problems.push('The reference time was not a valid date; the current time was used.');
	}
	const timeZone =
		typeof ctx.timeZone === 'string' && ctx.timeZone ? ctx.timeZone : defaultTimeZone();

	const normalized = normalizeText(raw);
	const time = extractTime(normalized, now, timeZone);
	r.problems.push(...time.problems);
	const said = extractGrade(tokenize(time.rest));
	r.fluid = said.text;
	r.problems.push(...said.problems);
	const fitted = extractAdapter(said.rest);
	const tokens = fitted.rest;
	r.adapter = fitted.adapter;
	r.problems.push(...fitted.problems);
	const joined = tokens.join(' ');

	if (UNDO_PHRASES.has(joined)) {
		r.intent = 'undo';
		return r;
	}
	if (NEXT_PHRASES.has(joined)) {
		r.intent = 'next';
		const next = steps.find((s) => !s.done);
		if (next) r.stepId = String(next.id);
		else r.problems.push(steps.length ? 'Every step is done.' : 'This job has no steps.');
		return r;
	}
	if (CANCEL_PHRASES.has(joined)) {
		r.problems.push('"Cancel" stops a pending voice entry; there is nothing to log.');
		return r;
	}
	r.occurredAt = time.occurredAt;

	// spec: "spec fork fluid", "what's the spec for the fork oil", "fork oil spec"
	const specPre = startsWith(tokens, SPEC_PREFIXES);
	const specSuf = specPre ? 0 : endsWith(tokens, SPEC_SUFFIXES);
	if (specPre || specSuf) {
		r.intent = 'spec';
		r.occurredAt = null;
		const words = tokens.slice(specPre, tokens.length - specSuf);
		pickStep(r, words, vocabulary, null, 'spec');
		return r;
	}

	// history: "history rear axle", "rear axle history", "past readings for the chain slack"
	// (never a phrase with a value in it, nor one that starts as a part or a step done)
	const historyOf =
		startsWith(tokens, PART_PREFIXES) || startsWith(tokens, DONE_PREFIXES)
			? null
			: historyWords(tokens);
	if (historyOf && findNumbers(historyOf).length === 0) {
		r.intent = 'history';
		r.occurredAt = null;
		pickStep(r, historyOf, vocabulary, null, 'history');
		return r;
	}

	// part: "new drain plug washer", "replaced the air filter", "spark plugs replaced"
	const partPre = startsWith(tokens, PART_PREFIXES);
	const partSuf = partPre ? 0 : endsWith(tokens, PART_SUFFIXES);
	if (partPre || partSuf) {
		const words = tokens.slice(partPre, tokens.length - partSuf);
		r.intent = 'part';
		if (words.length === 0) {
			r.problems.push('Say which part was fitted, e.g. "new drain plug washer".');
			return r;
		}
		r.note = words.join(' ');
		pickStep(r, words, vocabulary, null, 'part');
		return r;
	}

	// done: "done test ride", "rear brake light checked ok" — unless a value follows, as in
	// "done chain slack 30 mm", which is a measure
	const donePre = startsWith(tokens, DONE_PREFIXES);
	const doneSuf = donePre ? 0 : endsWith(tokens, DONE_SUFFIXES);
	const body = donePre ? tokens.slice(donePre) : tokens;
	const spans = findNumbers(body);
	let value = chooseValue(body, spans, vocabulary);
	const pair = value
		? readPair(body, spans, value, unitAfter(body, value.end)?.unit ?? null, (d) =>
				numberNamesOf(vocabulary).has(d)
			)
		: null;
	if (pair?.kind === 'pair') value = pair.span;
	if (pair?.kind === 'ask') {
		r.problems.push(pair.problem);
		return r;
	}
	if ((donePre || doneSuf) && !value) {
		r.intent = 'done';
		const words = tokens.slice(donePre, tokens.length - doneSuf);
		if (words.length === 0) {
			r.problems.push('Say which step is done, e.g. "done test ride".');
			return r;
		}
		pickStep(r, words, vocabulary, null, 'done');
		judgeFluid(r, vocabulary, said.problems.length);
		return r;
	}

	// measure: "<step words> <number> [unit]"
	if (!value) {
		r.intent = 'unknown';
		const words = toMatchTokens(body);
		const hits = index.search(words).filter((h) => h.score >= MATCH_THRESHOLD);
		r.candidates = toCandidates(hits, steps);
		const best = hits[0] ? steps[hits[0].index] : undefined;
		if (best) {
			r.problems.push(
				`No value heard for ${stepLabel(best)}. Say a number, e.g. "${stepLabel(best).toLowerCase()} ${exampleValue(best)}", or "done ${stepLabel(best).toLowerCase()}".`
			);
		} else {
			r.problems.push(
				`Benchcall could not match ${quote(tokens.join(' ') || raw.trim())} to a step of this job. ` +
					'Call out a step and a value ("rear axle 80 Nm"), or start with "note", "new", "spec", "done", "next" or "undo".'
			);
		}
		return r;
	}
	measure(r, body, value, vocabulary, ctx);
	judgeFluid(r, vocabulary, said.problems.length);
	return r;
}

/** Sets fluidVerdict (and why it fails, its caution, or the prompt) for the matched step. */
function judgeFluid(r: ParsedPhrase, vocabulary: Vocabulary, saidProblems: number): void {
	const step = stepById(vocabulary, r.stepId);
	const j = step ? fluidJudgement(step, r.fluid) : null;
	r.fluidVerdict = j ? j.verdict : null;
	// an unknown grade's problem was said when it was read
	if (j && saidProblems === 0) r.problems.push(...j.problems);
}

function exampleValue(step: StepSpec): string {
	const v = step.nominal ?? step.min ?? step.max;
	if (typeof v !== 'number' || !Number.isFinite(v)) return '…';
	return step.unit && unitInfo(step.unit) ? formatQuantity(v, step.unit) : String(v);
}
