"""Tests for pfuzz.report (page, charts, words) and ``pfuzz report``.

References: the page is read back with the standard library's HTML parser; counts shown
in the chart are checked against brute force with ``re``; hostile values must come out as
text, never as markup; the command line runs through click's test runner.
"""

from __future__ import annotations

import itertools
import re
from html.parser import HTMLParser

from pathlib import Path

from click.testing import CliRunner

import pfuzz
from pfuzz.cli import main
from pfuzz.report.charts import DRAW_LIMIT, automaton_svg, counts_svg
from pfuzz.report.page import field_view, render, visible
from pfuzz.report.words import describe

PROFILE_DIR = Path(__file__).resolve().parents[1] / "profiles"


class Collect(HTMLParser):
    """Tags, attributes and text of a page."""

    def __init__(self):
        super().__init__()
        self.tags, self.text, self.scripts = [], [], 0

    def handle_starttag(self, tag, attrs):
        self.tags.append((tag, dict(attrs)))
        self.scripts += tag == "script"

    def handle_data(self, data):
        self.text.append(data)


def parse(page: str) -> Collect:
    reader = Collect()
    reader.feed(page)
    return reader


def test_visible_text_marks_whitespace_and_invisible_characters():
    shown = str(visible(" a\tb\u200b<c>\x00 "))
    assert shown.count('class="ws edge"') == 2                 # the spaces at both ends
    assert 'title="tab"' in shown
    assert "\\u200b" in shown and "ZERO WIDTH SPACE" in shown  # name from unicodedata
    assert "\\x00" in shown and "&lt;c&gt;" in shown and "<c>" not in shown


def test_words_say_the_pattern():
    assert describe(r"[A-Z]{2}-[0-9]{4}") == '2 capital letters, then "-", then 4 digits'
    assert describe(r"(ASH|BRK)-[1-9]") == 'One of "ASH", "BRK", then "-", then one of [1-9]'


def test_counts_chart_holds_the_exact_counts():
    pattern = r"[ab]{1,3}c?"
    lang = pfuzz.compile(pattern, alphabet="[abc]")
    svg = counts_svg(lang.counts(1, 4))
    for n in range(1, 5):      # reference: brute force with re over abc
        exact = sum(1 for t in itertools.product("abc", repeat=n) if re.fullmatch(pattern, "".join(t)))
        assert f"length {n}: {exact:,} string" in svg
    assert svg.count("<rect") == 4


def test_automaton_is_drawn_up_to_the_limit_then_summarised():
    small = pfuzz.compile(r"[A-Z]{2}-[0-9]{4}")
    svg = automaton_svg(small.dfa, use_graphviz=False)
    assert svg.count("<circle") == small.states + len(small.dfa.accepting)
    assert "[0-9]" in svg and "[A-Z]" in svg
    big = pfuzz.compile(r"[a-z]{%d}" % (DRAW_LIMIT + 1))
    assert automaton_svg(big.dfa) is None
    view = field_view(big, "big", r"[a-z]{%d}" % (DRAW_LIMIT + 1), valid=3, rejects=3)
    assert view.automaton_svg is None and sum(n for _, n in view.depth_table) == big.states


def test_hostile_values_stay_text():
    lang = pfuzz.compile(r"<script>x</script>|a\x00b", alphabet="ascii")
    page = render("t", [field_view(lang, "f", lang.pattern, valid=5, rejects=5)])
    reader = parse(page)
    assert reader.scripts == 1                                   # only the page's own filter
    assert not any(tag == "script" and "src" in attrs for tag, attrs in reader.tags)
    assert "&lt;script&gt;" in page
    assert not re.search(r"""(src|href)=["']?https?:""", page)   # nothing from the network


def test_report_command_writes_one_page(tmp_path):
    out = tmp_path / "demo.html"
    result = CliRunner().invoke(main, ["report", "profiles/demo.toml", "--out", str(out)])
    assert result.exit_code == 0, result.output
    reader = parse(out.read_text(encoding="utf-8"))
    sections = [a for t, a in reader.tags if t == "section"]
    assert len(sections) == 6                                    # the demo's six fields
    assert sum(1 for t, a in reader.tags if t == "svg" and "automaton" in a.get("class", "")) >= 5
    single = tmp_path / "one.html"
    result = CliRunner().invoke(main, ["report", "--pattern", "profiles/demo.toml:postcode",
                                       "--out", str(single)])
    assert result.exit_code == 0, result.output
    assert "postcode" in single.read_text(encoding="utf-8")


def test_report_command_refuses_bad_input(tmp_path):
    result = CliRunner().invoke(main, ["report", "--out", str(tmp_path / "x.html")])
    assert result.exit_code == 2 and "exactly one" in result.output
    bad = tmp_path / "audit.json"
    bad.write_text("{}", encoding="utf-8")
    result = CliRunner().invoke(main, ["report", "--pattern", "a", "--audit", str(bad),
                                       "--out", str(tmp_path / "x.html")])
    assert result.exit_code == 2 and "not a pfuzz audit report" in result.output


def test_audit_and_corpus_write_the_page_and_ci_formats(tmp_path, monkeypatch):
    (tmp_path / "checks_page.py").write_text(
        'import re\ndef is_code(text):\n    return re.match(r"[A-C][0-2]$", text) is not None\n',
        encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    monkeypatch.syspath_prepend(str(tmp_path))
    base = ["audit", "--pattern", "[A-C][0-2]", "--target", "checks_page:is_code", "--no-learn",
            "--valid", "20", "--rejects", "20"]
    result = CliRunner().invoke(main, [*base, "--html", "audit.html", "--format", "junit"])
    assert result.exit_code == 1, result.output
    assert result.stdout.startswith("<?xml") and "<failure" in result.stdout
    page = (tmp_path / "audit.html").read_text(encoding="utf-8")
    assert 'id="audit"' in page and "↵" in page          # "A0\n" is wrongly accepted ($)
    result = CliRunner().invoke(main, [*base, "--format", "sarif"])
    assert '"version": "2.1.0"' in result.stdout
    result = CliRunner().invoke(main, ["corpus", str(PROFILE_DIR / "demo.toml"), "--out",
                                       "corpus", "--html", "corpus.html"])
    assert result.exit_code == 0, result.output
    page = (tmp_path / "corpus.html").read_text(encoding="utf-8")
    valid = (tmp_path / "corpus/fields/postcode/valid.jsonl").read_text(encoding="utf-8")
    first = valid.splitlines()[0].split('"text": "')[1].split('"')[0]
    assert first.replace(" ", '<span class="ws" title="space">·</span>') in page
