#!/usr/bin/env bash
# Playwright drives Debian's Chromium; browsers are never downloaded by the test tool itself.
set -euo pipefail
if [ -x /usr/bin/chromium ]; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null; then
  echo "Installing Debian's chromium for the end-to-end tests…"
  apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
  exit 0
fi
echo "The end-to-end tests need Debian's Chromium at /usr/bin/chromium." >&2
echo "Install it with:  sudo apt-get install -y chromium   (do not run 'npx playwright install')" >&2
exit 1
