// How Benchcall launches Debian's Chromium, for the end-to-end tests and the browser benchmarks.
// Without the background-networking flags Chromium keeps dialling out on a closed network.

import './config.js'; // loads .env first

export const chromiumPath = process.env.BENCHCALL_CHROMIUM || '/usr/bin/chromium';

export const chromiumArgs = [
	'--no-sandbox',
	'--disable-gpu',
	'--disable-quic',
	'--no-first-run',
	'--disable-background-networking',
	'--disable-component-update',
	'--disable-sync'
];
