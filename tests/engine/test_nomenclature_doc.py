"""docs/nomenclature.md lists every line-list column the engine produces."""

from pathlib import Path

from planner.engine import LINE_COLUMNS

DOC = Path(__file__).resolve().parents[2] / "docs" / "nomenclature.md"


def test_every_line_column_is_documented():
    text = DOC.read_text(encoding="utf-8")
    missing = [name for name in LINE_COLUMNS if f"| `{name}` |" not in text]
    assert not missing, f"add these columns to docs/nomenclature.md: {missing}"
