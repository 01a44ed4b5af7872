# Two entry points for a fresh machine: `make demo` (the review app on demo_docs/) and `make test`.
PYTHON ?= python3.11
VENV := .venv
BIN := $(VENV)/bin
STAMP := $(VENV)/.installed
# The CPU build of torch lies on local disk on our machines; elsewhere pip uses its usual index.
FIND_LINKS := $(if $(wildcard /opt/wheels),--find-links /opt/wheels,)

.PHONY: setup demo test ask bench clean

$(STAMP): pyproject.toml
	test -x $(BIN)/python || $(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip
	# torch==2.13.0 is pinned: the CPU build (a plain `torch` would pull a multi-GB CUDA build).
	$(BIN)/python -m pip install --quiet $(FIND_LINKS) -e '.[test]'
	touch $(STAMP)

setup: $(STAMP)

demo: $(STAMP)
	$(BIN)/excerptor demo_docs

ask: $(STAMP)
	$(BIN)/excerptor ask demo_docs "Which law governs the land lease?"

test: $(STAMP)
	$(BIN)/python -m pytest -q

bench: $(STAMP)
	$(BIN)/python bench/bench_scale.py --sizes 100 1000 --reader

clean:
	rm -rf $(VENV) demo_docs/.excerptor
