#!/usr/bin/env bash
# tipgap predict --plot: a (gap, bias) grid gives a colour map; PNG, SVG and PDF by extension.
set -u
PY=${TIPGAP_PYTHON:-/usr/bin/python3}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }
"$TIPGAP" predict --gap 0.4nm..1.0nm --bias -1V..1V --points 9 --plot "$work/grid.png" --format csv > /dev/null 2>&1 || fail "png"
[ "$(head -c 8 "$work/grid.png" | od -An -tx1 | tr -d ' \n')" = "89504e470d0a1a0a" ] || fail "PNG signature"
[ "$(stat -c %s "$work/grid.png")" -gt 10000 ] || fail "PNG too small"
"$TIPGAP" predict --gap 0.6nm --bias 0.1V --plot "$work/one.svg" > /dev/null || fail "svg"
"$PY" -c "import sys, xml.dom.minidom as m; assert m.parse(sys.argv[1]).documentElement.tagName == 'svg'" "$work/one.svg" || fail "SVG parse"
"$TIPGAP" predict --gap 0.6nm..0.9nm --bias 0.1V --points 4 --plot "$work/g.pdf" > /dev/null || fail "pdf"
[ "$(head -c 5 "$work/g.pdf")" = "%PDF-" ] || fail "PDF signature"
echo "predict plot CLI: ok"
