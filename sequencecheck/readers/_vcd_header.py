"""The declaration part of an IEEE 1364 value change dump: timescale, scopes, variables.

``read_header`` reads up to ``$enddefinitions $end`` and returns a :class:`VcdHeader`;
``select`` turns channel names (``ha``, ``top.driver.ha``, ``bus[3]``) into bit
selections of declared variables.
"""

from __future__ import annotations

import re
from collections.abc import Iterator, Sequence
from dataclasses import dataclass, field
from fractions import Fraction

from ..errors import InputError

__all__ = ["BitSelect", "VcdHeader", "VcdVar", "read_header", "select"]

#: Picoseconds per unit of a $timescale (fs is a fraction of a picosecond).
_UNIT_PS = {
    "s": Fraction(10**12),
    "ms": Fraction(10**9),
    "us": Fraction(10**6),
    "ns": Fraction(10**3),
    "ps": Fraction(1),
    "fs": Fraction(1, 1000),
}
_TIMESCALE = re.compile(r"^(1|10|100)\s*(s|ms|us|ns|ps|fs)$")
_REF_RANGE = re.compile(r"^(.+?)\[(-?[0-9]{1,18})(?::(-?[0-9]{1,18}))?\]$")
_SELECT = re.compile(r"^(?P<base>.*?)\s*\[\s*(?P<bit>-?[0-9]{1,18})\s*\]$")
_SKIPPED = {"$date", "$version", "$comment"}
_HEAD_BLOCK = 1 << 16
_BOM = b"\xef\xbb\xbf"
_MAX_WIDTH_DIGITS = 18  #: a wider $var than 10**18 bits cannot be real


@dataclass(frozen=True, slots=True)
class VcdVar:
    """One ``$var``: type, width, identifier code, name and where it was declared."""

    kind: str
    width: int
    code: str
    ref: str
    scope: tuple[str, ...]
    msb: int
    lsb: int
    line: int
    ranged: bool = False  #: declared with an explicit [msb:lsb] or [bit]

    @property
    def full_name(self) -> str:
        return ".".join((*self.scope, self.ref))

    def offset_of(self, bit: int) -> int | None:
        """Position of ``bit`` counted from the leftmost (most significant) digit."""
        lo, hi = min(self.msb, self.lsb), max(self.msb, self.lsb)
        if not lo <= bit <= hi:
            return None
        return self.msb - bit if self.msb >= self.lsb else bit - self.msb


@dataclass(frozen=True, slots=True)
class BitSelect:
    """A channel: one bit of the variable(s) behind identifier ``code``."""

    name: str
    code: str
    width: int
    offset: int  # from the leftmost digit; 0 for a scalar


@dataclass
class VcdHeader:
    """What the declarations say, and where the value changes begin."""

    ps_per_tick: Fraction = Fraction(10**12)
    timescale: str | None = None
    variables: list[VcdVar] = field(default_factory=list)
    body_offset: int = 0  # byte offset just after ``$enddefinitions $end``
    body_line: int = 1  # line number at body_offset

    def codes(self) -> dict[str, VcdVar]:
        """Identifier code -> first variable declared with it."""
        out: dict[str, VcdVar] = {}
        for v in self.variables:
            out.setdefault(v.code, v)
        return out


def _tokens(text: str, line: int) -> Iterator[tuple[str, int]]:
    for m in re.finditer(r"\S+|\n", text):
        tok = m.group()
        if tok == "\n":
            line += 1
        else:
            yield tok, line


def _read_head_text(path: str) -> tuple[str, int]:
    """The file's text up to and including ``$enddefinitions ... $end``, and its byte size."""
    pieces: list[bytes] = []
    with open(path, "rb") as f:
        while True:
            block = f.read(_HEAD_BLOCK)
            pieces.append(block)
            data = b"".join(pieces)
            i = data.find(b"$enddefinitions")
            if i >= 0:
                j = data.find(b"$end", i + len(b"$enddefinitions"))
                while j >= 0 and data[j : j + 5].rstrip(b" \t\r\n") != b"$end":
                    j = data.find(b"$end", j + 4)
                if j >= 0:
                    data = data[: j + 4]
                    break
            if not block:
                break
            if len(data) > 64 * _HEAD_BLOCK and not data.lstrip(_BOM + b" \t\r\n").startswith(b"$"):
                break  # not a VCD: stop reading early, the parser below says why
    size = len(data)
    if data.startswith(_BOM):  # a UTF-8 byte-order mark: not part of the first keyword
        data = b" " * len(_BOM) + data[len(_BOM) :]
    return data.decode("latin-1"), size


def read_header(path: str) -> VcdHeader:
    """Parse the declarations; InputError (path:line) on anything not IEEE 1364 clause 18."""
    try:
        text, size = _read_head_text(path)
    except OSError:
        raise InputError("cannot be read (permission?)", path=path) from None
    head = VcdHeader(body_offset=size, body_line=1 + text.count("\n"))
    scope: list[str] = []
    toks = _tokens(text, 1)
    last_line = 1
    first_of_code: dict[str, VcdVar] = {}

    def section(keyword: str, line: int) -> list[tuple[str, int]]:
        body = []
        for tok, ln in toks:
            if tok == "$end":
                return body
            body.append((tok, ln))
        raise InputError(
            f"file ends inside {keyword} (truncated?); expected $end", path=path, line=line
        )

    for tok, line in toks:
        last_line = line
        if tok in _SKIPPED:
            section(tok, line)
        elif tok == "$timescale":
            words = " ".join(t for t, _ in section(tok, line))
            m = _TIMESCALE.match(words)
            if not m:
                raise InputError(
                    f"$timescale must be 1, 10 or 100 followed by s, ms, us, ns, ps or fs, "
                    f"not {words!r}",
                    path=path,
                    line=line,
                )
            head.ps_per_tick = int(m.group(1)) * _UNIT_PS[m.group(2)]
            head.timescale = f"{m.group(1)} {m.group(2)}"
        elif tok == "$scope":
            words = section(tok, line)
            if len(words) != 2:
                raise InputError("expected '$scope TYPE NAME $end'", path=path, line=line)
            scope.append(_utf8(words[1][0], "$scope name", path, line))
        elif tok == "$upscope":
            section(tok, line)
            if not scope:
                raise InputError("$upscope without a matching $scope", path=path, line=line)
            scope.pop()
        elif tok == "$var":
            var = _var(section(tok, line), tuple(scope), path, line)
            _same_width(var, first_of_code.setdefault(var.code, var), path)
            head.variables.append(var)
        elif tok == "$enddefinitions":
            section(tok, line)
            return head
        elif tok.startswith("$"):
            section(tok, line)  # a keyword this reader has no use for
        else:
            what = "a VCD header keyword such as $timescale, $scope or $var"
            raise InputError(
                f"expected {what}, found {tok[:40]!r}; is this a VCD file?", path=path, line=line
            )
    raise InputError(
        "file ends before '$enddefinitions $end' (truncated or not a VCD file?)",
        path=path,
        line=last_line,
    )


def _var(words: list[tuple[str, int]], scope: tuple[str, ...], path: str, line: int) -> VcdVar:
    if len(words) < 4:
        raise InputError("expected '$var TYPE SIZE ID NAME [range] $end'", path=path, line=line)
    kind, size, code = words[0][0], words[1][0], words[2][0]
    ref = _utf8("".join(t for t, _ in words[3:]), "$var name", path, line)
    digits = size.lstrip("0")
    if not (size.isascii() and size.isdigit()) or not digits:
        raise InputError(
            f"$var {ref}: width must be a whole number of bits >= 1, not {size!r}",
            path=path,
            line=line,
        )
    if len(digits) > _MAX_WIDTH_DIGITS:
        raise InputError(
            f"$var {ref}: width {size[:24]}... ({len(size)} digits) is too large; "
            "expected a whole number of bits",
            path=path,
            line=line,
        )
    width = int(digits)
    msb, lsb, ranged = width - 1, 0, False
    m = _REF_RANGE.match(ref)
    if m:
        ref, ranged = m.group(1), True
        msb = int(m.group(2))
        lsb = msb if m.group(3) is None else int(m.group(3))
        if abs(msb - lsb) + 1 != width and kind != "real":
            raise InputError(
                f"$var {ref}: width {width} does not match range [{m.group(2)}"
                f"{'' if m.group(3) is None else ':' + m.group(3)}]",
                path=path,
                line=line,
            )
    return VcdVar(kind, width, code, ref, scope, msb, lsb, line, ranged)


def _utf8(text: str, what: str, path: str, line: int) -> str:
    """``text`` (read as Latin-1, one character per byte) decoded as the UTF-8 it should be."""
    if text.isascii():
        return text
    raw = text.encode("latin-1")
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError as e:
        raise InputError(
            f"{what} {text[:40]!r} is not UTF-8 text (byte 0x{raw[e.start]:02x}); "
            "expected names in UTF-8",
            path=path,
            line=line,
        ) from None


def _same_width(var: VcdVar, first: VcdVar, path: str) -> None:
    """Refuse a second declaration of one identifier code with another width."""
    if var.width != first.width:
        raise InputError(
            f"$var {var.ref}: identifier code {var.code!r} is declared {var.width} bits wide "
            f"here but {first.width} bits wide at line {first.line}; expected the same width "
            "as the first declaration",
            path=path,
            line=var.line,
        )


def select(head: VcdHeader, names: Sequence[str] | None, path: str) -> list[BitSelect]:
    """Channels for ``names`` (default: every 1-bit variable, by name where unique)."""
    variables = [v for v in head.variables if v.kind != "real"]
    if names is None:
        by_ref: dict[str, int] = {}
        for v in variables:
            if v.width == 1:
                by_ref[v.ref] = by_ref.get(v.ref, 0) + 1
        out, seen = [], set()
        for v in variables:
            if v.width != 1:
                continue
            name = v.ref if by_ref[v.ref] == 1 else v.full_name
            if v.ranged and by_ref[v.ref] > 1:
                name = f"{v.ref}[{v.msb}]"
            if name not in seen:
                seen.add(name)
                out.append(BitSelect(name, v.code, 1, 0))
        return out
    return [_select_one(variables, head, name, path) for name in names]


def _select_one(variables: list[VcdVar], head: VcdHeader, name: str, path: str) -> BitSelect:
    m = _SELECT.match(name)
    base, bit = (m.group("base"), int(m.group("bit"))) if m else (name, None)
    for key in ("full_name", "ref"):
        found = [v for v in variables if getattr(v, key) == base]
        if bit is not None:
            found = [v for v in found if v.offset_of(bit) is not None]
        codes = {v.code for v in found}
        if len(codes) > 1:
            where = ", ".join(sorted({v.full_name for v in found}))
            raise InputError(
                f"channel {name!r} is ambiguous ({where}); use the full hierarchical name",
                path=path,
            )
        if found:
            v = found[0]
            if bit is None:
                if v.width != 1:
                    raise InputError(
                        f"channel {name!r} is {v.width} bits wide; select one bit, "
                        f"e.g. {name}[{v.lsb}]",
                        path=path,
                    )
                return BitSelect(name, v.code, 1, 0)
            return BitSelect(name, v.code, v.width, v.offset_of(bit) or 0)
    named = [v for v in head.variables if base in (v.full_name, v.ref)]
    if named and bit is not None and named[0].kind != "real":
        v = named[0]
        raise InputError(
            f"channel {name!r}: {v.full_name} has no bit {bit} (range [{v.msb}:{v.lsb}])",
            path=path,
        )
    if named:
        raise InputError(f"channel {name!r} is a real variable, not a logic level", path=path)
    known = ", ".join(v.full_name for v in head.variables[:12]) or "none"
    raise InputError(f"no variable {name!r} in the VCD (variables: {known})", path=path)
