"""The code fingerprint in the cache key prefix: a changed program never reads an older one's cached numbers."""

from __future__ import annotations

from django.conf import settings

from planner.envconfig import code_fingerprint


def _package(tmp_path, text: str):
    (tmp_path / "engine").mkdir(exist_ok=True)
    (tmp_path / "engine" / "levels.py").write_text(text)
    (tmp_path / "notes.txt").write_text("not code")
    return tmp_path


def test_the_fingerprint_follows_the_code_and_nothing_else(tmp_path):
    first = code_fingerprint(_package(tmp_path, "X = 1\n"))
    assert code_fingerprint(tmp_path) == first  # the same files give the same fingerprint
    (tmp_path / "notes.txt").write_text("other text")
    assert code_fingerprint(tmp_path) == first  # only Python files count
    _package(tmp_path, "X = 2\n")
    assert code_fingerprint(tmp_path) != first


def test_the_cache_key_prefix_carries_this_code_fingerprint():
    assert settings.CACHES["default"]["KEY_PREFIX"].endswith("-" + settings.CODE_FINGERPRINT)
    assert len(settings.CODE_FINGERPRINT) == 12
