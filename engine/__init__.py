"""Soil and concrete: earth pressure, stability, ACI 318-19 strength, sizing, segments.

Pure numpy over stations; no file I/O, no click, no matplotlib.
"""
