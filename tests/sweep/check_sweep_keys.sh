#!/bin/sh
# Check that the sweep-file key reference in README.md is up to date: the text between the
# lines "<!-- sweep-keys:begin -->" and "<!-- sweep-keys:end -->" must equal the output of
# `tubewave sweep --keys`.
#
#   tests/sweep/check_sweep_keys.sh TUBEWAVE README
#
# Exit 0 when they match; 1 with a unified diff (README -> generated) when they differ;
# 2 when a file or a marker is missing or the command fails.
set -u
tubewave=$1
readme=$2
begin='<!-- sweep-keys:begin -->'
end='<!-- sweep-keys:end -->'
begin_line=$(grep -n -x -F -e "$begin" "$readme" | cut -d: -f1)
end_line=$(grep -n -x -F -e "$end" "$readme" | cut -d: -f1)
if [ -z "$begin_line" ] || [ -z "$end_line" ] || [ "$end_line" -le "$begin_line" ]; then
  echo "check_sweep_keys: $readme must hold '$begin' and then '$end', each on a line of its own" >&2
  exit 2
fi
tmp=$(mktemp -d "${TMPDIR:-/tmp}/tubewave-sweep-keys.XXXXXX") || exit 2
trap 'rm -rf "$tmp"' EXIT
sed -n "$((begin_line + 1)),$((end_line - 1))p" "$readme" > "$tmp/readme.md"
"$tubewave" sweep --keys > "$tmp/generated.md" || { echo "check_sweep_keys: '$tubewave sweep --keys' failed" >&2; exit 2; }
if diff -u --label "$readme (between the markers)" --label "tubewave sweep --keys" "$tmp/readme.md" "$tmp/generated.md"; then
  exit 0
fi
echo "check_sweep_keys: replace the lines between '$begin' and '$end' in $readme with the output of 'tubewave sweep --keys'." >&2
exit 1
