"""Read a catalogue file: all of its species, or a CatalogueError listing every problem.

The reader is all-or-nothing: it never returns part of a file.
"""

from __future__ import annotations

import json
import os

from planner.engine.species import Species

from .keys import FILE_KEYS, FORMAT_NAME, FORMAT_VERSION
from .problems import CatalogueError, Problem
from .species_entry import Report, check_keys, json_type, parse_species


class _JsonObject(dict):
    """A JSON object that remembers the keys it was given more than once."""

    duplicate_keys: tuple[str, ...] = ()


def _json_object(pairs: list[tuple[str, object]]) -> _JsonObject:
    obj = _JsonObject(pairs)
    names = [name for name, _ in pairs]
    obj.duplicate_keys = tuple(sorted({name for name in names if names.count(name) > 1}))
    return obj


def load_catalogue(path: str | os.PathLike) -> list[Species]:
    """Every species of the catalogue file at ``path``; CatalogueError if the file is invalid."""
    try:
        with open(path, "rb") as file:
            content = file.read()
    except FileNotFoundError:
        raise CatalogueError([Problem(None, "file", f"{os.fspath(path)}: no such file")], os.fspath(path)) from None
    except OSError as error:
        problem = Problem(None, "file", f"{os.fspath(path)}: cannot be read ({error.strerror})")
        raise CatalogueError([problem], os.fspath(path)) from None
    try:
        return parse_catalogue_bytes(content)
    except CatalogueError as error:
        raise CatalogueError(error.problems, os.fspath(path)) from None


def parse_catalogue_bytes(content: bytes) -> list[Species]:
    """Every species of a catalogue file's content (UTF-8 JSON); CatalogueError listing all problems."""
    try:
        text = content.decode("utf-8")
    except UnicodeDecodeError as error:
        raise CatalogueError([Problem(None, "file", f"is not UTF-8 text (byte {error.start})")]) from None
    try:
        data = json.loads(text, object_pairs_hook=_json_object)
    except json.JSONDecodeError as error:
        problem = Problem(None, "file", f"is not valid JSON: {error.msg} at line {error.lineno}, column {error.colno}")
        raise CatalogueError([problem]) from None
    except RecursionError:
        raise CatalogueError([Problem(None, "file", "is nested too deeply to be a catalogue")]) from None
    return parse_catalogue(data)


def parse_catalogue(data: dict) -> list[Species]:
    """Every species of an already decoded catalogue file; CatalogueError listing all problems."""
    if not isinstance(data, dict):
        raise CatalogueError([Problem(None, "file", f"must hold one JSON object, got {json_type(data)}")])
    report = Report(None)
    check_keys(report, data, FILE_KEYS, "")
    if data.get("format") != FORMAT_NAME:
        found = json_type(data["format"]) if "format" in data else "nothing"
        report.add("format", f"must be {FORMAT_NAME!r}, got {found}: this is not a catalogue file")
    version = data.get("version")
    if "version" not in data:
        report.add("version", f"is required (this reader reads version {FORMAT_VERSION})")
    elif version != FORMAT_VERSION or isinstance(version, bool):
        report.add("version", f"{json_type(version)} is not supported; this reader reads version {FORMAT_VERSION}")
    entries = data.get("species")
    if not isinstance(entries, list):
        found = json_type(entries) if "species" in data else "nothing"
        report.add("species", f"must be a list of species, got {found}")
        entries = []
    problems = list(report.problems)
    if any(problem.field in ("format", "version") for problem in problems):
        raise CatalogueError(problems)  # not a file of this format: its entries would only give noise
    species_list = []
    first_use: dict[str, int] = {}
    for index, entry in enumerate(entries):
        label = _label(entry, index)
        species, entry_problems = parse_species(entry, label)
        problems += entry_problems
        species_list.append(species)
        if label in first_use:
            message = f"is already used by species[{first_use[label]}]; names must be unique"
            problems.append(Problem(label, "name", message))
        else:
            first_use[label] = index
    if problems:
        raise CatalogueError(problems)
    return species_list


def _label(entry, index: int) -> str:
    """How problems name a species: its name, or its position when it has no usable name."""
    name = entry.get("name") if isinstance(entry, dict) else None
    return name if isinstance(name, str) and name.strip() else f"species[{index}]"
