#!/bin/sh
# Check that the key reference in README.md is up to date: the text between the lines
# "<!-- keys:begin -->" and "<!-- keys:end -->" must equal the output of `tubewave keys`.
#
#   tests/cli/check_keys_reference.sh [TUBEWAVE [README]]
#
# Defaults: build/src/tubewave and README.md, relative to the working directory.
# Exit 0 when they match; 1 with a unified diff (README -> generated) when they differ;
# 2 when a file or a marker is missing or `tubewave keys` fails.
set -u

tubewave=${1:-build/src/tubewave}
readme=${2:-README.md}
begin='<!-- keys:begin -->'
end='<!-- keys:end -->'

if [ ! -x "$tubewave" ]; then
  echo "check_keys_reference: no tubewave executable at '$tubewave'" >&2
  exit 2
fi
if [ ! -f "$readme" ]; then
  echo "check_keys_reference: no README at '$readme'" >&2
  exit 2
fi
n_begin=$(grep -c -x -F -e "$begin" "$readme")
n_end=$(grep -c -x -F -e "$end" "$readme")
if [ "$n_begin" -ne 1 ] || [ "$n_end" -ne 1 ]; then
  echo "check_keys_reference: $readme must hold each marker once, on a line of its own:" >&2
  echo "  '$begin' ($n_begin found) and '$end' ($n_end found)" >&2
  exit 2
fi
begin_line=$(grep -n -x -F -e "$begin" "$readme" | cut -d: -f1)
end_line=$(grep -n -x -F -e "$end" "$readme" | cut -d: -f1)
if [ "$end_line" -le "$begin_line" ]; then
  echo "check_keys_reference: '$end' comes before '$begin' in $readme" >&2
  exit 2
fi

tmp=$(mktemp -d "${TMPDIR:-/tmp}/tubewave-keys.XXXXXX") || exit 2
trap 'rm -rf "$tmp"' EXIT
sed -n "$((begin_line + 1)),$((end_line - 1))p" "$readme" > "$tmp/readme_keys.md"
if ! "$tubewave" keys > "$tmp/generated_keys.md"; then
  echo "check_keys_reference: '$tubewave keys' failed" >&2
  exit 2
fi

if diff -u --label "$readme (between the markers)" --label "tubewave keys" \
     "$tmp/readme_keys.md" "$tmp/generated_keys.md"; then
  exit 0
fi
echo "check_keys_reference: the key reference in $readme is out of date; replace the lines" >&2
echo "  between '$begin' and '$end' with the output of 'tubewave keys'." >&2
exit 1
