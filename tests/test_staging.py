"""Staging that speaks (issue 13): HEAPKIT_DEBUG says what it switched on, modes show
in repr, counts do not depend on the order of the modes, a mutated key is named as
the likely cause, ledgers combine across heaps, and the plot reads at 10^5 records."""

from __future__ import annotations

import gc
import logging
import math
import random
import statistics
import sys
from pathlib import Path
from typing import Any

import pytest

import heapkit
from heapkit import PairingHeap, audit, checked
from heapkit import audit as auditing
from heapkit.ledger import Ledger
from tests.kinds import NAMES, make, monotone, run_python

ROOT = Path(__file__).resolve().parent.parent


def test_heapkit_debug_says_once_at_warning_what_it_switched_on() -> None:
    code = "import heapkit\nfor _ in range(5): heapkit.new('pairing').push(1, 'a')\n"
    out = run_python(code, "check:10,audit")
    assert out.returncode == 0, out.stderr
    said = [line for line in out.stderr.splitlines() if "on for every heap" in line]
    assert said == [
        "HEAPKIT_DEBUG='check:10,audit': checked mode (every 10th operation) and the audit "
        "(a ledger per heap) are on for every heap made from now on (slower; for tests and staging)"
    ]


def test_a_heaps_repr_shows_its_modes() -> None:
    h = PairingHeap([(1, "a")])
    assert repr(h) == "<PairingHeap n=1 min=(1, 'a')>"
    checked(h, every=3)
    assert repr(h) == "<PairingHeap n=1 min=(1, 'a') [checked every 3]>"
    with audit(h):
        assert repr(h) == "<PairingHeap n=1 min=(1, 'a') [checked every 3, audited]>"
    heapkit.unchecked(h)
    assert repr(h) == "<PairingHeap n=1 min=(1, 'a')>"


def test_set_debug_switches_modes_from_code(caplog: pytest.LogCaptureFixture) -> None:
    try:
        with caplog.at_level(logging.WARNING, logger="heapkit"):
            assert heapkit.set_debug("check:2") == [("check", 2)]
        assert "checked mode (every 2nd operation) is on" in caplog.text
        h = heapkit.new("binary")
        assert "[checked every 2]" in repr(h)
        with pytest.raises(ValueError, match=r"unknown value 'CHECK'.*did you mean 'check'"):
            heapkit.set_debug("CHECK")
        assert "[checked every 2]" in repr(heapkit.new("binary"))  # a refused string changes nothing
    finally:
        heapkit.set_debug("")
    assert type(heapkit.new("binary")) is heapkit.BinaryHeap


def _workload(h: Any) -> None:
    rng = random.Random(5)
    live = []
    for i in range(300):
        live.append(h.push(rng.randrange(1000), i))
        if i % 3 == 0:
            h.pop()
        if i % 7 == 0:
            x = live[rng.randrange(len(live))]
            if x.alive:
                h.decrease_key(x, x.key - 5)
    while h:
        h.pop()


@pytest.mark.parametrize("name", [n for n in NAMES if not monotone(n)])
def test_audit_comparison_counts_do_not_depend_on_the_order_of_the_modes(name: str) -> None:
    counts = []
    for order in ("audit only", "checked below", "checked above"):
        h = make(name)
        if order == "checked below":
            checked(h)
        with audit(h) as led:
            if order == "checked above":
                checked(h)
            _workload(h)
            heapkit.unchecked(h) if order == "checked above" else None
        counts.append([(r.op, r.comparisons) for r in led.records])
    assert counts[2] == counts[1]
    # Checked mode takes a peek before each pop: lazy's peek drops stale entries and weak's
    # settles the entries pushed since the last pop, so that work is counted at the peek.
    if name not in ("lazy", "weak"):
        assert counts[1] == counts[0]


def test_the_staging_example_counts_what_the_audit_alone_counts() -> None:
    sys.path.insert(0, str(ROOT / "examples"))
    try:
        import staging_checks as ex
    finally:
        sys.path.pop(0)
    events = ex.shift(tickets=200)
    _, led = ex.staging_shift(events)  # checked mode first, then the audit
    plain = heapkit.new(ex.heapkit.DEFAULT)
    store = heapkit.new(ex.heapkit.DEFAULT)
    with audit(plain, keep="totals") as alone:
        ex.serve(events, {"mill": plain, "store": store})
    assert {k: t.comparisons for k, t in led.tallies().items()} == {
        k: t.comparisons for k, t in alone.tallies().items()
    }


def test_a_key_mutated_in_place_is_named_as_the_likely_cause() -> None:
    assert heapkit.HistoryError is heapkit.contracts.HistoryError
    h = checked(PairingHeap())
    keys = [[k] for k in (5, 3, 8, 1, 9)]
    for k in keys:
        h.push(k, k[0])
    h.pop()
    keys[2][0] = 0  # 8 becomes 0 in place: below the root
    with pytest.raises(heapkit.HistoryError) as info:
        for _ in range(10):
            h.push([20], 20)
    err = info.value
    assert "likely cause: a key changed in place" in str(err)
    assert "err.history" in str(err) and "err.replay()" in str(err) and "cannot be reproduced" in str(err)
    assert err.likely_mutated
    with pytest.warns(RuntimeWarning, match="key changed in place"):
        err.replay()


def _ledger(seed: int, keep: str) -> Ledger:
    h = PairingHeap()
    with audit(h, keep=keep) as led:
        rng = random.Random(seed)
        for i in range(60):
            h.push(rng.randrange(100), i)
            if i % 4 == 0:
                h.pop()
    return led


@pytest.mark.parametrize("keeps", [("all", "all"), ("all", "totals"), ("totals", "totals")])
def test_ledgers_add_up(keeps: tuple[str, str]) -> None:
    a, b = _ledger(1, keeps[0]), _ledger(2, keeps[1])
    both = a + b
    assert both.heaps == 2 and both.count == a.count + b.count
    assert both.total_actual == a.total_actual + b.total_actual
    assert math.isclose(both.total_amortized, a.total_amortized + b.total_amortized)  # source: arithmetic
    ta, tb = a.tallies(), b.tallies()
    assert {k: t.count for k, t in both.tallies().items()} == {k: ta[k].count + tb[k].count for k in ta}
    assert {k: max(t.costs) for k, t in both.tallies().items()} == {
        k: max(max(ta[k].costs), max(tb[k].costs)) for k in ta
    }
    assert both.worst(1)[0].actual == max(a.worst(1)[0].actual, b.worst(1)[0].actual)
    assert "2 heaps combined" in both.summary() and "holds" in both.summary()
    assert sum([a, b]).count == both.count
    if keeps == ("all", "all"):
        assert list(both.records) == [*a.records, *(r._replace(step=r.step + a.count) for r in b.records)]


def test_ledgers_of_different_kinds_do_not_add() -> None:
    other = Ledger("binary", "levels", 1.0)
    with pytest.raises(TypeError, match="'pairing' and 'binary'"):
        _ = _ledger(1, "all") + other


def test_a_collector_combines_the_ledgers_of_many_heaps_per_kind() -> None:
    pool = auditing.Collector()
    auditing.configure(report=pool)
    try:
        for n in range(50):  # one heap per "request"
            h = make("pairing" if n % 2 else "binary")
            auditing.attach(h)
            for k in range(5):
                h.push(k, n)
            h.pop()
            del h
        gc.collect()
    finally:
        auditing.configure(report=None)
    got = pool.ledgers()
    assert sorted(got) == ["binary", "pairing"]
    assert [got[k].heaps for k in got] == [25, 25] and [got[k].count for k in got] == [150, 150]
    assert pool.summary().count("audit of") == 2


def test_a_collector_reports_once_at_exit_with_the_heaps_still_alive() -> None:
    code = (
        "import logging, heapkit\n"
        "from heapkit.audit import Collector, configure\n"
        "logging.basicConfig(level=logging.INFO, format='%(message)s')\n"
        "configure(report=Collector(at_exit=True))\n"
        "keep = [heapkit.new('pairing') for _ in range(3)]\n"
        "for h in keep: h.push(1, 'a')\n"
    )
    out = run_python(code, "audit")
    assert out.returncode == 0, out.stderr
    assert out.stderr.count("audit of") == 1
    assert "audit of pairing (3 heaps combined): 3 operation(s)" in out.stderr


def test_ledger_and_record_print_readably() -> None:
    led = _ledger(3, "all")
    assert repr(led) == f"<Ledger pairing: {led.count} operation(s), keep='all', 0 over bound>"
    text = repr(led.records[1])
    assert "phi_before=" in text and len(text) < 140
    assert all(len(part.split("=")[1].rstrip(")")) <= 6 for part in text.split(", ")[4:8])
    assert "-0.00" not in led.summary()


def test_plot_envelopes_match_the_buckets() -> None:
    np = pytest.importorskip("numpy")
    from heapkit.ledger_plot import envelopes

    rng = random.Random(9)
    ys = [float(rng.randrange(50)) for _ in range(1000)]
    _, mean, p99, top = envelopes(np.arange(1000.0), np.array(ys), 10)
    for b in range(10):
        part = sorted(ys[100 * b : 100 * b + 100])
        assert top[b] == part[-1] and math.isclose(mean[b], statistics.fmean(part))  # source: statistics
        assert p99[b] == part[math.ceil(0.99 * 100) - 1]  # nearest-rank percentile, common practice


def test_plot_renders_10_to_the_5_records(tmp_path: Any) -> None:
    pytest.importorskip("matplotlib")
    led = Ledger("pairing", "links", 1.0)
    rng = random.Random(4)
    phi = 0.0
    for i in range(100_000):  # invented records: this test is about rendering
        code = rng.choice((0, 2, 3))
        a = rng.randint(1, 30 if code == 2 else 3)
        after = max(0.0, phi + rng.uniform(-2.0, 2.0))
        led.add(code, i % 5000, a, phi, after, 20.0, a)
        phi = after
    led.plot(tmp_path / "big.png")
    assert (tmp_path / "big.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"  # the PNG signature
    with pytest.raises(ValueError, match="max_points"):
        led.plot(tmp_path / "bad.png", max_points=0)
