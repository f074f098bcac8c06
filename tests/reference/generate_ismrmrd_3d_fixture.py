"""A small 3D Cartesian ISMRMRD file and its reference values, with Debian's python3-h5py and numpy.

Debian's ismrmrd-tools 1.8 generator (ismrmrd_generate_cartesian_shepp_logan, used for the 2D
fixtures by generate_ismrmrd_fixture.sh) writes 2D acquisitions only: it has no option for a second
phase-encode axis. This script therefore writes the 3D file itself, following the standard:
  - the XML header after Debian's ismrmrd-schema 1.8 (/usr/share/ismrmrd/schema/ismrmrd.xsd; the
    script validates it against that schema with python3-lxml before writing):
    encodedSpace/matrixSize z > 1, encodingLimits kspace_encoding_step_1 and _2 with their centres,
    trajectory cartesian; plus invented subjectInformation and studyInformation, which the importer
    must drop;
  - the acquisition records with the compound type copied from the 2D file that ismrmrd-tools wrote
    (tests/fixtures/ismrmrd/shepp-logan-4coil.h5), so the binary layout is the reference
    implementation's: idx.kspace_encode_step_1 (ky) and idx.kspace_encode_step_2 (kz) per record,
    coils × samples complex float32 per record, channel-major;
  - noise-scan records flagged ACQ_IS_NOISE_MEASUREMENT (bit 19 of ismrmrd.h, numbered from 1).
The object: an invented 3D scene of ellipsoids over a 2× oversampled readout field of view
(32 × 16 × 12 voxels, x × y × z), seen by 4 coils with smooth Gaussian magnitude and linear phase;
k-space = orthonormal centred 3D DFT per coil plus complex Gaussian noise correlated across coils
(the same mixing matrix colours the noise scans).

Writes
  ../fixtures/ismrmrd/volume-3d-4coil.h5     the 3D file (with subject and study identifiers);
  ../fixtures/ismrmrd/volume-3d-missing.h5  the same without the record at (ky, kz) = (3, 5);
  fixtures/ismrmrd-3d-rss.json              header numbers and, computed the importer's way
    (readout oversampling removed by a centred orthonormal inverse DFT along x, keeping the central
    n/oversampling samples from n//2 − kept//2), the root-sum-of-squares volume
    sqrt(Σ_c |ifftnc(k_c)|²) (z, y, x order, x fastest), the noise covariance (numpy.cov) and the
    RSS volume of the coil volumes prewhitened with it (L⁻¹, Ψ = L·Lᴴ, numpy's Cholesky).
Run: /usr/bin/python3 tests/reference/generate_ismrmrd_3d_fixture.py
Bench size (tests/bench/raw-3d.bench.ts; the full file only, no reference values):
     /usr/bin/python3 tests/reference/generate_ismrmrd_3d_fixture.py --bench OUT COILS NX NY NZ
"""
import os
import sys

import h5py
import numpy as np
from lxml import etree

from coil_rss import prewhitened_rss, rss
from fixture_io import interleave, write as write_fixture

NOISE_BIT = 1 << 18  # ACQ_IS_NOISE_MEASUREMENT = 19 in ismrmrd.h (bits numbered from 1)
BENCH = len(sys.argv) == 7 and sys.argv[1] == "--bench"
COILS = int(sys.argv[3]) if BENCH else 4
OVERSAMPLING = 2
# Reconstructed matrix (readout x after oversampling removal).
NX, NY, NZ = (int(v) for v in sys.argv[4:7]) if BENCH else (16, 16, 12)
SAMPLES = OVERSAMPLING * NX
FOV_MM = (192.0, 192.0, 144.0)  # reconstructed field of view x, y, z
NOISE_RECORDS = 4
NOISE_LEVEL = 0.002
MISSING = (3, 5)  # (kspace_encode_step_1, kspace_encode_step_2) left out of the partial file

here = os.path.dirname(os.path.abspath(__file__))
fixture_dir = os.path.join(here, "..", "fixtures", "ismrmrd")
rng = np.random.default_rng(20261202)

with h5py.File(os.path.join(fixture_dir, "shepp-logan-4coil.h5"), "r") as f:
    record_dtype = f["dataset/data"].dtype


def centred(fn, x, axes):
    return np.fft.fftshift(fn(np.fft.ifftshift(x, axes=axes), axes=axes, norm="ortho"), axes=axes)


# Object over the oversampled grid, coordinates in [-1, 1) of the reconstructed FOV along each axis.
z, y, x = np.meshgrid(
    (np.arange(NZ) - NZ // 2) / (NZ / 2),
    (np.arange(NY) - NY // 2) / (NY / 2),
    (np.arange(SAMPLES) - SAMPLES // 2) / (NX / 2),
    indexing="ij",
)
scene = np.zeros((NZ, NY, SAMPLES))
for (cx, cy, cz), (ax, ay, az), value in [
    ((0.0, 0.0, 0.0), (0.8, 0.9, 0.8), 1.0),
    ((-0.3, 0.2, 0.1), (0.25, 0.3, 0.35), 0.5),
    ((0.35, -0.25, -0.2), (0.2, 0.15, 0.3), -0.4),
    ((0.1, 0.45, 0.3), (0.1, 0.12, 0.2), 0.8),
]:
    scene += value * ((((x - cx) / ax) ** 2 + ((y - cy) / ay) ** 2 + ((z - cz) / az) ** 2) <= 1)

# Coil centres on a ring around the object (x, y), alternately above and below the centre in z.
angles = 2 * np.pi * (np.arange(COILS) + 0.5) / COILS
centres = [(1.27 * np.cos(a), 1.27 * np.sin(a), 0.3 * (-1) ** c) for c, a in enumerate(angles)]
maps = np.stack(
    [
        np.exp(-((x - cx) ** 2 + (y - cy) ** 2 + (z - cz) ** 2) / 1.5)
        * np.exp(1j * np.pi * (0.3 * c + 0.2 * x - 0.1 * y + 0.15 * z))
        for c, (cx, cy, cz) in enumerate(centres)
    ]
)
kspace = centred(np.fft.fftn, maps * scene, axes=(1, 2, 3))

# Receiver noise correlated across coils: n = A·w, w white complex, so Ψ ∝ A·Aᴴ.
mixing = np.eye(COILS) + 0.25 * np.tril(
    rng.standard_normal((COILS, COILS)) + 1j * rng.standard_normal((COILS, COILS)), -1
)


def coloured_noise(shape_per_coil):
    white = rng.standard_normal((COILS, *shape_per_coil)) + 1j * rng.standard_normal((COILS, *shape_per_coil))
    return NOISE_LEVEL * np.tensordot(mixing, white, axes=(1, 0))


kspace = (kspace + coloured_noise(kspace.shape[1:])).astype(np.complex64)
noise_scans = [coloured_noise((SAMPLES,)).astype(np.complex64) for _ in range(NOISE_RECORDS)]


def record(flags, step1, step2, samples):
    """One acquisition: `samples` is coils × SAMPLES complex64 (channel-major when flattened)."""
    r = np.zeros(1, dtype=record_dtype)
    head = r["head"][0]
    head["version"] = 1
    head["flags"] = flags
    head["number_of_samples"] = SAMPLES
    head["available_channels"] = COILS
    head["active_channels"] = COILS
    head["channel_mask"][0] = (1 << COILS) - 1
    head["center_sample"] = SAMPLES // 2
    head["sample_time_us"] = 5.0
    head["read_dir"] = (1, 0, 0)
    head["phase_dir"] = (0, 1, 0)
    head["slice_dir"] = (0, 0, 1)
    head["idx"]["kspace_encode_step_1"] = step1
    head["idx"]["kspace_encode_step_2"] = step2
    r["head"][0] = head
    r["traj"][0] = np.zeros(0, dtype=np.float32)
    r["data"][0] = np.ascontiguousarray(samples).view(np.float32).ravel()
    return r


noise_records = [record(NOISE_BIT, 0, 0, n) for n in noise_scans]
imaging = []
for kz in range(NZ):
    for ky in range(NY):
        imaging.append(((ky, kz), record(0, ky, kz, kspace[:, kz, ky, :])))

XML = f"""<?xml version="1.0"?>
<ismrmrdHeader xmlns="http://www.ismrm.org/ISMRMRD" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" xmlns:xs="http://www.w3.org/2001/XMLSchema" xsi:schemaLocation="http://www.ismrm.org/ISMRMRD ismrmrd.xsd">
  <version>1</version>
  <subjectInformation>
    <patientName>Marrowind^Ilse</patientName>
    <patientID>INV-3D-0917</patientID>
    <patientBirthdate>1970-01-01</patientBirthdate>
  </subjectInformation>
  <studyInformation>
    <studyID>STUDY-BRACKENFORD-3D</studyID>
    <studyDescription>Invented 3D demo study Brackenford</studyDescription>
  </studyInformation>
  <acquisitionSystemInformation>
    <receiverChannels>{COILS}</receiverChannels>
    <institutionName>Invented Imaging Annex Fernholt</institutionName>
  </acquisitionSystemInformation>
  <experimentalConditions>
    <H1resonanceFrequency_Hz>63500000</H1resonanceFrequency_Hz>
  </experimentalConditions>
  <encoding>
    <encodedSpace>
      <matrixSize><x>{SAMPLES}</x><y>{NY}</y><z>{NZ}</z></matrixSize>
      <fieldOfView_mm><x>{OVERSAMPLING * FOV_MM[0]:.6f}</x><y>{FOV_MM[1]:.6f}</y><z>{FOV_MM[2]:.6f}</z></fieldOfView_mm>
    </encodedSpace>
    <reconSpace>
      <matrixSize><x>{NX}</x><y>{NY}</y><z>{NZ}</z></matrixSize>
      <fieldOfView_mm><x>{FOV_MM[0]:.6f}</x><y>{FOV_MM[1]:.6f}</y><z>{FOV_MM[2]:.6f}</z></fieldOfView_mm>
    </reconSpace>
    <encodingLimits>
      <kspace_encoding_step_1><minimum>0</minimum><maximum>{NY - 1}</maximum><center>{NY // 2}</center></kspace_encoding_step_1>
      <kspace_encoding_step_2><minimum>0</minimum><maximum>{NZ - 1}</maximum><center>{NZ // 2}</center></kspace_encoding_step_2>
    </encodingLimits>
    <trajectory>cartesian</trajectory>
  </encoding>
</ismrmrdHeader>
"""


# The header must follow the standard's schema (Debian ismrmrd-schema 1.8), checked with python3-lxml.
SCHEMA = "/usr/share/ismrmrd/schema/ismrmrd.xsd"
etree.XMLSchema(etree.parse(SCHEMA)).assertValid(etree.fromstring(XML.encode()))


def write(name, records):
    with h5py.File(os.path.join(fixture_dir, name), "w") as g:
        g.create_dataset("dataset/xml", data=[XML.encode()], dtype=h5py.string_dtype())
        g.create_dataset("dataset/data", data=np.concatenate(records), dtype=record_dtype)


if BENCH:
    with h5py.File(sys.argv[2], "w") as g:
        g.create_dataset("dataset/xml", data=[XML.encode()], dtype=h5py.string_dtype())
        g.create_dataset("dataset/data", data=np.concatenate(noise_records + [r for _, r in imaging]))
    sys.exit(0)
write("volume-3d-4coil.h5", noise_records + [r for _, r in imaging])
write("volume-3d-missing.h5", noise_records + [r for key, r in imaging if key != MISSING])

# Reference values, computed from the float32 samples as written, the importer's way.
samples = kspace.astype(np.complex128)
kept = SAMPLES // OVERSAMPLING
first = SAMPLES // 2 - kept // 2
profile = centred(np.fft.ifftn, samples, axes=(3,))[..., first : first + kept]
volume = centred(np.fft.ifftn, profile, axes=(1, 2))
noise = np.concatenate([n.astype(np.complex128) for n in noise_scans], axis=1)
cov, rss_whitened = prewhitened_rss(volume, noise)

result = {
    "source": f"tests/reference/generate_ismrmrd_3d_fixture.py with h5py {h5py.__version__}, numpy {np.__version__}",
    "coils": COILS,
    "readoutSamples": SAMPLES,
    "readoutOversampling": OVERSAMPLING,
    "encodedMatrix": [SAMPLES, NY, NZ],
    "reconMatrix": [NX, NY, NZ],
    "records": {"total": NOISE_RECORDS + NY * NZ, "imaging": NY * NZ, "noise": NOISE_RECORDS},
    "missing": {"step1": MISSING[0], "step2": MISSING[1]},
    "nx": NX,
    "ny": NY,
    "nz": NZ,
    "identifiers": ["Marrowind", "INV-3D-0917", "1970-01-01", "STUDY-BRACKENFORD-3D", "Brackenford", "Fernholt"],
    "rss": rss(volume).ravel().tolist(),
    "noiseSamples": int(noise.shape[1]),
    "noiseCovariance": interleave(cov).tolist(),
    "rssWhitened": rss_whitened.ravel().tolist(),
}
write_fixture("ismrmrd-3d-rss.json", result)
