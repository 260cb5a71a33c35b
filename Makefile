# make demo: run claimcheck on every example claim.  make test: run the test suite.
# Both create .venv when missing and install everything from PyPI into it.
PYTHON ?= python3
VENV := .venv
BIN := $(VENV)/bin
STAMP := $(VENV)/.installed

.PHONY: demo test bench clean

$(BIN)/python:
	$(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip setuptools wheel

$(STAMP): $(BIN)/python pyproject.toml
	$(BIN)/python -m pip install --quiet -e '.[test,parquet]'
	touch $(STAMP)

demo: $(STAMP)
	@for f in claims_examples/*.yaml claims_examples/*.json; do \
	  [ -f "$$f" ] || continue; \
	  printf '%-48s ' "$$f"; \
	  $(BIN)/claimcheck check "$$f" --verdict-only; \
	  status=$$?; [ $$status -le 1 ] || exit $$status; \
	done

test: $(STAMP)
	$(BIN)/python -m pytest

bench: $(STAMP)
	$(BIN)/python benchmarks/run_all.py

clean:
	rm -rf $(VENV) build *.egg-info
