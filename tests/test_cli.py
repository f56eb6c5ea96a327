"""The command line: exit codes, output shapes and clean errors."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner

from selector.cli import cli

EXAMPLES = Path(__file__).parents[1] / "examples"


@pytest.fixture
def run():
    runner = CliRunner()

    def invoke(*args: str):
        return runner.invoke(cli, list(args), catch_exceptions=False)

    return invoke


def _main(*args: str):
    """Run a command in-process through click's standalone mode (stdout and stderr kept apart).

    A user-input error must end the command through ``SystemExit`` (exit status 2), never
    through another exception, which would be a traceback for a user.
    """
    result = CliRunner().invoke(cli, list(args))
    assert result.exception is None or isinstance(result.exception, SystemExit), result.exception
    return result


def test_entry_point_reports_a_bad_spec_in_one_line(tmp_path):
    """The installed entry point (a real process) prints one error line and exits 2."""
    spec = tmp_path / "bad.toml"
    spec.write_text('[part]\nfunction = "beam"\nlenght = "1 m"\n', encoding="utf-8")
    done = subprocess.run(
        [sys.executable, "-m", "selector", "rank", str(spec)], capture_output=True, text=True, check=False
    )
    assert done.returncode == 2
    assert done.stdout == ""
    assert done.stderr.startswith(f"error: {spec}: part.lenght: unknown key 'lenght'; did you mean 'length'?")
    assert done.stderr.count("\n") == 1


def _assert_not_imported(args: list[str], modules: tuple[str, ...]) -> None:
    """Run the entry point with ``args`` in a fresh interpreter; none of ``modules`` may be imported."""
    code = (
        f"import sys; sys.argv = ['selector', *{args!r}]\n"
        "from selector.cli import main\n"
        "try:\n    main()\nexcept SystemExit:\n    pass\n"
        f"heavy = [m for m in {modules!r} if m in sys.modules]\n"
        "assert not heavy, heavy\n"
    )
    result = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=False)
    assert result.returncode == 0, result.stderr


def test_help_does_not_import_heavy_modules():
    _assert_not_imported(["--help"], ("pandas", "plotly", "pint", "numpy"))


def test_version(run):
    result = run("--version")
    assert result.exit_code == 0
    assert "selector, version" in result.output


def test_materials_list_csv_has_every_class(run):
    result = run("materials", "list", "--format", "csv")
    assert result.exit_code == 0
    lines = result.output.strip().splitlines()
    assert len(lines) - 1 >= 80
    header = lines[0].split(",")
    assert "E_low [GPa]" in header and "rho_high [kg/m³]" in header


def test_materials_list_us_units(run):
    result = run("materials", "list", "--family", "metal", "--units", "us", "--format", "json")
    records = json.loads(result.output)
    assert records and all(r["family"] == "metal" for r in records)
    assert records[0]["E_low"]["unit"] == "Msi"


def test_materials_show_unknown_id_is_one_line():
    result = _main("materials", "show", "alumminium")
    assert result.exit_code == 2
    assert result.stderr.startswith("error: materials show: no class with id 'alumminium'")
    assert "Traceback" not in result.stderr


def test_derive_json_index(run):
    result = run(
        "derive",
        "beam",
        "--objective",
        "mass",
        "--constraint",
        "stiffness",
        "--free",
        "scale",
        "--format",
        "json",
    )
    assert result.exit_code == 0
    assert json.loads(result.output)["index"] == {"E": 0.5, "rho": -1.0}


def test_derive_table_shows_steps(run):
    result = run("derive", "panel", "--free", "thickness")
    assert "M = E^(1/3)/ρ" in result.output
    assert "Solve for the free variable" in result.output


@pytest.mark.parametrize("example", sorted(p.name for p in EXAMPLES.glob("*.toml")))
def test_rank_every_example(run, example):
    result = run("rank", str(EXAMPLES / example), "--format", "json")
    assert result.exit_code == 0, result.output
    records = json.loads(result.output)
    if isinstance(
        records, dict
    ):  # a sandwich: face × core pairs (checked in tests/outputs/test_sandwich_tables.py)
        assert records["pairs"][0]["rank"] == 1
        return
    assert records, "empty shortlist"
    first = records[0]
    for key in ("id", "name", "family", "rank", "status", "reasons", "index", "index_low", "index_high"):
        assert key in first
    assert set(first["index"]) == {"value", "unit"}
    assert first["rank"] == 1
    if "mass" in first:
        assert first["mass"]["unit"] in ("kg", "lb")
        assert first["governing"] in first["utilisation"]
        assert all(set(v) == {"value", "unit"} for v in first["dimensions"].values())
        assert first["caution"].startswith("Preliminary selection only")


def test_rank_table_prints_caution(run):
    result = run("rank", str(EXAMPLES / "camera-dolly-boom.toml"), "--all")
    assert result.exit_code == 0
    assert "CAUTION: Preliminary selection only" in result.output
    assert "rejected" in result.output


def test_rank_bad_spec_is_one_line(tmp_path):
    spec = tmp_path / "bad.toml"
    spec.write_text('[part]\nfunction = "beam"\nlenght = "1 m"\n', encoding="utf-8")
    result = _main("rank", str(spec))
    assert result.exit_code == 2
    assert result.stderr.strip().count("\n") == 0
    assert "part.lenght: unknown key 'lenght'; did you mean 'length'?" in result.stderr


def test_rank_refuses_to_overwrite_its_spec(tmp_path):
    spec = tmp_path / "boom.json"
    spec.write_text((EXAMPLES / "camera-dolly-boom.toml").read_text(encoding="utf-8"), encoding="utf-8")
    before = spec.read_bytes()
    result = _main("rank", str(spec), "-o", str(spec))
    assert result.exit_code == 2
    assert "refusing to write over an input file" in result.stderr
    assert spec.read_bytes() == before


def test_rank_writes_csv(tmp_path, run):
    out = tmp_path / "shortlist.csv"
    result = run("rank", str(EXAMPLES / "greenhouse-tie-rod.toml"), "-o", str(out))
    assert result.exit_code == 0
    text = out.read_text(encoding="utf-8")
    assert text.startswith("rank,id,name,family,status,index [")
    assert text.splitlines()[0].endswith(",caution")
    assert "Preliminary selection only" in text.splitlines()[1]


def test_section_json(run):
    result = run("section", "i-section", "b=100mm", "h=200mm", "tf=10mm", "tw=6mm", "--format", "json")
    data = json.loads(result.output)
    # A = 2·100·10 + 180·6 = 3080 mm² (worked by hand)
    assert data["area"] == {"value": pytest.approx(3080.0), "unit": "mm^2"}
    for key in ("centroid", "Ixx", "Iyy", "Zx_top", "Zx_bottom", "J", "shape_factor_bending"):
        assert "unit" in data[key]


def test_section_bad_dimension_is_one_line():
    result = _main("section", "tube", "d=40mm", "t=30 furlongs")
    assert result.exit_code == 2
    assert result.stderr.startswith("error: section tube: t:")


def test_demo_writes_files(tmp_path):
    result = _main("demo", "--out", str(tmp_path / "demo"))
    assert result.exit_code == 0, result.stderr
    assert "wrote" in result.stdout
    for name in ("shortlist.csv", "chart.html", "report.html"):
        assert (tmp_path / "demo" / name).exists()
        assert str(tmp_path / "demo" / name) in result.stdout


def test_rank_tradeoff_and_penalty(run):
    """Each penalty is cost + α·mass from the shortlist's own sized parts, lowest first."""
    spec = str(EXAMPLES / "camera-dolly-boom.toml")
    result = run("rank", spec, "--tradeoff", "cost", "--exchange", "10 USD/kg", "--format", "json")
    assert result.exit_code == 0
    penalties = json.loads(result.output)["tradeoff"]["penalty"]
    shortlist = {r["id"]: r for r in json.loads(run("rank", spec, "--format", "json").output)}
    alpha = 10.0  # USD per kg saved, as given
    # Z = C + α·m (exchange-constant penalty; Ashby, Materials Selection in Mechanical Design,
    # 4th ed., ch. 9, from memory), worked here from the plain shortlist's mass and cost
    by_hand = {
        i: r["cost"]["value"] + alpha * r["mass"]["value"]
        for i, r in shortlist.items()
        if r["mass"] is not None and r["cost"] is not None
    }
    assert {p["id"] for p in penalties} == set(by_hand)
    for p in penalties:
        assert p["penalty"]["unit"] == "USD"
        assert p["penalty"]["value"] == pytest.approx(by_hand[p["id"]], rel=1e-12), p["id"]
    ordered = sorted(by_hand, key=by_hand.get)
    assert [p["id"] for p in penalties] == ordered
    assert [p["penalty_rank"] for p in penalties][:3] == [1, 2, 3]


def test_rank_robust_is_deterministic(run):
    spec = str(EXAMPLES / "camera-dolly-boom.toml")
    first = run("rank", spec, "--robust", "500", "--seed", "3", "--format", "csv").output
    again = run("rank", spec, "--robust", "500", "--seed", "3", "--format", "csv").output
    assert first == again
    assert "p_best" in first


def test_rank_bad_exchange_is_one_line():
    result = _main(
        "rank", str(EXAMPLES / "camera-dolly-boom.toml"), "--tradeoff", "cost", "--exchange", "10 MPa"
    )
    assert result.exit_code == 2
    assert result.stderr.startswith("error: --exchange:")


def test_rank_imports_neither_plotly_nor_openpyxl():
    _assert_not_imported(
        ["rank", str(EXAMPLES / "camera-dolly-boom.toml")], ("plotly", "openpyxl", "jinja2", "dash")
    )


def test_materials_list_table_is_narrow(run):
    result = run("materials", "list", "--family", "foam", "--wide")
    header, units = result.output.splitlines()[:2]
    assert "E " in header and "MPa" in units and "K_IC" not in header  # foam moduli read in MPa


def test_unknown_family_is_refused():
    result = _main("materials", "list", "--family", "metals")
    assert result.exit_code == 2
    assert "metals" in result.stderr and "Traceback" not in result.stderr


def test_repeated_dimension_is_refused():
    result = _main("section", "rectangle", "b=1mm", "b=3mm", "h=4mm")
    assert result.exit_code == 2
    assert result.stderr.startswith("error: section rectangle: b: b is given twice")


def test_every_spec_problem_gets_its_own_error_line(tmp_path):
    spec = tmp_path / "bad.toml"
    spec.write_text('[part]\nfunction = "bem"\nlenght = "1 m"\n', encoding="utf-8")
    result = _main("rank", str(spec))
    assert result.exit_code == 2
    lines = result.stderr.splitlines()
    assert len(lines) == 2
    assert lines[0].startswith(f"error: {spec}: part.function: 'bem' is not a function")
    assert lines[1].startswith(f"error: {spec}: part.lenght: unknown key 'lenght'")
