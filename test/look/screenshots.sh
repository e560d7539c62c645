#!/usr/bin/env bash
# Look at the walkthrough as a reader of a static notebook page would: execute
# examples/orchard.ipynb headless in Deno's Jupyter kernel, render it to HTML with nbconvert,
# and screenshot that page with headless Chromium at a notebook-like width, offline.
#
# Run by hand (not part of `deno task test`):
#
#     bash test/look/screenshots.sh [OUT_DIR] [NOTEBOOK]
#
# OUT_DIR defaults to /tmp/curbfit-look; NOTEBOOK to examples/orchard.ipynb. The page is cut into
# numbered PNG slices (page-01.png, …) that an image viewer shows at full size. Nothing here is
# committed: the images are for looking, then fixing what a reader would stumble on.
#
# Needs (Debian): python3-nbclient python3-nbformat jupyter-client python3-nbconvert python3-pil
# chromium, and `unshare` (util-linux) to cut Chromium off the network. Run as root, or drop the
# `unshare -n` prefix (the page then may try, and fail, to load nbconvert's remote scripts).
set -euo pipefail

ROOT="$(cd "$(dirname "$0")/../.." && pwd)"
OUT="${1:-/tmp/curbfit-look}"
NOTEBOOK="${2:-$ROOT/examples/orchard.ipynb}"
WIDTH=820        # window width: the output column comes out at about 700 px
HEIGHT=16000     # tall enough for the whole page; slices are cut from it
SLICE=1300       # slice height in pixels
PYTHON="${CURBFIT_PYTHON:-/usr/bin/python3}"

WORK="$(mktemp -d /tmp/curbfit-look-work.XXXXXX)"
trap 'rm -rf "$WORK"' EXIT
mkdir -p "$OUT" "$WORK/jupyter/kernels/curbfit-deno" "$WORK/executed" "$WORK/profile"

# A kernel spec for the Deno on PATH, as test/notebook_test.ts writes one.
cat >"$WORK/jupyter/kernels/curbfit-deno/kernel.json" <<EOF
{"argv": ["$(command -v deno)", "jupyter", "--kernel", "--conn", "{connection_file}"],
 "display_name": "Deno (curbfit look)", "language": "typescript"}
EOF

echo "executing $NOTEBOOK"
EXECUTED="$(JUPYTER_PATH="$WORK/jupyter" "$PYTHON" "$ROOT/test/notebook/run_notebook.py" \
  curbfit-deno "$NOTEBOOK" "$WORK/executed" 300)"

echo "rendering HTML"
"$PYTHON" -m nbconvert --to html --output-dir "$OUT" "$EXECUTED" >/dev/null 2>&1
PAGE="$OUT/$(basename "${NOTEBOOK%.ipynb}").html"

echo "screenshot of $PAGE"
unshare -n chromium --headless --no-sandbox --disable-gpu --disable-background-networking \
  --disable-component-update --disable-sync --no-first-run --hide-scrollbars \
  --user-data-dir="$WORK/profile" --window-size="$WIDTH,$HEIGHT" \
  --screenshot="$WORK/page.png" "file://$PAGE" >/dev/null 2>&1

# Cut the page into slices and drop the blank tail.
"$PYTHON" - "$WORK/page.png" "$OUT" "$SLICE" <<'EOF'
import sys
from PIL import Image, ImageChops

page = Image.open(sys.argv[1]).convert("RGB")
out, slice_height = sys.argv[2], int(sys.argv[3])
background = Image.new("RGB", page.size, page.getpixel((page.width - 1, page.height - 1)))
box = ImageChops.difference(page, background).getbbox()
bottom = box[3] + 20 if box else page.height
count = 0
for top in range(0, bottom, slice_height):
    count += 1
    page.crop((0, top, page.width, min(top + slice_height, bottom))).save(f"{out}/page-{count:02d}.png")
print(f"{count} slices of {page.width} px width in {out}")
EOF
