import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { brightVerdicts, contrast, deficiencies, deltaE, hexToRgb, simulate } from './palette';

describe('WCAG 2.x arithmetic', () => {
	// Published anchors: black on white is 21:1, white on white 1:1 (WCAG 2.2, contrast ratio);
	// #767676 on white is the well-known lightest grey passing 4.5:1 (4.54:1, common practice).
	it('matches the published values', () => {
		expect(contrast(hexToRgb('#000000'), hexToRgb('#ffffff'))).toBeCloseTo(21, 5);
		expect(contrast(hexToRgb('#ffffff'), hexToRgb('#ffffff'))).toBeCloseTo(1, 5);
		expect(contrast(hexToRgb('#767676'), hexToRgb('#ffffff'))).toBeCloseTo(4.54, 2);
	});
});

describe('the bright theme’s verdict colours', () => {
	const verdicts = Object.entries(brightVerdicts);

	it('reach WCAG 2.x level AAA contrast (7:1) for their words on their badges', () => {
		for (const [name, v] of verdicts) {
			expect(contrast(hexToRgb(v.text), hexToRgb(v.fill)), name).toBeGreaterThanOrEqual(7);
		}
	});

	it('stay apart for protanopic, deuteranopic and tritanopic readers (simulated)', () => {
		// a simulation of pure red must lose most of its red–green difference: the model works
		const red = hexToRgb('#ff0000');
		const green = hexToRgb('#00ff00');
		expect(deltaE(simulate(red, 'deuteranopia'), simulate(green, 'deuteranopia'))).toBeLessThan(
			deltaE(red, green) / 2
		);
		const fills = verdicts.filter(([n]) => n !== 'no_spec').map(([, v]) => hexToRgb(v.fill));
		for (const kind of deficiencies) {
			for (let i = 0; i < fills.length; i++) {
				for (let j = i + 1; j < fills.length; j++) {
					// ΔE*ab ≥ 10 reads as clearly different colours (common practice)
					expect(deltaE(simulate(fills[i], kind), simulate(fills[j], kind))).toBeGreaterThan(10);
				}
			}
		}
	});

	it('keep a distinct symbol each, so colour is never the only cue', () => {
		const symbols = verdicts.map(([, v]) => v.symbol);
		expect(new Set(symbols).size).toBe(symbols.length);
	});
});

describe('src/app.css', () => {
	it('paints the bright badges with the colours checked here', () => {
		const css = readFileSync(new URL('../../app.css', import.meta.url), 'utf8');
		for (const [name, v] of Object.entries(brightVerdicts)) {
			const rule = new RegExp(
				`\\.verdict-${name} \\{\\s*background: (#[0-9a-f]{6});[^}]*color: (#[0-9a-f]{6});`
			).exec(css);
			expect(rule, name).not.toBeNull();
			expect(rule![1], name).toBe(v.fill);
			expect(rule![2], name).toBe(v.text);
		}
	});
});
