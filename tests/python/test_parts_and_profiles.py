"""Parts out of service and calibration profiles through the module: the same devices, plans and survey
rows as the command line's --calibration, and plans that never touch a disabled part."""

import pytest

from conftest import SOURCE_DIR, run_cli

PROFILE = SOURCE_DIR / "topologies" / "profiles" / "harbor-typical.yaml"
SERVICE = SOURCE_DIR / "examples" / "harbor-grid-4x4-service.yaml"


def test_profile_matches_the_command_line(qftplan):
    dev = qftplan.load_device("heavy-hex:1x2", calibration=PROFILE)
    assert dev.calibrated and not qftplan.load_device("heavy-hex:1x2").calibrated
    assert dev == qftplan.Device("heavy-hex:1x2", calibration=str(PROFILE))
    assert dev == qftplan.heavy_hex(1, 2).with_calibration(PROFILE)
    assert dev.to_yaml() == run_cli("device", "heavy-hex:1x2", "--calibration", PROFILE, check=True)[1]
    s = dev.summary()
    assert (s["error_2q"]["min"], s["error_2q"]["max"], s["t2_us"]["max"]) == (0.008, 0.008, 90)


def test_profile_errors_carry_the_position(qftplan, tmp_path):
    bad = tmp_path / "p.yaml"
    bad.write_text("error_2q: 0.01\neror_1q: 0.001\n")
    with pytest.raises(qftplan.InputError) as e:
        qftplan.load_device("grid:2x2", calibration=bad)
    assert (e.value.file, e.value.line, e.value.column) == (str(bad), 2, 1)
    assert str(e.value) == run_cli("device", "grid:2x2", "--calibration", bad)[2].removeprefix("qftplan: ").strip()


def test_survey_with_a_profile_has_esp_and_matches_the_csv(qftplan):
    rows = qftplan.survey(["grid:*", "heavy-hex:*"], [4, 8], calibration=PROFILE)
    assert len(rows) == 4 and all(0 < r["esp"] < 1 for r in rows)
    assert all(r["esp"] is None for r in qftplan.survey(["grid:*"], [4]))
    csv = qftplan.survey_csv(["grid:*", "heavy-hex:*"], [4, 8], calibration=PROFILE)
    # (The CSV's lines end in CR LF, RFC 4180; the text-mode pipe reads them as LF.)
    assert csv.replace("\r\n", "\n") == run_cli("survey", "grid:*", "heavy-hex:*", "-n", "4,8", "--calibration", PROFILE, "--csv", "-",
                          "--no-timing", "--no-progress", "--quiet", check=True)[1]


def test_plans_avoid_parts_out_of_service(qftplan):
    dev = qftplan.load_device(SERVICE)
    assert not dev.usable(5) and dev.usable(4)
    out = dev.summary()["out_of_service"]
    assert out[0] == {"qubits": [5], "reason": "disabled"}
    assert {"qubits": [2, 3], "reason": "error 1"} in out and {"qubits": [10, 11], "reason": "disabled"} in out
    dead = {tuple(p["qubits"]) for p in out}
    for strategy in ("auto", "chain", "cover", "routed"):
        p = qftplan.plan(dev, 10, strategy=strategy)
        for name, qubits, _ in p.gate_list():
            assert all(dev.usable(q) for q in qubits), (strategy, name, qubits)
            if len(qubits) == 2:
                assert (min(qubits), max(qubits)) not in dead, (strategy, name, qubits)
    with pytest.raises(qftplan.InputError, match="names qubit 5, which is out of service"):
        qftplan.plan(dev, 3, strategy="chain", placement=[4, 5, 6])
