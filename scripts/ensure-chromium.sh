#!/usr/bin/env bash
# Finds a Chromium for the end-to-end tests: $CHROMIUM_PATH, else /usr/bin/chromium; when neither is
# there and we are root with apt, installs Debian's package; otherwise stops with one instruction.
set -euo pipefail
if [ -n "${CHROMIUM_PATH:-}" ] && [ -x "$CHROMIUM_PATH" ]; then exit 0; fi
if [ -x /usr/bin/chromium ]; then exit 0; fi
if [ "$(id -u)" = "0" ] && command -v apt-get >/dev/null 2>&1; then
  echo "Installing Debian's chromium for the end-to-end tests..." >&2
  apt-get update -qq >/dev/null
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends chromium fonts-liberation >/dev/null
  exit 0
fi
echo "No Chromium found: install it (e.g. 'sudo apt-get install chromium') or set CHROMIUM_PATH to a Chromium binary." >&2
exit 1
