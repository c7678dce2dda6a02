"""What an invalid catalogue file reports: every problem, each naming species and field."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Problem:
    """One thing wrong with a catalogue file.

    ``species`` is the species' name, ``species[N]`` (position in the list,
    counting from 0) when the entry has no usable name, or None for a problem
    of the file as a whole.  ``field`` is a dotted path inside the species
    entry (``states[1].constants_mhz.B``) or a top-level key (``version``).
    """

    species: str | None
    field: str
    message: str

    def __str__(self) -> str:
        where = f"species {self.species}" if self.species is not None else "file"
        return f"{where}, field {self.field}: {self.message}"


class CatalogueError(ValueError):
    """A catalogue file (or data meant for one) is invalid; nothing was read or written.

    ``problems`` lists every problem found; ``path`` is the file, when there is one.
    """

    def __init__(self, problems: list[Problem], path: str | None = None):
        self.problems = list(problems)
        self.path = path
        super().__init__(str(self))

    def __str__(self) -> str:
        return "\n".join(str(problem) for problem in self.problems)
