// Makes the install icons in static/icons/ from the app's own mark (static/favicon.svg), drawn
// by the same Chromium the tests use: `node scripts/make-icons.js`. The PNGs are committed.
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { chromium } from '@playwright/test';
import { chromiumArgs, chromiumPath } from './lib/chromium.js';
import { root } from './lib/config.js';

const mark = await readFile(join(root, 'static', 'favicon.svg'), 'utf8');
// the mark without its own rounded tile: for the maskable icon, whose tile the device cuts
const glyph = mark.replace(/<rect [^>]*\/>/, '');

const icons = [
	{ file: 'icon-192.png', size: 192, svg: mark, bg: 'transparent', inset: 0 },
	{ file: 'icon-512.png', size: 512, svg: mark, bg: 'transparent', inset: 0 },
	{ file: 'apple-touch-icon.png', size: 180, svg: mark, bg: '#1c625f', inset: 0 },
	// maskable: the glyph inside the central 80 % safe zone on a full-bleed tile
	{ file: 'icon-maskable-512.png', size: 512, svg: glyph, bg: '#1c625f', inset: 0.2 }
];

const browser = await chromium.launch({ executablePath: chromiumPath, args: chromiumArgs });
const page = await browser.newPage();
for (const icon of icons) {
	const pad = Math.round(icon.size * icon.inset);
	await page.setViewportSize({ width: icon.size, height: icon.size });
	await page.setContent(
		`<html><body style="margin:0;background:${icon.bg}"><div style="padding:${pad}px;` +
			`width:${icon.size - 2 * pad}px;height:${icon.size - 2 * pad}px">` +
			icon.svg.replace('<svg ', '<svg width="100%" height="100%" ') +
			'</div></body></html>'
	);
	await page.screenshot({
		path: join(root, 'static', 'icons', icon.file),
		omitBackground: icon.bg === 'transparent'
	});
	console.log(`static/icons/${icon.file} ${icon.size}×${icon.size}`);
}
await browser.close();
