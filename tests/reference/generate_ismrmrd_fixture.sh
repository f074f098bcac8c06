#!/usr/bin/env bash
# Regenerates the ISMRMRD raw-data fixtures (tests/io/ismrmrd). Needs Debian's ismrmrd-tools 1.8
# (ismrmrd_generate_cartesian_shepp_logan, the reference implementation's phantom generator:
# 4 coils, 64×64 reconstructed matrix, 2× readout oversampling, noise level 0.05, one noise-scan
# record) and python3-h5py / python3-numpy for the derived files and the reference image.
#   apt-get install ismrmrd-tools python3-h5py python3-numpy
set -euo pipefail
cd "$(dirname "$0")/../.."
out=tests/fixtures/ismrmrd
mkdir -p "$out"
ismrmrd_generate_cartesian_shepp_logan --matrix 64 --coils 4 --oversampling 2 --noise-level 0.05 \
  --noise-calibration --output "$out/shepp-logan-4coil.h5"
/usr/bin/python3 tests/reference/generate_ismrmrd_fixture.py "$out/shepp-logan-4coil.h5"
