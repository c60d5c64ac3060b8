#!/bin/sh
# Makes the spoken test phrases of tests/fixtures/voice/ from its manifest.json.
# Needs Debian's flite (voice "rms", decoded well by the offline recogniser's model) and sox:
#   apt-get install -y flite sox
# CI does not run this: the WAVs are committed. Run it again after changing the manifest.
# Noise is "workshop-like": brown noise (compressor and extraction rumble) plus a 100 Hz hum,
# made by sox in repeatable mode (-R), so the same WAVs come out every time.
set -eu
dir="$(cd "$(dirname "$0")/.." && pwd)/tests/fixtures/voice"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
node -e '
	const m = JSON.parse(require("fs").readFileSync(process.argv[1], "utf8"));
	for (const p of m.phrases) console.log([p.file, p.noise ? "noise" : "clean", p.text].join("\t"));
' "$dir/manifest.json" | while IFS="$(printf '\t')" read -r file kind text; do
	flite -voice rms -t "$text" -o "$tmp/raw.wav"
	# 16 kHz, 16-bit, mono, 0.3 s of silence before and after
	sox -R "$tmp/raw.wav" -r 16000 -b 16 -c 1 "$tmp/clean.wav" pad 0.3 0.3
	if [ "$kind" = noise ]; then
		len="$(soxi -D "$tmp/clean.wav")"
		sox -R -n -r 16000 -b 16 -c 1 "$tmp/rumble.wav" synth "$len" brownnoise vol 0.05
		sox -R -n -r 16000 -b 16 -c 1 "$tmp/hum.wav" synth "$len" sine 100 vol 0.03
		sox -R -m -v 1 "$tmp/clean.wav" -v 1 "$tmp/rumble.wav" -v 1 "$tmp/hum.wav" "$dir/$file"
	else
		cp "$tmp/clean.wav" "$dir/$file"
	fi
	echo "$file: $text"
done
