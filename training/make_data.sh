#!/usr/bin/env bash
# Generate the standard detector training and evaluation pages with fixed seeds.
#   training/make_data.sh [train|eval|all]   (default: all)
# Training: randomized layouts in the training style families, seeds 1..99999.
# Evaluation: held-out seeds (>= 900000) of the demo layouts and of the held-out style family.
# A folder that already holds coco.json is kept, so an interrupted run can simply be repeated.
set -euo pipefail
cd "$(dirname "$0")/.."
what="${1:-all}"
case "$what" in train|eval|all) ;; *) echo "make_data.sh: expected train, eval or all; got '$what'" >&2; exit 2 ;; esac
DATA=training/data
NICE="nice -n 5"

generate() { # name layout count seed [extra flags...]
  local name="$1" layout="$2" count="$3" seed="$4"
  shift 4
  if [[ -f "$DATA/$name/coco.json" ]]; then echo "keep $DATA/$name"; return; fi
  rm -rf "$DATA/$name.partial"
  $NICE npx tsx src/cli/main.ts samples generate --layout "$layout" --count "$count" --seed "$seed" \
    --out "$DATA/$name.partial" --degrade heavy --fill mixed "$@"
  mv "$DATA/$name.partial" "$DATA/$name"
}

if [[ "$what" == train || "$what" == all ]]; then
  # 8 x 50 pages; scan resolution drawn by the generator (150..300 DPI under heavy degradation).
  for seed in 1 2 3 4 5 6 7 8; do generate "train-$seed" random 50 "$seed" --styles train; done
fi
if [[ "$what" == eval || "$what" == all ]]; then
  generate eval-heldout-styles random 30 900001 --styles heldout
  generate eval-clinic-intake clinic-intake 15 900002
  generate eval-marina-slip marina-slip 15 900003
  generate eval-garden-plot garden-plot 15 900004
fi
