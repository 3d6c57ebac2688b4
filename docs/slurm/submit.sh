#!/bin/bash
# Queues the tiles of a district as a Slurm job array, and the gathering to run after all of them.
#   DOAB_ROOT=~/doab DOAB_DATA=/shared/doab ./submit.sh 7
set -euo pipefail
tiles=${1:?give the number of tiles, e.g. ./submit.sh 7}
here=$(cd "$(dirname "$0")" && pwd)
array=$(sbatch --parsable --array="0-$((tiles - 1))" "$here/doab-tiles.sbatch")
gather=$(sbatch --parsable --dependency="afterok:${array%%;*}" "$here/doab-gather.sbatch")
echo "queued tiles as job array ${array%%;*} and the gathering as job ${gather%%;*}"
