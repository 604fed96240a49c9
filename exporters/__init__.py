"""Results into files: CSV tables, plots, drawings, reports. Computes no engineering."""
