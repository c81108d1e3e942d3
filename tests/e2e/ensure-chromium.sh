#!/usr/bin/env bash
# The end-to-end tests drive Debian's chromium (never a downloaded browser). Install it when
# missing and we may (root with apt); otherwise say what to do.
set -euo pipefail
browser="${CHROMIUM_PATH:-/usr/bin/chromium}"
if [ -x "$browser" ]; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null; then
	echo "chromium is missing: installing Debian's package…"
	DEBIAN_FRONTEND=noninteractive apt-get update -qq
	DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
	exit 0
fi
echo "The end-to-end tests need chromium at $browser. Install it (sudo apt-get install chromium) or set CHROMIUM_PATH." >&2
exit 1
