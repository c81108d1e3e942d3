#!/usr/bin/env bash
# The unit and integration tests run on Debian's ffmpeg (the maintained build the app prefers;
# DEVELOPERS.md, "ffmpeg") and start Debian's redis-server for the BullMQ queue engine's tests.
# Install what is missing when we may (root with apt); otherwise say what to do.
set -euo pipefail
missing=()
{ [ -x /usr/bin/ffmpeg ] && [ -x /usr/bin/ffprobe ]; } || missing+=(ffmpeg)
command -v redis-server >/dev/null || missing+=(redis-server)
if [ ${#missing[@]} -eq 0 ]; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null; then
	echo "Installing Debian's ${missing[*]} for the tests…"
	DEBIAN_FRONTEND=noninteractive apt-get update -qq
	DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${missing[@]}" >/dev/null
	exit 0
fi
if command -v redis-server >/dev/null; then
	# Only ffmpeg is missing: the app falls back to the npm build, and so do the tests.
	echo "Debian's ffmpeg is not installed; the tests use the npm build instead." >&2
	exit 0
fi
echo "The queue tests need redis-server: sudo apt-get install ${missing[*]}" >&2
exit 1
