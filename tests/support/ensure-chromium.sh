#!/usr/bin/env bash
# The browser tests use Debian's Chromium (Playwright's own browser download is not reachable).
set -euo pipefail
browser="${PAPIN_CHROMIUM:-/usr/bin/chromium}"
if [ -x "$browser" ]; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
  echo "Installing Debian's chromium and poppler-utils for the browser and report tests…"
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium poppler-utils >/dev/null
  exit 0
fi
echo "The browser tests need Chromium at $browser. Install it (Debian: sudo apt-get install -y chromium poppler-utils) or set PAPIN_CHROMIUM." >&2
exit 1
