import { describe, expect, it } from 'vitest';
import {
	appCache,
	endsSession,
	offlinePage,
	pageKeys,
	pagePolicy,
	staleCaches,
	PAGE_CACHE,
	VOICE_CACHE
} from './pages';

const u = (path: string) => new URL(path, 'http://127.0.0.1:3000');
const job = '0f8fad5b-d9cb-469f-a165-70867728950e';

describe('pagePolicy', () => {
	it('keeps the Bench and the job data it reads', () => {
		expect(pagePolicy(u('/bench?job=1042'), true)).toBe('keep');
		expect(pagePolicy(u('/bench/__data.json?job=1042'), false)).toBe('keep');
		expect(pagePolicy(u(`/api/jobs/${job}/steps`), false)).toBe('keep');
		expect(pagePolicy(u(`/api/jobs/${job}/entries?after=10&limit=200`), false)).toBe('keep');
	});

	it('does not keep older pages of a log, streams, or other areas', () => {
		expect(pagePolicy(u(`/api/jobs/${job}/entries?before=10`), false)).toBe('pass');
		expect(pagePolicy(u(`/api/jobs/${job}/stream`), false)).toBe('pass');
		expect(pagePolicy(u('/api/jobs'), false)).toBe('pass');
		expect(pagePolicy(u('/jobs'), true)).toBe('notice');
		expect(pagePolicy(u('/benchmark'), true)).toBe('notice');
		// a page opened from within the app asks for its data: offline that says so too
		expect(pagePolicy(u('/jobs/__data.json'), false)).toBe('notice');
		expect(pagePolicy(u('/floor/__data.json?x-sveltekit-invalidated=1'), false)).toBe('notice');
	});
});

describe('pageKeys', () => {
	it('keeps a Bench page also as the last Bench page', () => {
		expect(pageKeys(u('/bench?job=1042'))).toEqual(['/bench?job=1042', '/bench']);
		expect(pageKeys(u('/bench'))).toEqual(['/bench']);
	});

	it('ignores SvelteKit’s invalidation marker and the order of parameters', () => {
		expect(pageKeys(u('/bench/__data.json?x-sveltekit-invalidated=01&job=7'))).toEqual([
			'/bench/__data.json?job=7',
			'/bench/__data.json'
		]);
		expect(pageKeys(u(`/api/jobs/${job}/entries?limit=200&after=3`))).toEqual([
			`/api/jobs/${job}/entries?after=3&limit=200`
		]);
	});
});

describe('offlinePage', () => {
	it('names the page plainly and escapes it', () => {
		const html = offlinePage('/jobs/<b>');
		expect(html).toContain('needs the server');
		expect(html).toContain('/jobs/&#60;b&#62;');
		expect(html).not.toContain('<b>');
		expect(html).not.toContain('<script');
	});
});

describe('staleCaches', () => {
	it('drops earlier builds only: the pages and the voice model stay across deploys', () => {
		const keys = [appCache('100'), appCache('200'), PAGE_CACHE, VOICE_CACHE, 'someone-else'];
		expect(staleCaches(keys, '200')).toEqual([appCache('100')]);
		expect(staleCaches(keys, '300')).toEqual([appCache('100'), appCache('200')]);
	});
});

describe('endsSession', () => {
	it('is a sign-out or a sign-in, never a read', () => {
		expect(endsSession('POST', u('/sign-out'))).toBe(true);
		expect(endsSession('POST', u('/sign-in'))).toBe(true);
		expect(endsSession('GET', u('/sign-in'))).toBe(false);
		expect(endsSession('POST', u('/api/jobs/x/entries'))).toBe(false);
	});
});
