#!/usr/bin/env bash
# install-chromium.sh installs Debian's Chromium, which the browser tests
# drive headless (the live page and report.html), only when it is missing.
# The tests skip with a message saying so when no Chromium can be found.
#
# Run as root, or as a user who may use sudo.
set -euo pipefail

if command -v chromium >/dev/null 2>&1 || command -v chromium-browser >/dev/null 2>&1; then
	exit 0
fi
if ! command -v apt-get >/dev/null 2>&1; then
	echo "install-chromium: no apt-get here; install Chromium by hand for the browser tests (they skip without it)" >&2
	exit 0
fi

. "$(dirname "$0")/apt-lib.sh"
missing=(chromium)
if ! apt_root install-chromium; then
	echo "install-chromium: the browser tests will skip" >&2
	exit 0
fi

echo "install-chromium: installing chromium"
export DEBIAN_FRONTEND=noninteractive
if ! { $sudo apt-get update -qq && $sudo apt-get install -y -qq --no-install-recommends chromium >/dev/null; }; then
	echo "install-chromium: could not install chromium; the browser tests will skip" >&2
	exit 0
fi
echo "install-chromium: done"
