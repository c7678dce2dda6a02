"""The format document's example is a valid catalogue and its error examples match the reader."""

import json
import re
from pathlib import Path

from planner.catalogue_file import parse_catalogue
from planner.engine.species import (
    A_REDUCTION_PARAMETERS,
    LINEAR_PARAMETERS,
    OBLATE_PARAMETERS,
    PROLATE_PARAMETERS,
    S_REDUCTION_PARAMETERS,
)

DOC = Path(__file__).resolve().parents[2] / "docs" / "catalogue-format.md"


def test_the_complete_example_is_a_valid_catalogue():
    blocks = re.findall(r"```json\n(.*?)```", DOC.read_text(encoding="utf-8"), flags=re.S)
    example = max(blocks, key=len)

    species = parse_catalogue(json.loads(example))

    assert [s.name for s in species] == ["SO2"]
    assert species[0].states[0].value("DeltaK") == 2.5897


def test_every_parameter_name_of_the_engine_is_documented():
    text = DOC.read_text(encoding="utf-8")
    names = {
        *LINEAR_PARAMETERS,
        *PROLATE_PARAMETERS,
        *OBLATE_PARAMETERS,
        *A_REDUCTION_PARAMETERS,
        *S_REDUCTION_PARAMETERS,
    }
    assert [name for name in sorted(names) if f"`{name}`" not in text] == []
