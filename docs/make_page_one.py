"""Redraw docs/images/page-one.png: page 1 of the sample pre-list worksheet, kept small.

Run from the repository:  python docs/make_page_one.py
Needs `pdftoppm` (poppler-utils) on the PATH. The README and docs/room-file.md show the
image; run this again whenever the worksheet's first page changes.
"""

from __future__ import annotations

import shutil
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SAMPLE = ROOT / "sample_rooms" / "day-surgery-head-neck.yaml"
IMAGE = ROOT / "docs" / "images" / "page-one.png"
RESOLUTION = 60  # dots per inch: small enough for the repository, legible on screen


def main() -> int:
    if shutil.which("pdftoppm") is None:
        print("pdftoppm not found: install poppler-utils", file=sys.stderr)
        return 2
    from ignite import pipeline

    with tempfile.TemporaryDirectory() as temp:
        pdf = Path(temp) / "sample.pdf"
        pipeline.write_room_worksheet(SAMPLE, pipeline.open_rulebook(), pdf, force=True)
        stem = Path(temp) / "page"
        subprocess.run(
            [
                "pdftoppm",
                "-png",
                "-r",
                str(RESOLUTION),
                "-f",
                "1",
                "-l",
                "1",
                "-singlefile",
                str(pdf),
                str(stem),
            ],
            check=True,
        )
        IMAGE.parent.mkdir(parents=True, exist_ok=True)
        shutil.copyfile(stem.with_suffix(".png"), IMAGE)
    print(f"{IMAGE.relative_to(ROOT)}: {IMAGE.stat().st_size // 1024} KiB")
    return 0


if __name__ == "__main__":
    sys.exit(main())
