"""The HTML report: its sections, escaping, self-containment, atomic writes and clean errors."""

from __future__ import annotations

import os
from html.parser import HTMLParser
from pathlib import Path
from typing import ClassVar

import pytest
from click.testing import CliRunner

from selector import api
from selector.api import run_demo, run_spec
from selector.cli import cli
from selector.errors import InputError, OutputError
from selector.inputs.units import format_number
from selector.outputs import report
from selector.pipeline.selection import report_studies

EXAMPLES = Path(__file__).parents[2] / "examples"
SPEC = EXAMPLES / "camera-dolly-boom.toml"
SECTIONS = ("summary", "spec", "derivation", "screens", "shortlist", "charts", "robustness", "provenance")
XSS = "<script>alert(1)</script>"


class Page(HTMLParser):
    """A small DOM summary: text per element id, table rows per table class, script tags."""

    VOID: ClassVar[set[str]] = {"br", "meta", "img", "hr", "input", "link"}

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.stack: list[tuple[str, dict[str, str]]] = []
        self.ids: dict[str, list[str]] = {}
        self.open_ids: list[str] = []
        self.tables: dict[str, list[list[str]]] = {}
        self.table: list[str] = []
        self.row: list[str] | None = None
        self.cell: list[str] | None = None
        self.scripts: list[dict[str, str]] = []
        self.pre: dict[str, str] = {}
        self.in_pre: str | None = None
        self.items: dict[str, int] = {}

    def handle_starttag(self, tag, attrs):
        attrs = {k: v or "" for k, v in attrs}
        if tag == "script":
            self.scripts.append(attrs)
        if tag in self.VOID:
            return
        self.stack.append((tag, attrs))
        if "id" in attrs:
            self.ids.setdefault(attrs["id"], [])
            self.open_ids.append(attrs["id"])
        if tag == "table":
            self.table.append(attrs.get("class", ""))
            self.tables.setdefault(self.table[-1], [])
        if tag == "tr" and self.table:
            self.row = []
        if tag in ("td", "th") and self.row is not None:
            self.cell = []
        if tag == "pre":
            self.in_pre = attrs.get("class", "")
            self.pre[self.in_pre] = ""

    def handle_endtag(self, tag):
        if tag in self.VOID:
            return
        while self.stack:
            name, attrs = self.stack.pop()
            if "id" in attrs and attrs["id"] in self.open_ids:
                self.open_ids.remove(attrs["id"])
            if name in ("td", "th") and self.cell is not None and self.row is not None:
                self.row.append(" ".join("".join(self.cell).split()))
                self.cell = None
            if name == "tr" and self.row is not None and self.table:
                self.tables[self.table[-1]].append(self.row)
                self.row = None
            if name == "table" and self.table:
                self.table.pop()
            if name == "pre":
                self.in_pre = None
            if name == tag:
                break

    def handle_data(self, data):
        for i in self.open_ids:
            self.ids[i].append(data)
        if self.cell is not None:
            self.cell.append(data)
        if self.in_pre is not None:
            self.pre[self.in_pre] += data

    def text(self, element_id: str) -> str:
        return " ".join("".join(self.ids.get(element_id, [])).split())


def parse(html: str) -> Page:
    page = Page()
    page.feed(html)
    return page


@pytest.fixture(scope="module")
def selection():
    return run_spec(SPEC)


@pytest.fixture(scope="module")
def html(selection):
    return report.build_report(
        report_studies(selection, 400, seed=7), SPEC.read_text(encoding="utf-8"), SPEC.name
    )


@pytest.fixture(scope="module")
def page(html):
    return parse(html)


def test_every_section_is_there(page):
    for section in SECTIONS:
        assert page.text(section), section
    assert page.text("report-title") == "Camera dolly boom"


# What every output that sizes parts must tell its reader (the project's safety rule; common
# practice for preliminary design tools, no source), read from the rendered box itself.
CAUTION_PARTS = (
    "Preliminary selection only",
    "certified design-allowable data for the chosen grade",
    "appropriate safety factors",
    "local codes",
    "licensed engineering review",
)


def test_caution_is_a_box_near_the_top(html, page):
    shown = page.text("caution")
    for part in CAUTION_PARTS:
        assert part in shown, part
    assert html.index('id="caution"') < html.index('id="summary"')
    assert 'class="caution"' in html


def test_spec_is_shown_exactly_as_written(page):
    assert page.pre["spec"] == SPEC.read_text(encoding="utf-8")


def test_derivation_shows_every_step_of_every_constraint(html, page, selection):
    text = page.text("derivation")
    assert html.count('<div class="derivation">') == len(selection.derivations) == 2
    for d in selection.derivations:
        assert f"{d.constraint.capitalize()} constraint: minimise mass" in text
    # Each step's words appear in order; exponents are raised with <sup>, so compare without them.
    for d in selection.derivations:
        for step in d.steps:
            plain = step.replace("^(", "").replace("^", "").replace("(", "").replace(")", "").replace("_", "")
            shown = text.replace("(", "").replace(")", "")
            assert " ".join(plain.split()[:4]) in shown, step
    assert "M = E1/2/ρ" in text  # E^(1/2)/ρ, written with a superscript


def test_formula_html_raises_powers_and_escapes_the_rest():
    assert str(report.formula_html("F^(1/2)·L^3/δ_max")) == "F<sup>1/2</sup>·L<sup>3</sup>/δ<sub>max</sub>"
    assert str(report.formula_html("<b>E</b>^2")) == "&lt;b&gt;E&lt;/b&gt;<sup>2</sup>"


def test_screens_and_every_rejected_class_with_its_reasons(page, selection):
    rows = page.tables["rejected"][1:]
    assert len(rows) == len(selection.rejected)
    shown = {r[0]: r[2] for r in rows}
    for name, reasons in zip(selection.rejected["name"], selection.rejected["reasons"], strict=True):
        for reason in reasons:
            assert reason in shown[name]
    screens = page.text("screens")
    assert "T_max >= 60 °C" in screens and ">= 60 degC" in screens
    assert "metal, composite, natural" in screens


def test_shortlist_table_has_sizes_utilisations_and_governing(page, selection):
    header, *rows = page.tables["shortlist"]
    assert header[:3] == ["Rank", "Class", "Merit index GPa1/2/(Mg/m³)"]
    assert "Mass kg" in header and "Utilisation" in header and "Governing" in header
    assert len(rows) == len(selection.shortlist)
    short = selection.shortlist
    mass = header.index("Mass kg")
    for row, (_, cand) in zip(rows, short.iterrows(), strict=True):
        assert row[0].rstrip("*") == str(int(cand["rank"]))
        assert row[1].startswith(cand["name"])
        assert row[mass] == format_number(cand["mass"])
        assert f"d = {format_number(cand['dimensions']['d'] * 1e3)}" in row[3]
        assert row[header.index("Governing")] == cand["governing"]
        for kind, value in cand["utilisation"].items():
            assert f"{kind} {value:.2f}" in row[header.index("Utilisation")]


def test_us_units_relabel_the_shortlist(selection):
    page = parse(report.build_report(report_studies(selection, 0), units="us"))
    header = page.tables["shortlist"][0]
    assert "Mass lb" in header and "Size in" in header


def test_robustness_figures_match_the_robust_module(page, selection):
    from selector.pipeline.robust import robustness

    odds = robustness(selection, draws=400, seed=7).table
    header, *rows = page.tables["keep robust"]
    assert header[0] == "Class" and header[-1] == "Rank 5 % – 50 % – 95 %"
    first = odds.iloc[0]
    assert rows[0][0] == first["name"]
    assert rows[0][2] == f"{100 * first['p_best']:.1f} %"
    assert rows[0][4] == f"{100 * first['p_top_k']:.1f} %"
    assert rows[0][5] == f"{first['rank_p05']} – {first['rank_p50']} – {first['rank_p95']}"
    assert "400 draws" in page.text("robustness")


def test_robustness_can_be_left_out(selection):
    page = parse(report.build_report(report_studies(selection, 0)))
    assert "Not computed" in page.text("robustness")


def test_charts_are_embedded_with_plotly_js_once(html, page):
    from plotly.offline import get_plotlyjs

    banner = get_plotlyjs()[:40]
    assert html.count(banner) == 1
    assert 'id="chart-property"' in html and 'id="chart-tradeoff"' in html
    # Nothing is fetched: no script, stylesheet or image comes from elsewhere.
    assert all("src" not in s for s in page.scripts)
    assert "<link" not in html
    assert "mathjax" not in " ".join(str(s) for s in page.scripts).lower()
    assert "@media print" in html and ".modebar" in html


def test_provenance_cites_the_sources_and_the_price_basis(page):
    text = page.text("provenance")
    assert "indicative 2025 USD bands" in text
    keys = [row[0] for row in page.tables["keep"] if row and row[0].startswith(("ashby", "price", "wood"))]
    assert "ashby-mmsd" in keys and "price-2025" in keys
    assert "Materials Selection in Mechanical Design" in text


def test_provenance_states_the_price_basis_from_the_sources_file(page):
    assert "Prices are indicative bands in 2025 US dollars per kilogram" in page.text("provenance")
    text = "## Price\n\nBands in **2031 euros**\nper kilogram.\n\nMore.\n## Next\n"
    assert report.price_basis(text) == "Bands in 2031 euros per kilogram."
    assert report.price_basis("no such heading") == ""


def test_provenance_parses_source_keys():
    text = "| key | source |\n| --- | --- |\n| `a-1` | *Book*, 2nd ed. |\n| `price-2031` | prices |\n"
    assert report.source_keys(text) == {"a-1": "*Book*, 2nd ed.", "price-2031": "prices"}


def _hostile_selection():
    from selector.inputs.spec import spec_from_dict
    from selector.pipeline.selection import select
    from tests.conftest import make_table

    table = make_table(
        [
            {"id": "plain", "name": "Plain class", "E": (10, 20), "rho": (1000, 1200)},
            {"id": "evil", "name": f"Evil {XSS} class", "E": (50, 60), "rho": (900, 1000)},
            {"id": "shut", "name": f"Shut {XSS}", "E": (1, 2), "rho": (100, 200), "family": "polymer"},
        ]
    ).assign(origin="hostile.csv", source=f"my notes {XSS}")
    spec = spec_from_dict(
        {
            "title": f"Boom {XSS}",
            "notes": '<img src=x onerror="alert(2)">',
            "part": {
                "function": "beam",
                "support": "cantilever",
                "load": "end",
                "length": "1 m",
                "force": "10 N",
            },
            "constraint": [{"type": "stiffness", "max_deflection": "5 mm"}],
            "screen": {"families": ["metal"]},
        }
    )
    return select(spec, table)


def test_user_text_is_escaped_everywhere():
    selection = _hostile_selection()
    html = report.build_report(report_studies(selection, 50), f'title = "{XSS}"\n', f"spec{XSS}.toml")
    assert XSS not in html
    assert "<img src=x" not in html
    assert "&lt;script&gt;alert(1)&lt;/script&gt;" in html
    page = parse(html)
    assert page.text("report-title") == f"Boom {XSS}"
    assert f"Evil {XSS} class" in page.text("shortlist")
    assert f"Shut {XSS}" in page.text("screens")
    assert f"my notes {XSS}" in page.text("provenance")
    assert page.pre["spec"] == f'title = "{XSS}"\n'


def test_write_is_atomic_and_keeps_the_old_report(selection, tmp_path, monkeypatch):
    path = tmp_path / "report.html"
    path.write_bytes(b"<p>old report</p>")

    def fail(*args, **kwargs):
        raise OSError(5, "Input/output error")

    monkeypatch.setattr(os, "replace", fail)
    with pytest.raises(OutputError, match="cannot be written"):
        report.write_report(selection, path)
    assert path.read_bytes() == b"<p>old report</p>"
    assert [p.name for p in tmp_path.iterdir()] == ["report.html"]


def test_writing_over_the_spec_is_refused(tmp_path):
    spec = tmp_path / "boom.html"  # a spec may have any name; it is still never overwritten
    spec.write_text(SPEC.read_text(encoding="utf-8"), encoding="utf-8")
    before = spec.read_bytes()
    with pytest.raises(OutputError, match="refusing to write over an input file"):
        api.report_from_spec(spec, spec, robust_draws=0)
    assert spec.read_bytes() == before
    result = CliRunner().invoke(cli, ["report", str(SPEC), "-o", str(SPEC)])
    assert result.exit_code == 2 and isinstance(result.exception, SystemExit)
    assert result.stderr.startswith(f"error: {SPEC}: refusing to write over an input file")


def test_report_needs_an_html_name(tmp_path):
    with pytest.raises(InputError, match="a report is HTML"):
        api.report_from_spec(SPEC, tmp_path / "report.pdf", robust_draws=0)


def _main(*args: str):
    """Run a command in-process; a user-input error ends it through SystemExit only."""
    result = CliRunner().invoke(cli, list(args))
    assert result.exception is None or isinstance(result.exception, SystemExit), result.exception
    return result


def test_missing_output_folder_is_one_clean_line(tmp_path):
    done = _main("report", str(SPEC), "-o", str(tmp_path / "absent" / "report.html"), "--robust", "0")
    assert done.exit_code == 2
    assert done.stderr.startswith("error:")
    assert "does not exist" in done.stderr and "Traceback" not in done.stderr
    assert len(done.stderr.strip().splitlines()) == 1
    assert not (tmp_path / "absent").exists()


def test_cli_refuses_the_spec_as_output(tmp_path):
    spec = tmp_path / "boom.toml"
    spec.write_text(SPEC.read_text(encoding="utf-8"), encoding="utf-8")
    done = _main("report", str(spec), "-o", str(spec))
    assert done.exit_code == 2
    assert done.stderr.startswith("error:") and "refusing" in done.stderr
    assert "Traceback" not in done.stderr


@pytest.mark.parametrize("example", sorted(p.name for p in EXAMPLES.glob("*.toml")))
def test_report_for_every_example(example, tmp_path):
    out = tmp_path / "report.html"
    result = CliRunner().invoke(
        cli,
        ["report", str(EXAMPLES / example), "-o", str(out), "--robust", "200", "--seed", "3"],
        catch_exceptions=False,
    )
    assert result.exit_code == 0, result.output
    page = parse(out.read_text(encoding="utf-8"))
    for section in SECTIONS:
        assert page.text(section), (example, section)
    assert page.pre["spec"] == (EXAMPLES / example).read_text(encoding="utf-8")
    assert "could not" not in page.text("charts") + page.text("robustness")


def test_demo_writes_the_report_and_the_shortlist(tmp_path):
    selection, written = run_demo(tmp_path / "demo", robust_draws=100)
    assert [p.name for p in written] == ["shortlist.csv", "chart.html", "report.html"]
    assert all(p.is_file() for p in written)
    page = parse(written[2].read_text(encoding="utf-8"))
    assert page.text("report-title") == selection.spec.title
