"""The allocator settings of a run (wallsched/allocator.py): glibc accepts both values (a
refused one would be lost without a word), elsewhere nothing is set."""

import platform
import sys

from wallsched import allocator


def test_glibc_takes_the_settings_and_other_c_libraries_are_left_alone():
    on_glibc = sys.platform.startswith("linux") and platform.libc_ver()[0] == "glibc"
    assert allocator.tune() is on_glibc
    assert allocator.tune() is on_glibc  # setting them again is harmless
