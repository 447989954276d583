#!/bin/sh
# Writes scripts/accuracy/clip-report-two-models.md from saved tracking (see the accuracy README).
set -e
cd "$(dirname "$0")/../.."
A="npx tsx scripts/accuracy/model-agreement.ts"
{
  echo "# Two hand models on one clip (lite, full, both together)"
  echo
  echo "Written by the commands in scripts/accuracy/README.md (\"Two hand models on one clip\"); do not edit by hand. Engine readings of saved tracking, every frame against the truth, all four fingers; \"both\" is vision/model-pair.ts analyzeCapturePair. Seed 20261222 (against gravity) is the fresh held-out seed of the frame-rate check (engine analysis-4, commit ed073b9), read once at 30 and at 10 frames a second (the 10 in the accuracy README); seed 20261221 (both conditions) is the fresh held-out seed for the peak figures (clipPeakP90Deg, commits 3503e19 and 4aa3f1c), read once; seed 20261220 (gravity minimized) is the fresh held-out seed for the thumb-side two-model cells (commit 4c34f88), read once; seed 20261219 is the fresh held-out seed for the measured two-model interval (commit 17219b0), read once; seed 20261218 was fresh for the rule as revised in commit ccbbff1; seed 20261217 was fresh for the first rule; the other held-out seeds were read before for other purposes; 77000401-77000405 are training seeds."
  echo
  $A --seeds 20261222 --per-reading
  echo
  $A --seeds 20261221 --per-reading
  echo
  $A --seeds 20261221 --condition gravity_minimized --per-reading
  echo
  $A --seeds 20261220 --condition gravity_minimized --per-reading
  echo
  $A --seeds 20261219 --per-reading
  echo
  $A --seeds 20261218 --per-reading
  echo
  $A --seeds 20261217 --per-reading
  echo
  $A --seeds 20261217 --condition gravity_minimized --per-reading
  echo
  $A --seeds 20261210,20261209,20261207,20261205,20261216
  echo
  $A --seeds 20261210,20261207,20261215 --condition gravity_minimized
  echo
  $A --seeds 77000401,77000402,77000403,77000404,77000405
} > scripts/accuracy/clip-report-two-models.md 2>"${TMPDIR:-/tmp}/two-model-report.err"
