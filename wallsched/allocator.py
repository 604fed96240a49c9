"""The C allocator set for a run of large numpy temporaries (glibc only; elsewhere nothing).

The design stage makes and drops arrays of some MB to tens of MB thousands of times (a search
over every section of the grid at each height). By default glibc gives each such array fresh
pages from the kernel (``mmap``) and returns them when it is freed, so every array is paid for
again in page faults: on the sample site about a third of the run's system time. With the
threshold fixed at 32 MiB and the heap trimmed only above 1 GiB of free memory at its top, the
pages are reused instead. What is computed does not change; the peak memory stays the
largest set of arrays alive at once (measured by the pipeline benchmark).
"""

from __future__ import annotations

import ctypes
import sys

M_TRIM_THRESHOLD = -1  # glibc malloc.h
M_MMAP_THRESHOLD = -3
MMAP_THRESHOLD_BYTES = 32 << 20  # arrays of up to 4 million floats from the heap
TRIM_THRESHOLD_BYTES = 1 << 30


def tune() -> bool:
    """Set the allocator for this process and the workers it forks; whether it was set."""
    if not sys.platform.startswith("linux"):
        return False
    try:
        mallopt = ctypes.CDLL(None).mallopt
    except (OSError, AttributeError):  # not glibc (e.g. musl has no mallopt)
        return False
    mallopt.argtypes = (ctypes.c_int, ctypes.c_int)
    mallopt.restype = ctypes.c_int
    return bool(mallopt(M_MMAP_THRESHOLD, MMAP_THRESHOLD_BYTES)
                and mallopt(M_TRIM_THRESHOLD, TRIM_THRESHOLD_BYTES))
