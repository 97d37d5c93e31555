#!/usr/bin/env python3
"""Prints the 2^(k/128) table of `src/numerics/exp.rs` from its definition, with the
standard library only (decimal arithmetic at 80 digits):

    python3 tools/gen_exp_table.py > /tmp/table.txt

For k = 0..127: H_k = 2^(k/128) rounded to the nearest double, T_k = (2^(k/128) − H_k)
/ H_k rounded to the nearest double (the part H_k misses), and the row holds the bits
of T_k and the bits of H_k minus k·2^45 (the exponent the reduction adds back).
"""

import struct
from decimal import Decimal, getcontext

getcontext().prec = 80
N = 128
LN2 = Decimal(2).ln()


def nearest(d):
    """The double nearest to a Decimal (float() of a long decimal string rounds
    correctly) and its bits."""
    f = float(format(d, ".45e"))
    return f, struct.unpack("<Q", struct.pack("<d", f))[0]


for k in range(N):
    exact = (Decimal(k) / N * LN2).exp()
    h, h_bits = nearest(exact)
    tail = (exact - Decimal(h)) / Decimal(h)
    t_bits = 0 if tail == 0 else nearest(tail)[1]
    print(f"    0x{t_bits:016x}, 0x{(h_bits - (k << 45)) & (2**64 - 1):016x},")
