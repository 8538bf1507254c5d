# groundkit set-up and checks. Every target creates .venv and installs what it needs.
PYTHON ?= python3
VENV := .venv
BIN := $(VENV)/bin
STAMP := $(VENV)/.installed

.PHONY: demo test lint bench clean docs

$(STAMP): setup.cfg pyproject.toml
	$(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip
	$(BIN)/python -m pip install --quiet -e ".[notebook,distributed,test]"
	touch $(STAMP)

demo: $(STAMP)
	$(BIN)/python -m groundkit.demo

lint: $(STAMP)
	$(BIN)/ruff check groundkit tests benchmarks

test: $(STAMP) lint
	$(BIN)/python -m pytest -q

docs: $(STAMP)
	$(BIN)/python docs/make_api.py

bench: $(STAMP)
	@for f in benchmarks/*.py; do echo "== $$f"; $(BIN)/python $$f || exit 1; done

clean:
	rm -rf $(VENV) build *.egg-info .pytest_cache
