"""Demo scripts shipped with gacalc (``gacalc --demo`` runs them in this order)."""

from __future__ import annotations

from pathlib import Path

from gacalc.textfiles import open_script

DEMO_ORDER = ("periscope", "retroreflector", "gimbal", "spin")
EXAMPLES_DIR = Path(__file__).resolve().parent


def example_paths() -> list[Path]:
    """Every shipped ``.gac`` file: the demos in DEMO_ORDER first, then any others."""
    found = {path.stem: path for path in EXAMPLES_DIR.glob("*.gac")}
    ordered = [found.pop(name) for name in DEMO_ORDER if name in found]
    return ordered + sorted(found.values())


def demo_path(name: str) -> Path | None:
    """The shipped script called ``name`` (with or without ``.gac``), or None."""
    stem = name[:-4] if name.endswith(".gac") else name
    path = EXAMPLES_DIR / f"{stem}.gac"
    return path if path.is_file() else None


def summary_of(path: Path) -> str:
    """The first comment line of a script, without the '#': what the demo shows."""
    with open_script(path) as handle:
        for line in handle:
            line = line.strip()
            if line.startswith("#"):
                return line.lstrip("#").strip()
            if line:
                break
    return ""
