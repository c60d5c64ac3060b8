// The bright-workshop theme's verdict colours and the arithmetic that checks them: WCAG 2.x
// contrast (https://www.w3.org/TR/WCAG22/#dfn-contrast-ratio and #dfn-relative-luminance) and a
// colour-vision-deficiency simulation (Machado, Oliveira & Fernandes 2009, severity 1.0).

export type Rgb = readonly [number, number, number];

/**
 * The bright theme: solid badges with white words, hues after the Okabe–Ito colour-blind-safe
 * set (bluish green, blue, vermillion) darkened to 7:1. Each verdict keeps its word and symbol.
 */
export const brightVerdicts = {
	in: { text: '#ffffff', fill: '#00634a', symbol: '●' },
	low: { text: '#ffffff', fill: '#002f6c', symbol: '▼' },
	high: { text: '#ffffff', fill: '#9a3000', symbol: '▲' },
	no_spec: { text: '#111518', fill: '#ffffff', symbol: '–' }
} as const;

export function hexToRgb(hex: string): Rgb {
	const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
	if (!m) throw new Error(`not a #rrggbb colour: ${hex}`);
	return [parseInt(m[1], 16), parseInt(m[2], 16), parseInt(m[3], 16)];
}

/** sRGB channel (0–255) to linear light (WCAG 2.x uses the 0.04045 threshold of IEC 61966-2-1). */
const toLinear = (c: number) => {
	const s = c / 255;
	return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
};
const toSrgb = (l: number) => {
	const v = Math.min(1, Math.max(0, l));
	const s = v <= 0.0031308 ? v * 12.92 : 1.055 * v ** (1 / 2.4) - 0.055;
	return Math.round(s * 255);
};

/** WCAG 2.x relative luminance. */
export function luminance([r, g, b]: Rgb): number {
	return 0.2126 * toLinear(r) + 0.7152 * toLinear(g) + 0.0722 * toLinear(b);
}

/** WCAG 2.x contrast ratio, 1–21. */
export function contrast(a: Rgb, b: Rgb): number {
	const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
	return (hi + 0.05) / (lo + 0.05);
}

// Machado et al. 2009, table for severity 1.0 (values from memory of the published table),
// applied to linear RGB.
const machado = {
	protanopia: [
		[0.152286, 1.052583, -0.204868],
		[0.114503, 0.786281, 0.099216],
		[-0.003882, -0.048116, 1.051998]
	],
	deuteranopia: [
		[0.367322, 0.860646, -0.227968],
		[0.280085, 0.672501, 0.047413],
		[-0.01182, 0.04294, 0.968881]
	],
	tritanopia: [
		[1.255528, -0.076749, -0.178779],
		[-0.078411, 0.930809, 0.147602],
		[0.004733, 0.691367, 0.3039]
	]
} as const;
export type Deficiency = keyof typeof machado;
export const deficiencies = Object.keys(machado) as Deficiency[];

/** How `rgb` looks to a reader with the given colour-vision deficiency. */
export function simulate(rgb: Rgb, kind: Deficiency): Rgb {
	const lin = rgb.map(toLinear);
	const m = machado[kind];
	return m.map((row) =>
		toSrgb(row[0] * lin[0] + row[1] * lin[1] + row[2] * lin[2])
	) as unknown as Rgb;
}

/** CIE76 colour difference ΔE*ab (D65), enough to say two colours are told apart. */
export function deltaE(a: Rgb, b: Rgb): number {
	const lab = (rgb: Rgb) => {
		const [r, g, bl] = rgb.map(toLinear);
		const x = (0.4124 * r + 0.3576 * g + 0.1805 * bl) / 0.95047;
		const y = 0.2126 * r + 0.7152 * g + 0.0722 * bl;
		const z = (0.0193 * r + 0.1192 * g + 0.9505 * bl) / 1.08883;
		const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
		return [116 * f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))];
	};
	const [p, q] = [lab(a), lab(b)];
	return Math.hypot(p[0] - q[0], p[1] - q[1], p[2] - q[2]);
}
