# confspec: every target creates .venv and installs what it needs, so a fresh clone works.
PYTHON ?= python3
VENV   := .venv
PY     := $(VENV)/bin/python
PIP    := $(PY) -m pip --disable-pip-version-check -q

.PHONY: test test-quick demo bench docs lint typecheck clean

$(PY):
	$(PYTHON) -m venv $(VENV)

# Installs are stamped by the pyproject they came from, so an edit re-installs.
$(VENV)/.dev-installed: pyproject.toml | $(PY)
	$(PIP) install -e ".[dev,tables,sql,dask,docs,scf]"
	touch $@

$(VENV)/.demo-installed: pyproject.toml | $(PY)
	$(PIP) install -e ".[tables]"
	touch $@

# The import contract (layers, no cycles between packages, private names stay private) is a
# test that also sees imports made inside functions; lint runs it.
lint: $(VENV)/.dev-installed
	$(PY) -m ruff check confspec _confspec_launch.py tests benchmarks examples scripts
	$(PY) -m pytest -q -p no:cacheprovider tests/test_architecture.py

typecheck: $(VENV)/.dev-installed
	$(PY) -m mypy --strict confspec _confspec_launch.py

# PostgreSQL tests: scripts/postgres-up.sh starts a local server (127.0.0.1 only) and prints
# its URL, or "unavailable: <reason>", which the tests show when they skip.
test: lint typecheck
	@url=$$(bash scripts/postgres-up.sh); \
	case "$$url" in postgresql*) echo "PostgreSQL for the tests at $${url##*@}";; \
	  *) echo "PostgreSQL tests will be skipped: $$url";; esac; \
	CONFSPEC_TEST_POSTGRES_URL="$${CONFSPEC_TEST_POSTGRES_URL:-$$url}" $(PY) -m pytest

# The same without the tests marked slow (wheel build, subprocesses, worker pools, the Dask
# cluster). No PostgreSQL server is started: those tests run only when
# CONFSPEC_TEST_POSTGRES_URL is already set, and are skipped (with the reason) otherwise.
test-quick: lint typecheck
	$(PY) -m pytest -m "not slow"

demo: $(VENV)/.demo-installed
	$(PY) examples/demo.py

bench: $(VENV)/.dev-installed
	$(PY) benchmarks/bench_parse.py
	$(PY) benchmarks/bench_cli.py
	$(PY) benchmarks/bench_scf.py

docs: $(VENV)/.dev-installed
	MPLBACKEND=Agg $(PY) scripts/make_figures.py
	NO_MKDOCS_2_WARNING=1 $(PY) -m mkdocs build --strict

clean:
	rm -rf $(VENV) site build dist .pytest_cache .mypy_cache .ruff_cache .hypothesis
