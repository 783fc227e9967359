# finkit: one entry point for set-up, tests, demo and benchmarks.
# Every target creates the local virtual environment and installs finkit into it first,
# so a fresh machine with Python 3.11+ and pip needs nothing else.

PYTHON ?= python3
VENV   := .venv
BIN    := $(VENV)/bin
STAMP  := $(VENV)/.finkit-installed

.PHONY: setup test test-fast lint demo bench lab clean

$(STAMP): pyproject.toml
	$(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip
	$(BIN)/python -m pip install --quiet -e ".[test,distributed]"
	$(BIN)/python -m finkit.notes --ensure-kernel
	touch $(STAMP)

# Byte-compiled once here (cheap when up to date): with PYTHONDONTWRITEBYTECODE set, as on some
# machines, every command would otherwise compile finkit again (about 0.1 s of each check).
setup: $(STAMP)
	@$(BIN)/python -m compileall -q -x "finkit/data/" finkit > /dev/null

lint: setup
	$(BIN)/ruff format --check finkit tests bench
	$(BIN)/ruff check finkit tests bench
	$(BIN)/lint-imports

test: setup lint
	bash .ci/ensure_chromium.sh
	$(BIN)/python -m pytest

test-fast: setup
	$(BIN)/python -m pytest -q -m "not slow" -n auto

demo: setup
	$(BIN)/python -m finkit.demo

bench: setup
	$(BIN)/python bench/run_all.py

lab: setup
	$(BIN)/python -m finkit.cli lab

clean:
	rm -rf $(VENV) demo_out .pytest_cache .ruff_cache
