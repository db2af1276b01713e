# The whole set-up on a fresh machine with only python3 and make:
#   make dashboard   serve the matchup explorer on the invented demo league
#   make test        install with the test extra and run the whole suite
#   make bench       run the benchmarks (times and ratios against named baselines)

PYTHON ?= python3
VENV ?= .venv
PY := $(VENV)/bin/python
PORT ?= 8866
DEMO := demo_data/plate_appearances.parquet

.PHONY: dashboard test bench install install-test demo clean

$(PY):
	$(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip

$(VENV)/.installed: pyproject.toml | $(PY)
	$(PY) -m pip install --quiet -e .
	touch $@

$(VENV)/.installed-test: pyproject.toml | $(PY)
	$(PY) -m pip install --quiet -e '.[test]'
	touch $(VENV)/.installed $@

install: $(VENV)/.installed
install-test: $(VENV)/.installed-test

$(DEMO): | $(VENV)/.installed
	$(VENV)/bin/matchup-widgets demo-data --out demo_data

demo: $(DEMO)

dashboard: $(VENV)/.installed $(DEMO)
	$(VENV)/bin/matchup-widgets dashboard --data $(DEMO) --port $(PORT)

test: $(VENV)/.installed-test
	$(PY) -m pytest

bench: $(VENV)/.installed-test
	$(PY) -m benchmarks

clean:
	rm -rf $(VENV) .pytest_cache build *.egg-info
