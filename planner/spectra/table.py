"""Turn prediction records into the page's table: which columns, how each number reads.

Only presentation lives here (labels, digits, blanks); the numbers themselves
come unchanged from the engine's records.
"""

from __future__ import annotations

from dataclasses import dataclass

from planner.engine import Species

#: Rows shown on the page; the downloads always hold every line.
TABLE_ROW_LIMIT = 500

#: Quantum-number labels by rotor kind.  Symmetric tops keep K in the ka_* columns.
QUANTUM_LABELS = {
    "linear": ("J",),
    "symmetric-prolate": ("J", "K"),
    "symmetric-oblate": ("J", "K"),
    "asymmetric": ("J", "Ka", "Kc"),
}
_QUANTUM_SUFFIXES = ("j", "ka", "kc")
#: Four decimals while that keeps three significant digits, scientific below:
#: line strengths of weak components would otherwise all read 0.0000.
FIXED_OR_SCIENTIFIC = "fixed-or-scientific"


@dataclass(frozen=True)
class Column:
    key: str
    label: str
    number_format: str = ""  # format spec for numbers; "" shows the value as it is
    group: str = ""  # "upper"/"lower" for quantum numbers, "" otherwise

    @property
    def css_class(self) -> str:
        kind = "num" if self.number_format else "text"
        return f"{kind} qn qn-{self.group}" if self.group else kind


@dataclass(frozen=True)
class LineTableView:
    columns: list[Column]
    rows: list[list[tuple[str, str]]]  # (text, css class) per cell
    total_lines: int

    @property
    def truncated(self) -> bool:
        return self.total_lines > len(self.rows)

    @property
    def quantum_span(self) -> int:
        """Columns under each of the 'Upper' and 'Lower' headings."""
        return sum(1 for column in self.columns if column.group == "upper")

    @property
    def trailing_span(self) -> int:
        """Columns after the quantum numbers (the two before them are frequency and σ)."""
        return len(self.columns) - 2 - 2 * self.quantum_span


def table_columns(species: Species) -> list[Column]:
    """Columns for this species: J Ka Kc, J K or J alone, state only when there are several."""
    labels = QUANTUM_LABELS[species.rotor]
    columns = [
        Column("frequency_mhz", "Frequency [MHz]", ".4f"),
        Column("sigma_mhz", "σ [MHz]", ".4f"),
    ]
    for group, suffix in (("upper", "up"), ("lower", "lo")):
        columns += [Column(f"{prefix}_{suffix}", label, "d", group) for prefix, label in zip(_QUANTUM_SUFFIXES, labels)]
    if species.rotor == "asymmetric":
        columns.append(Column("dipole_type", "Type"))
    if len(species.states) > 1:
        columns.append(Column("state", "State"))
    columns += [
        Column("el_cm1", "E_l [cm⁻¹]", ".4f"),
        Column("eu_k", "E_u [K]", ".2f"),
        Column("s_mu2_d2", "Sμ² [D²]", FIXED_OR_SCIENTIFIC),
        Column("einstein_a_s", "A [s⁻¹]", ".3e"),
        Column("intensity_nm2mhz", "Intensity [nm² MHz]", ".3e"),
    ]
    return columns


def format_cell(value, number_format: str) -> str:
    """One cell's text: blank for None (undefined), the number in its format otherwise."""
    if value is None:
        return ""
    if number_format == FIXED_OR_SCIENTIFIC and isinstance(value, int | float):
        return format(value, ".4f" if value == 0 or abs(value) >= 0.1 else ".3e")
    if number_format and isinstance(value, int | float):
        return format(value, number_format)
    return str(value)


def line_table(species: Species, records: list[dict], limit: int | None = None) -> LineTableView:
    """The first ``limit`` records (default TABLE_ROW_LIMIT; frequency order) as rows of display text."""
    limit = TABLE_ROW_LIMIT if limit is None else limit
    columns = table_columns(species)
    rows = [[(format_cell(record[c.key], c.number_format), c.css_class) for c in columns] for record in records[:limit]]
    return LineTableView(columns=columns, rows=rows, total_lines=len(records))
