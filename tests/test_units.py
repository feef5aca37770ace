import pytest

from sequencecheck.errors import UsageError
from sequencecheck.units import format_time, parse_duration


@pytest.mark.parametrize(
    ("text", "ps"),
    [
        ("500ns", 500_000),
        ("1.5us", 1_500_000),
        ("2e-6s", 2_000_000),
        ("0.25 ms", 250_000_000),
        ("40 ps", 40),
        ("1µs", 1_000_000),
        ("0", 0),
    ],
)
def test_parse_duration(text, ps):
    assert parse_duration(text) == ps


@pytest.mark.parametrize(
    "text",
    [
        "5OOns",
        "500",
        "1.5 parsecs",
        "0.5ps",
        "-3ns",
        "",
        "1e9000000ps",
        "1e-9000000s",
        "1" + "0" * 5000 + "ps",
        "1e30s",
    ],
)
def test_parse_duration_rejects(text):
    with pytest.raises(UsageError, match=r"duration|unit|resolution|negative|range"):
        parse_duration(text)


@pytest.mark.parametrize(
    ("ps", "text"),
    [
        (12_345_600_000, "12.345 600 ms"),
        (500_000, "500 ns"),
        (1, "1 ps"),
        (0, "0 s"),
        (-350_000, "-350 ns"),
        (1_180_150_000, "1.180 150 ms"),
        (3_000_000_000_000, "3 s"),
    ],
)
def test_format_time_is_exact(ps, text):
    assert format_time(ps) == text
