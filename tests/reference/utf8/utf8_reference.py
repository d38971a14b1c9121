#!/usr/bin/python3
"""Cross-check of nucleate's UTF-8 validation and repair (core/common/utf8) against Python's codec.

Usage: /usr/bin/python3 utf8_reference.py REPAIR_UTF8_BINARY

Python's bytes.decode("utf-8") accepts exactly the well-formed sequences of the Unicode Standard
(Table 3-7: no overlong forms, no surrogates, nothing above U+10FFFF), and errors="replace"
substitutes U+FFFD for each maximal subpart of an ill-formed sequence (Unicode section 3.9), the
practice nucleate follows. Both must agree on: every byte string of length 1 and 2, every lead
byte followed by every second byte and a fixed third and fourth, the boundary code points, and
100,000 random strings (fixed seed) biased toward bytes >= 0x80.
Exits non-zero with the first mismatches on any disagreement.
"""

import random
import subprocess
import sys


def expected(data):
    try:
        data.decode("utf-8")
        valid = 1
    except UnicodeDecodeError:
        valid = 0
    return valid, data.decode("utf-8", errors="replace").encode("utf-8")


def main():
    if len(sys.argv) != 2:
        sys.stderr.write(__doc__)
        return 2
    cases = [bytes([a]) for a in range(256)]
    cases += [bytes([a, b]) for a in range(256) for b in range(256)]
    for lead in range(0xC0, 0x100):
        for second in range(256):
            cases.append(bytes([lead, second, 0x80, 0x80]))
            cases.append(bytes([lead, second, 0x41]))
    for code_point in (0x7F, 0x80, 0x7FF, 0x800, 0xD7FF, 0xE000, 0xFFFD, 0xFFFF, 0x10000,
                       0x10FFFF):
        cases.append(chr(code_point).encode("utf-8"))
    rng = random.Random(20261202)
    for _ in range(100000):
        length = rng.randint(0, 12)
        cases.append(bytes(rng.choice((rng.randint(0, 0x7F), rng.randint(0x80, 0xFF),
                                       rng.randint(0x80, 0xFF)))
                           for _ in range(length)))

    stdin = "".join(c.hex() + "\n" for c in cases)
    out = subprocess.run([sys.argv[1]], input=stdin, capture_output=True, text=True, check=True)
    lines = out.stdout.splitlines()
    if len(lines) != len(cases):
        print(f"expected {len(cases)} answers, got {len(lines)}")
        return 1
    mismatches = []
    for case, line in zip(cases, lines):
        valid_text, _, repaired_hex = line.partition(" ")
        want_valid, want_repaired = expected(case)
        if int(valid_text) != want_valid or bytes.fromhex(repaired_hex) != want_repaired:
            mismatches.append(f"{case.hex()}: nucleate {line!r}, python {want_valid} "
                              f"{want_repaired.hex()}")
    for m in mismatches[:10]:
        print(m)
    print(f"{len(cases)} byte strings, {len(mismatches)} disagreements with Python's UTF-8 codec")
    return 1 if mismatches else 0


if __name__ == "__main__":
    sys.exit(main())
