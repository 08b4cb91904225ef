#!/usr/bin/env bash
# What the test suite needs from Debian: Chromium for the browser tests (Playwright's own browser
# download is not reachable), poppler-utils for the report tests, python3-iapws as an independent
# IF97 reference for the steam tests.
set -euo pipefail
browser="${PAPIN_CHROMIUM:-/usr/bin/chromium}"
missing() {
  ! [ -x "$browser" ] || ! command -v pdftoppm >/dev/null 2>&1 || ! /usr/bin/python3 -c 'import iapws' 2>/dev/null
}
if ! missing; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
  echo "Installing Debian's chromium, poppler-utils and python3-iapws for the browser, report and steam tests…"
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium poppler-utils python3-iapws >/dev/null
  exit 0
fi
echo "The tests need Chromium at $browser, pdftoppm and Debian's python3-iapws. Install them (Debian: sudo apt-get install -y chromium poppler-utils python3-iapws) or set PAPIN_CHROMIUM." >&2
exit 1
