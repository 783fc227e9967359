#!/usr/bin/env bash
# Install Debian's headless-capable Chromium for the browser tests of the calculation notes
# (tests/test_notes.py, marked slow) when it is missing. Safe to call repeatedly.
set -euo pipefail
if [ -x /usr/bin/chromium ]; then
  exit 0
fi
if [ "$(id -u)" -ne 0 ]; then
  if command -v sudo >/dev/null 2>&1; then
    SUDO=sudo
  else
    echo "ensure_chromium: /usr/bin/chromium is missing and this user cannot run apt-get" >&2
    exit 1
  fi
else
  SUDO=
fi
export DEBIAN_FRONTEND=noninteractive
$SUDO apt-get update
$SUDO apt-get install -y --no-install-recommends chromium
/usr/bin/chromium --version
