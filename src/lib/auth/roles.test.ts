import { describe, expect, it } from 'vitest';
import { homeFor, landingFor, navFor } from './roles';

describe('homeFor', () => {
	it('sends each role to its own area', () => {
		expect(homeFor('technician')).toBe('/bench');
		expect(homeFor('foreman')).toBe('/floor');
		expect(homeFor('service_writer')).toBe('/jobs');
		expect(homeFor('owner')).toBe('/jobs');
	});
});

describe('navFor', () => {
	it('shows the shop settings to the owner only', () => {
		expect(navFor('owner').map((n) => n.href)).toContain('/shop');
		for (const role of ['technician', 'foreman', 'service_writer'] as const) {
			expect(navFor(role).map((n) => n.href)).not.toContain('/shop');
		}
	});
	it('shows the procedure library to those who edit or attach procedures', () => {
		for (const role of ['owner', 'foreman', 'service_writer'] as const) {
			expect(navFor(role).map((n) => n.href)).toContain('/procedures');
		}
	});
	it('gives a technician the Bench and not the Floor', () => {
		const hrefs = navFor('technician').map((n) => n.href);
		expect(hrefs).toEqual(['/bench']);
	});
});

describe('landingFor', () => {
	it('honours a same-site page the role may open', () => {
		expect(landingFor('owner', '/shop')).toBe('/shop');
		expect(landingFor('technician', '/bench?job=1042')).toBe('/bench?job=1042');
	});
	it('ignores a page the role may not open', () => {
		expect(landingFor('technician', '/shop')).toBe('/bench');
		expect(landingFor('service_writer', '/floor')).toBe('/jobs');
	});
	it('refuses open redirects', () => {
		expect(landingFor('owner', 'https://elsewhere.example/')).toBe('/jobs');
		expect(landingFor('owner', '//elsewhere.example/')).toBe('/jobs');
		expect(landingFor('owner', '/\\elsewhere.example')).toBe('/jobs');
	});
	it('never lands on the sign-in page or an API route', () => {
		expect(landingFor('foreman', '/sign-in')).toBe('/floor');
		expect(landingFor('foreman', '/api/staff')).toBe('/floor');
		expect(landingFor('foreman', null)).toBe('/floor');
	});
});
