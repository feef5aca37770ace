"""Coverage-guided fuzzing of the bridge language (tables and bridge descriptions) with atheris.

Not run in CI. Each input is written to a scratch folder next to a valid bridge
description (``drive.bridge``, a copy of samples/cart.bridge). The first byte picks
what the rest is: even, a table (``input.steps``) read with ``read_table``; odd, a
bridge description (``input.bridge``) that a fixed valid table includes. Anything
raised other than InputError/UsageError is a crash, and so is any warning, an error
message of more than one line, and an input that takes more than ``SLOW`` seconds.
Each distinct crash (exception type, message shape, innermost frame) is recorded
once in ``--out``/crashes with its input, and the campaign goes on.

    python fuzz/fuzz_table.py --minutes 5
    python fuzz/fuzz_table.py --replay fuzz/out-table/crashes
"""

from __future__ import annotations

import os
import shutil
import sys
import time
import warnings
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(HERE))

from _campaign import Campaign, run  # noqa: E402

SLOW = 2.0  # seconds one input may take
TABLE = b'include "input.bridge"\n0 mode coast\n+1us AL=on BL=on\n+2us AL=off\n+500ns AH=on\n'
SEEDS = [
    b'include "drive.bridge"\n0 AH=off AL=on\n+1us AL=off\n+500ns AH=on\nend +1us\n',
    b'include "drive.bridge"\n0 mode coast\nrepeat 3 every 50us {\n  0 AL=off\n  +750ns AH=on\n'
    b"  30us AH=off\n  +750ns AL=on\n}\n+10us mode brake\n",
    b"leg A high AH low AL\nactive-low AL\ndead-time 500ns\nmode on = A.high and not A.low\n"
    b"0 A.low=0\n+1us A.low=1 # off\n+0.5us mode on\n",
    b'include "drive.bridge"\nrepeat 2 {\n repeat 2 every 1us {\n  0 BL=on\n  +100ns BL=off\n }\n}\n',
]
BRIDGE_SEEDS = [
    b"leg A high AH low AL\nleg B high BH low BL\ndead-time B high-to-low 500ns low-to-high 600ns\n"
    b"mode coast = not (A.high or A.low or B.high or B.low)\nmode brake = A.low and B.low\n"
    b"allow brake -> * after 2us\nforbid coast -> coast\ndwell brake 1us\n",
    b"leg A high AH low AL\nleg B high BH low BL\nmode coast = not (AH or AL or BH or BL)\n"
    b"mode brake = AL and BL\ntiming A driver-delay 20ns to 45ns rise 8ns fall 35ns\n"
    b"bootstrap A capacitance 100nF gate-charge 54nC leakage 115uA supply 12V diode-drop 0.85V "
    b"min-vgs 6V resistance 10ohm\nscheme sign-magnitude\n",
]

CAMPAIGN = Campaign(HERE / "out-table")
_folder = ""


def test_one_input(data: bytes) -> None:
    from sequencecheck.errors import InputError, UsageError
    from sequencecheck.language import read_table

    CAMPAIGN.stats["inputs"] += 1
    flag, body = (data[0], data[1:]) if data else (0, b"")
    table = os.path.join(_folder, "input.steps")
    with open(os.path.join(_folder, "input.bridge"), "wb") as f:
        f.write(body if flag & 1 else b"")
    with open(table, "wb") as f:
        f.write(TABLE if flag & 1 else body)
    started = time.monotonic()
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        try:
            read_table(table)
            CAMPAIGN.stats["read"] += 1
        except InputError as e:
            CAMPAIGN.stats["input_errors"] += 1
            if "\n" in str(e):
                CAMPAIGN.record(AssertionError(f"multi-line error: {e!s}"), data)
        except UsageError:
            CAMPAIGN.stats["usage_errors"] += 1
        except Exception as e:  # every other exception is a crash
            CAMPAIGN.record(e, data)
    took = time.monotonic() - started
    CAMPAIGN.stats["slowest_ms"] = max(CAMPAIGN.stats["slowest_ms"], int(took * 1000))
    if took > SLOW:
        CAMPAIGN.record(AssertionError(f"slow input: {took:.1f} s"), data)
    for w in caught:
        CAMPAIGN.record(AssertionError(f"{w.category.__name__}: {w.message}"), data)
    CAMPAIGN.tick()


def _prepare(folder: str) -> None:
    global _folder
    _folder = folder
    shutil.copy(ROOT / "samples" / "cart.bridge", os.path.join(folder, "drive.bridge"))


def _instrument() -> None:
    import lark  # noqa: F401

    import sequencecheck.language._loader
    import sequencecheck.language._statements  # noqa: F401


def _seed(corpus: Path) -> None:
    for i, seed in enumerate(SEEDS):
        (corpus / f"seed-table-{i}").write_bytes(b"\0" + seed)
    for i, seed in enumerate(BRIDGE_SEEDS):
        (corpus / f"seed-bridge-{i}").write_bytes(b"\1" + seed)
    for sample in sorted((ROOT / "samples").glob("*.steps")):
        text = sample.read_bytes().replace(b'"cart.bridge"', b'"drive.bridge"')
        (corpus / f"sample-{sample.stem}").write_bytes(b"\0" + text)
    (corpus / "sample-cart-bridge").write_bytes(
        b"\1" + (ROOT / "samples" / "cart.bridge").read_bytes()
    )


def main() -> None:
    run(
        CAMPAIGN,
        __doc__.splitlines()[0],
        minutes=5.0,
        out=HERE / "out-table",
        scratch_prefix="fuzz-table-",
        max_len=4096,
        prepare=_prepare,
        test_one_input=test_one_input,
        instrument=_instrument,
        seed=_seed,
    )


if __name__ == "__main__":
    main()
