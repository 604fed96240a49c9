# Two commands do all set-up on a fresh machine: `make demo` and `make test`.
PY ?= python3
VENV := .venv
BIN := $(VENV)/bin
STAMP := $(VENV)/.installed

.PHONY: demo test lint bench clean

$(BIN)/python:
	$(PY) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip

$(STAMP): pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e ".[test]"
	touch $(STAMP)

demo: $(STAMP)
	$(BIN)/wallsched design sample_site/site.toml --out sample_site/out --replace
	$(BIN)/wallsched design sample_site/site-rev2.toml --out sample_site/out-rev2 --replace \
		--compare sample_site/out

test: $(STAMP)
	$(BIN)/ruff check .
	$(BIN)/pytest

bench: $(STAMP)
	$(BIN)/python tests/benchmarks/bench_engine.py --stations 100000

clean:
	rm -rf sample_site/out sample_site/out.prev .pytest_cache
