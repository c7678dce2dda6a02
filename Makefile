# Everything a fresh clone needs: `make run` or `make test` creates the venv,
# installs requirements.txt (again whenever it changes) and migrates.
PYTHON ?= python3.11
VENV := .venv
BIN := $(VENV)/bin
STAMP := $(VENV)/.requirements-installed
# The engine solves many small matrices: OpenBLAS's own threads only wait for each other there
# (3-6x slower eigen-solves measured with several processes on the 2-core machine). Override to taste.
export OPENBLAS_NUM_THREADS ?= 1

.PHONY: run test lint bench load migrate setup fuzz

$(BIN)/python:
	$(PYTHON) -m venv $(VENV)

# The stamp is newer than requirements.txt once they are installed.
$(STAMP): requirements.txt | $(BIN)/python
	$(BIN)/python -m pip install --quiet --upgrade pip
	$(BIN)/python -m pip install --quiet -r requirements.txt
	touch $(STAMP)

setup: $(STAMP)

migrate: setup
	$(BIN)/python manage.py migrate --no-input

# An empty catalogue gets the demo species and the demo account (its password is printed).
run: migrate
	$(BIN)/python manage.py load_demo --if-empty
	$(BIN)/python manage.py runserver 127.0.0.1:8000

test: migrate
	$(BIN)/python -m pytest

lint: setup
	$(BIN)/ruff check .
	$(BIN)/ruff format --check .

bench: migrate
	$(BIN)/python -m planner.engine.benchmark
	$(BIN)/python manage.py bench_plan

# 20 clients, 2000 requests against a temporary production server (gunicorn on a free 127.0.0.1 port,
# its own SQLite file and static files, removed afterwards); prints the figures, fails on any error.
load: setup
	$(BIN)/python manage.py load_test

# A longer schemathesis run of the whole API against a live test server (FUZZ_EXAMPLES per operation and phase).
FUZZ_EXAMPLES ?= 100
fuzz: migrate
	LINECAST_FUZZ_EXAMPLES=$(FUZZ_EXAMPLES) $(BIN)/python -m pytest tests/api/test_fuzz.py -q
