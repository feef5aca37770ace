"""VCD reader: IEEE 1364 clause 18 details, channel selection, and bad input."""

from __future__ import annotations

import numpy as np
import pytest
from conftest import run_cli

import sequencecheck as sc
from sequencecheck.errors import InputError
from sequencecheck.model import Level
from sequencecheck.readers import read, read_vcd

HEAD = """$date invented bench run $end
$timescale {scale} $end
$scope module top $end
$scope module driver $end
$var wire 1 ! ha $end
$var wire 1 " la $end
$var wire 4 # bus [3:0] $end
$var real 64 % vbus $end
$upscope $end
$scope module spare $end
$var wire 1 & ha $end
$upscope $end
$upscope $end
$enddefinitions $end
"""


@pytest.fixture
def vcd(tmp_path):
    def _write(body: str, scale: str = "1 ns", head: str | None = None) -> str:
        p = tmp_path / "capture.vcd"
        p.write_text((head if head is not None else HEAD.format(scale=scale)) + body)
        return str(p)

    return _write


def test_dead_time_check_case(vcd):
    # facts.md S10 [derived] check case, IEEE Std 1364-2005, clause 18:
    # timescale 10 ns, LS falls at #100, HS rises at #110 -> 100 ns dead time.
    path = vcd('#0\n0!\n1"\n#100\n0"\n#110\n1!\n#300\n', scale="10 ns")
    bridge = sc.Bridge((sc.Leg("A", "top.driver.ha", "la"),))
    policy = sc.Policy(dead_time=sc.DeadTime.both(sc.parse_duration("200ns")))
    report = sc.check_file(path, bridge, policy)
    (finding,) = report.violations
    assert finding.rule == "dead-time"
    assert finding.measured_ps == 100_000  # 100 ns
    assert (finding.start_ps, finding.end_ps) == (1_000_000, 1_100_000)
    assert [s.line for s in finding.sources] == [19, 21]


@pytest.mark.parametrize("mag", [1, 10, 100])
@pytest.mark.parametrize(
    "unit,ps", [("s", 10**12), ("ms", 10**9), ("us", 10**6), ("ns", 10**3), ("ps", 1)]
)
@pytest.mark.parametrize("space", ["", " "])
def test_every_timescale(vcd, mag, unit, ps, space):
    # IEEE Std 1364-2005, clause 18: 1, 10 or 100 of s, ms, us, ns, ps, fs
    tr = read_vcd(vcd('#0\n0"\n#7\n1"\n#9\n', scale=f"{mag}{space}{unit}"), channels=["la"])
    assert tr.channel("la").times.tolist() == [7 * mag * ps]
    assert tr.end_ps == 9 * mag * ps


@pytest.mark.parametrize("mag,step_ps", [(1, 1), (10, 1), (100, 1)])
def test_femtosecond_timescales_need_whole_picoseconds(vcd, mag, step_ps):
    ticks_per_ps = 1000 // mag
    body = f'#0\n0"\n#{3 * ticks_per_ps}\n1"\n'
    tr = read_vcd(vcd(body, scale=f"{mag} fs"), channels=["la"])
    assert tr.channel("la").times.tolist() == [3 * step_ps]
    with pytest.raises(InputError, match="not a whole picosecond") as e:
        read_vcd(vcd("#0\n0!\n#1\n1!\n", scale=f"{mag}fs"))
    assert e.value.line == 17


def test_names_bits_x_z_and_lines(vcd):
    body = '#0\n$dumpvars\n0!\nx"\nb0 #\n0&\nr1.5 %\n$end\n#5\n1!\nb1x #\nZ"\n#8\nbz #\n#9\n'
    tr = read_vcd(vcd(body), channels=["top.driver.ha", "la", "bus[1]", "bus[3]", "top.spare.ha"])
    ha, la = tr.channel("top.driver.ha"), tr.channel("la")
    assert (ha.initial, ha.times.tolist(), ha.levels.tolist()) == (0, [5000], [1])
    assert ha.lines.tolist() == [24]
    assert (la.initial, la.levels.tolist()) == (Level.X, [Level.Z])
    # b1x left-extends with 0 (0 0 1 x): bit 1 is 1, bit 3 is 0; bz extends with z
    assert tr.channel("bus[1]").levels.tolist() == [1, Level.Z]
    assert tr.channel("bus[3]").levels.tolist() == [Level.Z]
    assert tr.channel("top.spare.ha").edge_count == 0
    assert (tr.start_ps, tr.end_ps, tr.kind, tr.rows) == (0, 9000, "vcd", 9)


def test_default_channels_and_shared_ids(vcd):
    head = (
        "$timescale 1ps $end $scope module a $end $var wire 1 ! AH $end\n"
        "$var wire 1 ! mirror $end $var wire 1 ? AL $end $upscope $end\n"
        "$enddefinitions $end\n"
    )
    tr = read_vcd(vcd("#0\n1!\n0?\n#4\n0!\n#6\n1?\n#10\n", head=head))
    assert list(tr.channels) == ["AH", "mirror", "AL"]
    assert tr.channel("mirror").times.tolist() == tr.channel("AH").times.tolist() == [4]
    report = sc.check_file(tr.path, policy=sc.Policy(dead_time=sc.DeadTime.both(1)))
    assert report.legs == ("A",)


def test_channel_selection_errors(vcd):
    path = vcd("#0\n")
    for name, msg in [
        ("ha", "ambiguous"),
        ("bus", "4 bits wide"),
        ("bus[9]", r"no bit 9 \(range \[3:0\]\)"),
        ("vbus", "real variable"),
        ("nothere", "no variable"),
    ]:
        with pytest.raises(InputError, match=msg):
            read_vcd(path, channels=[name])


@pytest.mark.parametrize(
    "body,line,msg",
    [
        ("#0\n0!\n#10\n1!\n#5\n", 19, "goes back in time"),
        ("#0\n0!\n1@\n", 17, "never declared"),
        ("#0\n$dumpvars\n0!\n", 16, r"ends inside \$dumpvars"),
        ("#0\nb101\n", 16, "expected an identifier code"),
        ("#0\nq!\n", 16, "expected a timestamp"),
        ("#0\n#1x\n", 16, "expected a timestamp such as #100"),
        ("#0\nb12 #\n", 16, "binary vector"),
        ("#0\n$scope module x $end\n", 16, "not allowed after"),
    ],
)
def test_bad_bodies(vcd, body, line, msg):
    path = vcd(body)
    for chunk in (1, 7, 4 << 20):
        with pytest.raises(InputError, match=msg) as e:
            read_vcd(path, chunk_bytes=chunk)
        assert e.value.line == line
        assert str(e.value).startswith(f"{path}:{line}:")


@pytest.mark.parametrize(
    "text,line,msg",
    [
        ("time,AH,AL\n0,1,0\n", 1, "is this a VCD file"),
        ("$timescale 1ns $end\n$var wire 1 ! a $end\n", 2, "before '.enddefinitions"),
        ("$timescale 1ns $end\n$var wire 0 ! a $end\n$enddefinitions $end\n", 2, "width"),
        ("$timescale 1ns $end\n$var wire x ! a $end\n$enddefinitions $end\n", 2, "width"),
        ("$timescale 1ns $end\n$var wire 4 ! a [7:0] $end\n$enddefinitions $end\n", 2, "width"),
        ("$timescale 5ns $end\n$enddefinitions $end\n", 1, "timescale must be"),
        ("$timescale 1ns $end\n$var wire 1 !\n", 2, r"ends inside \$var"),
        ("\x00\x01\x02binary", 1, "is this a VCD file"),
    ],
)
def test_bad_headers(tmp_path, text, line, msg):
    p = tmp_path / "bad.vcd"
    p.write_text(text)
    with pytest.raises(InputError, match=msg) as e:
        read(str(p))
    assert e.value.line == line


def test_empty_vcd(tmp_path):
    p = tmp_path / "empty.vcd"
    p.write_text("")
    with pytest.raises(InputError, match="empty file"):
        read(str(p))


def test_cli_bad_vcd_exits_2_with_file_and_line(vcd):
    path = vcd("#0\n0!\n#10\n1!\n#5\n")
    r = run_cli("check", path, "--leg", "A=top.driver.ha,la")
    assert r.returncode == 2
    assert f"{path}:19:" in r.stderr
    assert "Traceback" not in r.stderr


def test_pywellen_agrees_on_a_generated_capture(tmp_path):
    """A second general-purpose reader (pywellen) on a PWM-like file: same edges."""
    pywellen = pytest.importorskip("pywellen")
    lines = ["$timescale 1ns $end", "$scope module pump $end"]
    lines += [f"$var wire 1 {c} {n} $end" for c, n in zip("!#", ["U_H", "U_L"], strict=True)]
    lines += ["$upscope $end", "$enddefinitions $end", "#0", "0!", "1#"]
    t = 0
    for k in range(2000):
        t += 500 + k % 7
        lines += [f"#{t}", "0#"]
        t += 300
        lines += [f"#{t}", "1!"]
        t += 2000 + 13 * (k % 5)
        lines += [f"#{t}", "0!", "x#" if k == 777 else "0#"]
        t += 300
        lines += [f"#{t}", "1#"]
    p = tmp_path / "pwm.vcd"
    p.write_text("\n".join(lines) + "\n")
    wave = pywellen.Waveform(str(p))
    signals = {v.full_name: v.signal for v in wave.all_vars()}
    for name in ("U_H", "U_L"):
        sig = signals[f"pump.{name}"]
        pairs = sig[0 : len(sig)]
        ours = read_vcd(str(p), channels=[name], chunk_bytes=4096).channel(name)
        codes = {"0": 0, "1": 1, "x": 2, "z": 3, 0: 0, 1: 1}
        theirs = [(tt * 1000, codes[v]) for tt, v in pairs]
        level = theirs[0][1]
        edges = []
        for tt, v in theirs[1:]:
            if v != level:
                edges.append((tt, v))
                level = v
        assert ours.initial == theirs[0][1]
        assert list(zip(ours.times.tolist(), ours.levels.tolist(), strict=True)) == edges


def test_many_tokens_on_one_line_in_tiny_chunks(vcd):
    """Tokens need only whitespace between them; chunks are then cut between tokens."""
    one = vcd('#0 0! 1" b0 # #5 1! b101 # #9 0! #12 x! #20 bx1 #\n')
    for chunk in (1, 3, 7, 1 << 20):
        tr = read_vcd(one, channels=["top.driver.ha", "bus[0]", "bus[2]"], chunk_bytes=chunk)
        ha = tr.channel("top.driver.ha")
        assert (ha.times.tolist(), ha.levels.tolist()) == ([5000, 9000, 12000], [1, 0, Level.X])
        assert ha.lines.tolist() == [15, 15, 15]
        assert tr.channel("bus[0]").times.tolist() == [5000]
        assert tr.channel("bus[2]").levels.tolist() == [1, Level.X]


def test_pump_inverter_sample():
    """The VCD sample: x during reset and one dead-time fault on leg V, named by line."""
    from conftest import SAMPLES

    r = run_cli(
        "check", str(SAMPLES / "pump_inverter.vcd"), "--dead-time", "500ns", "--format", "json"
    )
    assert r.returncode == 1, r.stderr
    import json

    doc = json.loads(r.stdout)
    assert doc["summary"]["by_rule"]["dead-time"] == 1  # x during reset is another rule's
    (dead,) = [v for v in doc["violations"] if v["rule"] == "dead-time"]
    assert (dead["leg"], dead["measured_ps"]) == ("V", 80_000)
    assert dead["sources"][-1]["line"] == 383


@pytest.mark.parametrize("first_line", [1, 2**31 - 40, 2**31 + 7])
def test_line_numbers_past_int32_stay_exact(vcd, first_line):
    """Lines are kept as int32 until a chunk could pass 2**31 - 1, then as int64."""
    from sequencecheck.readers._vcd_body import VcdBody
    from sequencecheck.readers._vcd_header import read_header, select

    path = vcd("")
    head = read_header(path)
    body = VcdBody(path, head, select(head, ["la"], path))
    chunk = b'#0\n0"\n' + b"".join(b'#%d\n%d"\n' % (k + 1, (k + 1) % 2) for k in range(20))
    body.feed(chunk, first_line)
    lines = body.lines[0].view()
    assert lines.tolist() == [first_line + 1] + [first_line + 3 + 2 * k for k in range(20)]
    assert lines.dtype == (np.int32 if first_line + len(chunk) < 2**31 - 1 else np.int64)
