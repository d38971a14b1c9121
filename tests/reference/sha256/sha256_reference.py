#!/usr/bin/python3
"""Cross-check of nucleate's SHA-256 (core/common/sha256) against Python's hashlib.sha256.

Usage: /usr/bin/python3 sha256_reference.py SHA256_FILES_BINARY

Random messages (fixed seed) of every length 0..200 bytes (all padding cases of FIPS 180-4
section 5.1.1: the length field in the same block or the next), lengths around multiples of the
64-byte block up to 4 KiB, and a few of 100 KiB to 3 MiB; each is hashed by nucleate in one call
and in pieces of a chunk size that varies between runs, and both digests must equal hashlib's.
hashlib is in Debian's python3 standard library (OpenSSL's implementation underneath).
Exits non-zero with a message on any mismatch.
"""

import hashlib
import os
import random
import subprocess
import sys
import tempfile


def main():
    if len(sys.argv) != 2:
        sys.stderr.write(__doc__)
        return 2
    binary = sys.argv[1]
    rng = random.Random(20240601)

    lengths = list(range(0, 201))
    for blocks in range(2, 65):
        lengths += [64 * blocks - 9, 64 * blocks - 8, 64 * blocks - 1, 64 * blocks, 64 * blocks + 1]
    lengths += [100 * 1024, 1000 * 1000 + 7, 3 * 1024 * 1024]

    failures = 0
    checks = 0
    with tempfile.TemporaryDirectory(prefix="nucleate_sha256_") as work:
        paths, expected = [], []
        for index, length in enumerate(lengths):
            data = bytes(rng.getrandbits(8) for _ in range(length)) if length < 5000 \
                else rng.randbytes(length)
            path = os.path.join(work, "m%04d" % index)
            with open(path, "wb") as f:
                f.write(data)
            paths.append(path)
            expected.append(hashlib.sha256(data).hexdigest())

        for chunk in (1, 7, 63, 64, 65, 1000):
            out = subprocess.run([binary, str(chunk)] + paths, check=True, capture_output=True,
                                 text=True).stdout.split("\n")
            for length, want, line in zip(lengths, expected, out):
                one_shot, pieces = line.split()
                checks += 2
                if one_shot != want:
                    failures += 1
                    print("MISMATCH one-shot, %d bytes: nucleate %s, hashlib %s"
                          % (length, one_shot, want))
                if pieces != want:
                    failures += 1
                    print("MISMATCH chunk %d, %d bytes: nucleate %s, hashlib %s"
                          % (chunk, length, pieces, want))

    print("sha256_reference: %d checks, %d mismatches" % (checks, failures))
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
