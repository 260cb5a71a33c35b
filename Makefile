# make demo: run claimcheck on every example claim.  make test: run the test suite.
# make search: the property tests with fresh random examples (local use).
# Both create .venv when missing and install everything from PyPI into it.
PYTHON ?= python3
VENV := .venv
BIN := $(VENV)/bin
STAMP := $(VENV)/.installed

.PHONY: demo test search bench clean

$(BIN)/python:
	$(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip setuptools wheel

$(STAMP): $(BIN)/python pyproject.toml
	$(BIN)/python -m pip install --quiet -e '.[test,parquet]'
	touch $(STAMP)

demo: $(STAMP)
	@echo "== every example claim (claims_examples/README.md says what each should give)"
	@for f in claims_examples/*.yaml claims_examples/*.json; do \
	  [ -f "$$f" ] || continue; \
	  printf '%-50s ' "$$f"; \
	  $(BIN)/claimcheck check "$$f" --verdict-only; \
	  status=$$?; [ $$status -le 1 ] || exit $$status; \
	done
	@echo; echo "== one claim in full"
	@$(BIN)/claimcheck check claims_examples/log_xeb_sidedness.yaml --markdown .demo-notes.md --plain-text .demo-notes.txt --html .demo-report.html; \
	  [ $$? -le 1 ] && echo "(referee notes in .demo-notes.md, as plain text in .demo-notes.txt, HTML report in .demo-report.html)"
	@echo; echo "== a table of claims (invented survey)"
	@$(BIN)/claimcheck batch claims_examples/survey_table.csv; [ $$? -le 2 ]
	@echo; echo "== simulated raw data with known truth F = 0.6 (12 qubits, 8 random circuits)"
	@$(BIN)/claimcheck simulate --qubits 12 --circuits 8 --samples 500 --fidelity 0.6 --model circuit --seed 7 --out .demo-sim.csv
	@$(BIN)/claimcheck raw .demo-sim.csv --claim claims_examples/simulated_raw_lattice.yaml --bootstrap 2000 --html .demo-raw.html; [ $$? -le 1 ]
	@echo; echo "== planning: samples for 3 sigma at power 0.8"
	@$(BIN)/claimcheck plan --metric linear-xeb --estimate 2e-3 --threshold 1e-3 --required-sigma 3 --syst-error 3e-4

test: $(STAMP)
	$(BIN)/python -m pytest

# The property tests with fresh random draws (make test always draws the same ones).
search: $(STAMP)
	CLAIMCHECK_HYPOTHESIS=explore $(BIN)/python -m pytest tests -q

bench: $(STAMP)
	$(BIN)/python benchmarks/run_all.py

clean:
	rm -rf $(VENV) build *.egg-info
