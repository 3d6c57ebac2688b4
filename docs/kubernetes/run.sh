#!/bin/bash
# Screens a district in tiles on Kubernetes, then gathers them. Needs kubectl on a cluster with a
# ReadWriteMany storage class, and the image of Dockerfile in a registry the cluster pulls from.
#   ./run.sh canals.geojson aquifer.geojson ./doab-out
set -euo pipefail
canals=${1:?canals file}; aquifer=${2:?aquifer file}; out=${3:?local folder for the outputs}
here=$(cd "$(dirname "$0")" && pwd)
kubectl apply -f "$here/doab-volume.yaml"
kubectl wait --for=condition=Ready pod/doab-files --timeout=300s
kubectl exec doab-files -- mkdir -p /data/in
kubectl cp "$canals" doab-files:/data/in/canals.geojson
kubectl cp "$aquifer" doab-files:/data/in/aquifer.geojson
kubectl apply -f "$here/doab-tiles.yaml"
kubectl wait --for=condition=complete job/doab-tiles --timeout=24h
kubectl apply -f "$here/doab-gather.yaml"
kubectl wait --for=condition=complete job/doab-gather --timeout=24h
kubectl cp doab-files:/data/out "$out"
echo "outputs in $out; remove the jobs, pod and volume with: kubectl delete -f $here/doab-gather.yaml -f $here/doab-tiles.yaml -f $here/doab-volume.yaml"
