"""Reference values for the ISMRMRD importer (tests/io/ismrmrd), with Debian's python3-h5py and numpy.

Reads the generated ISMRMRD file (see generate_ismrmrd_fixture.sh), writes
  fixtures/ismrmrd-rss.json      header numbers, the root-sum-of-squares image of the fully sampled
                                 data, the noise covariance (numpy.cov over the noise-scan samples) and the
                                 RSS image of the coil images prewhitened with it (L⁻¹, Ψ = L·Lᴴ);
  ../fixtures/ismrmrd/partial.h5 a copy with every 8th phase-encode line dropped (records removed);
  ../fixtures/ismrmrd/subject.h5 a copy whose XML header carries invented subject and study information;
  ../fixtures/ismrmrd/averaged.h5 a copy where lines 0–3 are recorded a second time (average = 1)
                                 with negated samples, so their mean is exactly zero;
  ../fixtures/ismrmrd/radial-header.h5, trajectory-records.h5, two-slices.h5: the noise record and
                                 the first 8 lines only, with the XML trajectory set to radial, with
                                 trajectory_dimensions = 2 and 2 × samples trajectory values per
                                 record, and with lines 4–7 moved to slice 1;
  ../fixtures/ismrmrd/declared-records.h5 declares 1 000 000 records and stores none.
Readout oversampling is removed as the importer does: centred orthonormal inverse DFT along the
readout, keep the central n/oversampling pixels starting at n//2 − kept//2, and the RSS image is
sqrt(Σ_c |ifft2c(k_c)|²) with ifft2c = fftshift ∘ ifft2(norm='ortho') ∘ ifftshift.
Run: /usr/bin/python3 tests/reference/generate_ismrmrd_fixture.py tests/fixtures/ismrmrd/shepp-logan-4coil.h5
"""
import json
import os
import re
import sys

import h5py
import numpy as np

from coil_rss import prewhitened_rss, rss

NOISE_BIT = 1 << 18  # ACQ_IS_NOISE_MEASUREMENT = 19 in ismrmrd.h (bits numbered from 1)

source = sys.argv[1]
here = os.path.dirname(os.path.abspath(__file__))
fixture_dir = os.path.dirname(source)

with h5py.File(source, "r") as f:
    xml = f["dataset/xml"][0]
    xml = xml.decode() if isinstance(xml, bytes) else xml
    records = f["dataset/data"][:]
    record_dtype = f["dataset/data"].dtype


def number(tag_path):
    m = re.search(tag_path, xml, re.S)
    return float(m.group(1))


enc_x = int(number(r"<encodedSpace>.*?<matrixSize>\s*<x>(\d+)</x>"))
enc_y = int(number(r"<encodedSpace>.*?<matrixSize>\s*<x>\d+</x>\s*<y>(\d+)</y>"))
rec_x = int(number(r"<reconSpace>.*?<matrixSize>\s*<x>(\d+)</x>"))
rec_y = int(number(r"<reconSpace>.*?<matrixSize>\s*<x>\d+</x>\s*<y>(\d+)</y>"))
enc_fov_x = number(r"<encodedSpace>.*?<fieldOfView_mm>\s*<x>([0-9.]+)</x>")
rec_fov_x = number(r"<reconSpace>.*?<fieldOfView_mm>\s*<x>([0-9.]+)</x>")
centre = int(number(r"<kspace_encoding_step_1>.*?<center>(\d+)</center>"))
channels = int(number(r"<receiverChannels>(\d+)</receiverChannels>"))

flags = records["head"]["flags"]
is_noise = (flags & NOISE_BIT) != 0
imaging = records[~is_noise]
noise = records[is_noise]
coils = int(imaging["head"]["active_channels"][0])
samples = int(imaging["head"]["number_of_samples"][0])
kept = int(round(samples / (enc_fov_x / rec_fov_x)))


def ifftc(x, axis):
    return np.fft.fftshift(np.fft.ifft(np.fft.ifftshift(x, axes=axis), axis=axis, norm="ortho"), axes=axis)


kspace = np.zeros((coils, enc_y, samples), dtype=np.complex128)
for rec in imaging:
    row = int(rec["head"]["idx"]["kspace_encode_step_1"]) - centre + enc_y // 2
    d = rec["data"].astype(np.float64).view(np.complex128).reshape(coils, samples)
    kspace[:, row, :] += d
profile = ifftc(kspace, axis=2)
first = samples // 2 - kept // 2
image = ifftc(profile[:, :, first : first + kept], axis=1)
rss_plain = rss(image)

noise_samples = np.concatenate(
    [r["data"].astype(np.float64).view(np.complex128).reshape(coils, -1) for r in noise], axis=1
)
cov, rss_whitened = prewhitened_rss(image, noise_samples)

result = {
    "source": "ismrmrd_generate_cartesian_shepp_logan (Debian ismrmrd-tools 1.8) read with h5py "
    + h5py.__version__
    + ", numpy "
    + np.__version__,
    "coils": coils,
    "receiverChannels": channels,
    "readoutSamples": samples,
    "encodedMatrix": [enc_x, enc_y],
    "reconMatrix": [rec_x, rec_y],
    "records": {"total": int(len(records)), "imaging": int(len(imaging)), "noise": int(len(noise))},
    "nx": kept,
    "ny": enc_y,
    "rss": [float(v) for v in rss_plain.ravel()],
    "noiseSamples": int(noise_samples.shape[1]),
    "noiseCovariance": [float(v) for z in cov.ravel() for v in (z.real, z.imag)],
    "rssWhitened": [float(v) for v in rss_whitened.ravel()],
}
with open(os.path.join(here, "fixtures", "ismrmrd-rss.json"), "w") as out:
    json.dump(result, out, indent=None, separators=(",", ":"))
    out.write("\n")


def write_copy(name, keep_records, header):
    with h5py.File(os.path.join(fixture_dir, name), "w") as g:
        g.create_dataset("dataset/xml", data=[header.encode()], dtype=h5py.string_dtype())
        g.create_dataset("dataset/data", data=keep_records, dtype=record_dtype)


steps = records["head"]["idx"]["kspace_encode_step_1"]
partial = records[is_noise | (steps % 8 != 0)]
write_copy("partial.h5", partial, xml)

identified = xml.replace(
    "<acquisitionSystemInformation>",
    "<subjectInformation><patientName>Quillfeather^Odalys</patientName><patientID>INV-4471</patientID>"
    "</subjectInformation><studyInformation><studyDescription>Invented demo study Tarnwick</studyDescription>"
    "</studyInformation><acquisitionSystemInformation>",
)
write_copy("subject.h5", records, identified)
first = records[:9].copy()  # the noise record and lines 0-7
write_copy("radial-header.h5", first, xml.replace("<trajectory>cartesian</trajectory>", "<trajectory>radial</trajectory>"))

bent = first.copy()
for i in range(1, len(bent)):
    bent[i]["head"]["trajectory_dimensions"] = 2
    n = int(bent[i]["head"]["number_of_samples"])
    bent[i]["traj"] = np.linspace(-0.5, 0.5, 2 * n, dtype=np.float32)
write_copy("trajectory-records.h5", bent, xml)

sliced = first.copy()
sliced["head"]["idx"]["slice"][5:] = 1
write_copy("two-slices.h5", sliced, xml)

repeat = records[~is_noise & (steps < 4)].copy()
repeat["head"]["idx"]["average"] = 1
repeat["data"] = [(-r["data"]).astype(np.float32) for r in repeat]
write_copy("averaged.h5", np.concatenate([records, repeat]), xml)
# A file that declares a million records but stores none (chunked, never written: fill values).
with h5py.File(os.path.join(fixture_dir, "declared-records.h5"), "w") as g:
    g.create_dataset("dataset/xml", data=[xml.encode()], dtype=h5py.string_dtype())
    g.create_dataset("dataset/data", shape=(1_000_000,), dtype=record_dtype, chunks=(1024,))
print("wrote", os.path.join(here, "fixtures", "ismrmrd-rss.json"), "partial.h5", "subject.h5")
