#!/bin/sh
# Makes the spoken phrases of the Bench's voice end-to-end tests (tests/fixtures/voice/e2e/),
# with Debian's flite and sox (apt-get install -y flite sox). CI does not run this: the WAVs
# are committed. Noise is made by sox in repeatable mode (-R) and mixed at a measured
# signal-to-noise ratio: the noise is scaled so that its RMS sits SNR dB under the speech's.
# Silence, clipping and a 30 s recording are made by the test itself from these files.
set -eu
dir="$(cd "$(dirname "$0")/.." && pwd)/tests/fixtures/voice/e2e"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
mkdir -p "$dir"

# speak VOICE TEXT OUT: 16 kHz, 16-bit mono, 0.3 s of silence before and after
speak() {
	flite -voice "$1" -t "$2" -o "$tmp/raw.wav"
	sox -R "$tmp/raw.wav" -r 16000 -b 16 -c 1 "$3" pad 0.3 0.3
}

rms_db() { sox "$1" -n stats 2>&1 | awk '/^RMS lev dB/ { print $4 }'; }

# noisy IN KIND SNR OUT: IN mixed with sox noise of KIND (pinknoise, brownnoise) at SNR dB
noisy() {
	len="$(soxi -D "$1")"
	sox -R -n -r 16000 -b 16 -c 1 "$tmp/noise.wav" synth "$len" "$2" vol 0.5
	gain="$(awk -v s="$(rms_db "$1")" -v n="$(rms_db "$tmp/noise.wav")" -v snr="$3" \
		'BEGIN { printf "%.2f", s - n - snr }')"
	sox -R "$tmp/noise.wav" "$tmp/noise-scaled.wav" gain "$gain"
	sox -R -m "$1" "$tmp/noise-scaled.wav" "$4"
	echo "$(basename "$4"): speech $(rms_db "$1") dB, noise $(rms_db "$tmp/noise-scaled.wav") dB RMS"
}

# a phrase of job 1041 in a voice other than the older fixtures', under pink noise at 10 dB SNR
speak kal16 "rear axle nut ninety newton metres" "$tmp/axle.wav"
noisy "$tmp/axle.wav" pinknoise 10 "$dir/noisy-pink-10db-rear-axle-90-nm.wav"

# a clearly spoken value ten times the band of the rear axle nut (80-96 N.m, demo specs)
speak rms "rear axle nut eight hundred newton metres" "$dir/rear-axle-800-nm.wav"

# shop talk, a pause, then a call-out of job 1043 (hands-free: only the call-out is acted on)
speak rms "could you pass me the big socket when you are done with it" "$tmp/talk.wav"
speak rms "drive chain slack twenty five millimetres" "$tmp/call.wav"
# 1.5 s apart: longer than the pause that ends a phrase
sox "$tmp/talk.wav" "$tmp/talk-gap.wav" pad 0 1.5
sox "$tmp/talk-gap.wav" "$tmp/call.wav" "$dir/shop-talk-then-chain-slack-25-mm.wav"
sox "$tmp/talk.wav" -n stat 2>&1 | awk '/Length/ { print "shop talk: " $3 " s" }'
ls -l "$dir"
