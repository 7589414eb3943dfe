# Plumbline — the two commands of the quick start are `make demo` and `make test`.
PYTHON ?= python3
VENV   ?= .venv
BIN    := $(VENV)/bin
DEMO   := sample_requests/bus-cooperative-monthly.json

.PHONY: demo test quick lint unit serve schema docs bench load soak clean pack-quality

$(BIN)/python:
	$(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip

$(VENV)/.installed: pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e .
	@touch $@

$(VENV)/.installed-test: pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e '.[test]'
	@touch $@ $(VENV)/.installed

demo: $(VENV)/.installed
	@mkdir -p out
	$(BIN)/plumbline render $(DEMO) -o out/bus-cooperative-monthly.pdf
	$(BIN)/plumbline walkthrough $(DEMO) -o out/bus-cooperative-monthly-sealed.pdf

lint: $(VENV)/.installed-test
	$(BIN)/ruff check service tests bench
	$(BIN)/ruff format --check service tests bench
	$(BIN)/mypy

unit: $(VENV)/.installed-test
	$(BIN)/python -m pytest

test: lint unit

# the tests not marked slow (no fuzzing, faults, browser, queue, benchmark or server-per-test runs)
quick: $(VENV)/.installed-test
	$(BIN)/python -m pytest -m "not slow"

# figures of how publishable the demo's and the generated gallery's drafts are (tests/quality/)
pack-quality: $(VENV)/.installed-test
	$(BIN)/python -m tests.quality.pack_quality

serve: $(VENV)/.installed
	$(BIN)/plumbline serve

schema: $(VENV)/.installed
	$(BIN)/plumbline schema

bench: $(VENV)/.installed
	$(BIN)/python -m bench --out out/bench

load: $(VENV)/.installed
	$(BIN)/python -m bench.load --clients 50 --seconds 60 --out out/bench

soak: $(VENV)/.installed
	$(BIN)/python -m bench.load --soak --duration 600 --rate 2 --out out/bench

docs: $(VENV)/.installed
	@mkdir -p docs
	$(BIN)/plumbline checks --markdown > docs/checks.md

clean:
	rm -rf $(VENV) out .pytest_cache .mypy_cache .ruff_cache
