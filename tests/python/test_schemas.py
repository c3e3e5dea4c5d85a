"""Real outputs (plan reports and survey rows, from the module and from the command line) validated
against the shipped JSON Schemas with python3-jsonschema (draft 2020-12, JSON Schema Core and
Validation specifications, 2020)."""

import copy
import json

import jsonschema
import pytest

from conftest import SCHEMAS, TOPOLOGIES, run_cli

REPORT_SCHEMA = json.loads((SCHEMAS / "plan-report.schema.json").read_text())
ROW_SCHEMA = json.loads((SCHEMAS / "survey-row.schema.json").read_text())

NOISY = str(TOPOLOGIES / "harbor-noisy-20.yaml")
PLANS = [
    ("line:8", 8, {}),
    ("grid:4x4", 12, {"approx": 3, "inverse": True}),
    (NOISY, 10, {"approx": "auto", "measure": True, "strategy": "chain"}),
    (NOISY, 6, {"end_order": "same", "strategy": "routed", "approx": 2}),
    ("heavy-hex:2x2", 35, {"strategy": "spine"}),
    ("grid:3x3", 5, {"approx": 1, "gates": "logical", "format": "qasm2"}),
    (str(TOPOLOGIES / "harbor-ring-16.yaml"), 9, {"placement": [0, 1, 2, 3, 4, 5, 6, 7, 8]}),
    ("line:1", 1, {}),
]


def validator(schema):
    jsonschema.Draft202012Validator.check_schema(schema)
    return jsonschema.Draft202012Validator(schema, format_checker=jsonschema.FormatChecker())


def check_report(report):
    validator(REPORT_SCHEMA).validate(report)
    # What a schema cannot say: the maps have one entry per register bit, on the device.
    n = report["qubits"]
    assert len(report["placement"]) == n and len(report["final_placement"]) == n
    assert all(q < report["device_qubits"] for q in report["placement"] + report["final_placement"])
    if report["end_order"] == "same":
        assert report["final_placement"] == report["placement"]


def test_schemas_are_valid_2020_12_documents():
    for schema in (REPORT_SCHEMA, ROW_SCHEMA):
        assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"
        jsonschema.Draft202012Validator.check_schema(schema)


@pytest.mark.parametrize("device, n, kwargs", PLANS)
def test_module_reports_validate(qftplan, device, n, kwargs):
    report = qftplan.plan(device, n, **kwargs).report
    assert report["schema_version"] == qftplan.REPORT_SCHEMA_VERSION == 1
    check_report(report)


@pytest.mark.parametrize("device, n, flags", [
    ("line:8", 8, []),
    (NOISY, 10, ["--approx", "auto", "--strategy", "chain", "--measure", "--end-order", "same"]),
    ("grid:4x4", 12, ["--strategy", "routed", "--inverse"]),
])
def test_command_line_reports_validate(tmp_path, device, n, flags):
    path = tmp_path / "r.json"
    run_cli("plan", "--device", device, "--qubits", n, "--report", path, *flags, check=True)
    check_report(json.loads(path.read_text()))


def test_every_report_field_is_described(qftplan):
    # The schema lets readers accept unknown fields; this keeps it complete for the fields we write.
    props = REPORT_SCHEMA["properties"]
    for device, n, kwargs in PLANS:
        report = qftplan.plan(device, n, **kwargs).report
        assert set(report) <= set(props), set(report) - set(props)
        assert set(report) == set(REPORT_SCHEMA["required"])
        if report["approx_choice"]:
            item = props["approx_choice"]["oneOf"][1]["properties"]["considered"]["items"]
            for c in report["approx_choice"]["considered"]:
                assert set(c) <= set(item["properties"])
        for a in report["alternatives"]:
            assert set(a) <= set(props["alternatives"]["items"]["properties"])


@pytest.mark.parametrize("mutate", [
    lambda r: r.update(schema_version=2),
    lambda r: r.pop("cx_count"),
    lambda r: r.update(esp=1.5),
    lambda r: r.update(gates="cy"),
    lambda r: r.update(placement=[-1]),
    lambda r: r.update(end_order="reversed"),
    lambda r: r["gate_counts"].update(cx=-3),
])
def test_schema_rejects_broken_reports(qftplan, mutate):
    report = copy.deepcopy(qftplan.plan(NOISY, 6).report)
    mutate(report)
    with pytest.raises(jsonschema.ValidationError):
        validator(REPORT_SCHEMA).validate(report)


def survey_rows_from_cli(tmp_path, *args):
    path = tmp_path / "rows.jsonl"
    run_cli("survey", *args, "--jsonl", path, "--quiet", check=True)
    return [json.loads(line) for line in path.read_text().splitlines() if line.strip()]


def test_survey_rows_validate(qftplan, tmp_path):
    rows = survey_rows_from_cli(tmp_path, "line:5", "grid:*", NOISY, "--qubits", "3,6", "--approx", "none,2,auto",
                                "--direction", "both", "--strategy", "chain,routed")
    rows += qftplan.survey(["line:5", "grid:*"], [3, 6], approx=["none", 2], timing=True)
    assert any(r["status"] == "failed" for r in rows)  # line:5 cannot hold 6 qubits
    assert any(r["esp"] is not None for r in rows)
    v = validator(ROW_SCHEMA)
    for r in rows:
        v.validate(r)
        assert set(r) <= set(ROW_SCHEMA["properties"]), set(r) - set(ROW_SCHEMA["properties"])
        assert r["schema_version"] == qftplan.SURVEY_ROW_SCHEMA_VERSION == 1


def test_network_survey_rows_validate(qftplan, tmp_path):
    # Rows of a survey over networks, refused runs (no insertion network for the exact QFT) included;
    # asked_network lists exactly the names the planner takes.
    rows = survey_rows_from_cli(tmp_path, "line:*", "--qubits", "8,12", "--approx", "3,none",
                                "--network", "insertion,parity,auto")
    rows += qftplan.survey("line:*", 8, approx=[3, None], network=["leapfrog", "parity-insertion"])
    assert {r["asked_network"] for r in rows} == {"insertion", "parity", "auto", "leapfrog", "parity-insertion"}
    assert any(r["status"] == "failed" for r in rows) and any(r["status"] == "ok" for r in rows)
    v = validator(ROW_SCHEMA)
    for r in rows:
        v.validate(r)
    for name in ROW_SCHEMA["properties"]["asked_network"]["enum"]:
        assert qftplan.survey("line:*", 4, approx=3, network=name)[0]["asked_network"] == name
    broken = copy.deepcopy(rows[0])
    broken["asked_network"] = "teleport"
    with pytest.raises(jsonschema.ValidationError):
        v.validate(broken)


def test_time_limited_rows_validate(tmp_path, monkeypatch):
    # A search cut short by --time-limit still plans: status time-limit, the figures, and the reason.
    # The counting clock (QFTPLAN_TEST_CLOCK_TICK, DEVELOPERS.md) makes the cut independent of the
    # machine's speed: each reading of the clock advances it by 1 ms, so 0.01 s is ten readings of work.
    monkeypatch.setenv("QFTPLAN_TEST_CLOCK_TICK", "0.001")
    rows = survey_rows_from_cli(tmp_path, "heavy-hex:*", "--qubits", "100:300:100", "--time-limit", "0.01",
                                "--strategy", "chain,spine")
    assert any(r["status"] == "time-limit" for r in rows), [r["status"] for r in rows]
    v = validator(ROW_SCHEMA)
    for r in rows:
        v.validate(r)
        if r["status"] == "time-limit":
            assert r["cx_count"] > 0 and r["reason"]


def test_schema_rejects_broken_rows(qftplan):
    row = qftplan.survey("line:5", 3)[0]
    v = validator(ROW_SCHEMA)
    v.validate(row)
    for mutate in (lambda r: r.update(status="maybe"), lambda r: r.update(reason="x"), lambda r: r.pop("qubits"),
                   lambda r: r.update(survey="xyz"), lambda r: r.pop("schema_version")):
        broken = copy.deepcopy(row)
        mutate(broken)
        with pytest.raises(jsonschema.ValidationError):
            v.validate(broken)
