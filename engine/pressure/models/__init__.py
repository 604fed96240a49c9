"""The pressure models, one module each; a module defining ``MODEL`` is a model (see
``engine/pressure/registry.py``)."""
