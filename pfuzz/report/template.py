"""The Jinja2 template of the HTML report (``pfuzz.report.page``), styles and script inline.

The script only filters the case tables (by kind, verdict and text) and counts what is
shown; the page reads nothing from the network. Every value is escaped by Jinja2's
autoescaping; values already marked up by ``page.visible`` are ``Markup``.
"""

__all__ = ["TEMPLATE"]

TEMPLATE = r"""<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="pfuzz {{ version }}">
<title>{{ title }}</title>
<style>
body { font: 15px/1.45 system-ui, sans-serif; margin: 0 auto; max-width: 1100px; padding: 1em 1.5em; color: #1d232a; }
h1 { font-size: 1.5em; } h2 { font-size: 1.25em; margin-top: 2em; border-bottom: 1px solid #ccd3da; }
h3 { font-size: 1.05em; }
code, .value, td.mono { font-family: ui-monospace, "DejaVu Sans Mono", monospace; }
.pattern { background: #f3f5f7; padding: .4em .6em; display: inline-block; border-radius: 4px; word-break: break-all; }
.words { color: #38424d; }
dl.facts { display: grid; grid-template-columns: max-content auto; gap: .15em 1em; }
dl.facts dt { color: #56616c; }
.pictures { display: flex; flex-wrap: wrap; gap: 1.5em; align-items: flex-start; }
figure { margin: 0; overflow-x: auto; max-width: 100%; }
figcaption { font-size: .9em; color: #56616c; }
svg .bar { fill: #3a6ea5; } svg .grid { stroke: #e3e7eb; } svg .axis { font-size: 11px; fill: #56616c; }
svg.automaton .edge { fill: none; stroke: #56616c; stroke-width: 1.3; }
svg.automaton marker path { fill: #56616c; }
svg.automaton .state circle { fill: #fff; stroke: #1d232a; stroke-width: 1.5; }
svg.automaton .state.accepting circle { fill: #e8f1e4; }
svg.automaton text { font-size: 12px; } svg.automaton .label { fill: #8a3b12; font-family: ui-monospace, monospace; }
table { border-collapse: collapse; width: 100%; margin: .5em 0; }
th, td { text-align: left; padding: .25em .5em; border-bottom: 1px solid #e3e7eb; vertical-align: top; }
th { background: #f3f5f7; position: sticky; top: 0; }
td.value { white-space: pre-wrap; word-break: break-all; min-width: 10em; }
.ws { color: #9aa5b1; } .ws.edge { color: #c0392b; font-weight: bold; }
.ctl { color: #fff; background: #8e44ad; border-radius: 3px; padding: 0 .15em; font-size: .85em; }
.gap { color: #c0392b; font-weight: bold; } mark { background: #ffe08a; }
.empty { color: #9aa5b1; font-style: italic; }
.accept { color: #1e7b34; } .reject { color: #b03a2e; }
.filters { display: flex; gap: 1em; flex-wrap: wrap; align-items: center; margin: .5em 0; }
.shown { color: #56616c; font-size: .9em; }
.note { background: #fff8e1; padding: .4em .6em; border-left: 3px solid #e0b000; }
.evidence { font-size: 1.05em; padding: .6em .8em; background: #eef4fb; border-left: 4px solid #3a6ea5; }
.disagrees { border-left-color: #b03a2e; background: #fbeeee; }
</style>
</head>
<body>
<h1>{{ title }}</h1>
{% if about %}<p>{{ about }}</p>{% endif %}
<p class="shown">Made by pfuzz {{ version }}. Whitespace is shown as · (space, red at either end), → (tab), ↵ (line feed); other invisible characters as their escape on a purple mark (hover for the name). Highlighted characters are the edit that turns the nearest valid string into a reject; ⌃ marks a deleted character.</p>

{% if audit %}
<section id="audit">
<h2>Audit</h2>
<p class="evidence{% if not audit.agrees %} disagrees{% endif %}">{{ audit.evidence }}</p>
<dl class="facts"><dt>specification</dt><dd><code>{{ audit.specification }}</code></dd>
<dt>validator</dt><dd><code>{{ audit.validator }}</code></dd></dl>
{% if audit.exceptions %}
<h3>Exceptions the validator raised</h3>
<table><tr><th>type</th><th>inputs</th><th>a finding?</th><th>shortest inputs</th></tr>
{% for e in audit.exceptions %}<tr><td><code>{{ e.type }}</code></td><td>{{ "{:,}".format(e.inputs) }}</td><td>{{ "yes" if e.finding else "no (a reject)" }}</td><td class="mono">{{ e.shortest | join(", ") }}</td></tr>{% endfor %}
</table>
{% endif %}
{% for g in audit.groups %}
<h3 class="group">{{ g.title }} <span class="shown">({{ "{:,}".format(g.size) }} string{{ "" if g.size == 1 else "s" }})</span></h3>
{% if g.pattern %}<p>All of them: <code class="pattern">{{ g.pattern }}</code></p>{% endif %}
<table class="findings"><tr><th>value</th><th>expected</th><th>nearest valid string</th><th>edit</th><th>why</th></tr>
{% for r in g.rows %}<tr><td class="value">{{ r.text }}</td><td class="{{ r.expected }}">{{ r.expected }}</td><td class="value">{{ r.witness }}</td><td class="mono">{{ r.edits }}</td><td>{{ r.reason }}</td></tr>{% endfor %}
</table>
{% endfor %}
{% if audit.summary %}
<h3>Cases by category</h3>
<table><tr><th>category</th><th>cases</th><th>wrong accepts</th><th>wrong rejects</th></tr>
{% for r in audit.summary %}<tr><td>{{ r.category }}</td><td>{{ "{:,}".format(r.cases) }}</td><td>{{ "{:,}".format(r.wrong_accepts) }}</td><td>{{ "{:,}".format(r.wrong_rejects) }}</td></tr>{% endfor %}
</table>
{% endif %}
</section>
{% endif %}

{% for v in views %}
<section class="field" id="field-{{ loop.index }}">
<h2>{{ v.name }}</h2>
{% if v.about %}<p>{{ v.about }}</p>{% endif %}
<p><code class="pattern">{{ v.pattern }}</code></p>
{% if v.words %}<p class="words">In words: {{ v.words }}</p>{% endif %}
<dl class="facts">{% for k, val in v.facts %}<dt>{{ k }}</dt><dd>{{ val }}</dd>{% endfor %}</dl>
<div class="pictures">
{% if v.counts_svg %}<figure class="counts-figure">{{ v.counts_svg | safe }}<figcaption>Valid strings per length (logarithmic scale; hover a bar for the exact count).</figcaption></figure>{% endif %}
{% if v.automaton_svg %}<figure class="automaton-figure">{{ v.automaton_svg | safe }}<figcaption>The minimal DFA: state 0 is the start, double circles accept; each arrow is labelled with the characters that take it.</figcaption></figure>
{% elif v.depth_table %}<figure class="automaton-summary"><p class="note">The minimal DFA has too many states to draw readably; states by their distance (characters read) from the start:</p>
<table><tr><th>characters read</th><th>states first reached</th></tr>{% for d, n in v.depth_table %}<tr><td>{{ d }}</td><td>{{ "{:,}".format(n) }}</td></tr>{% endfor %}</table></figure>{% endif %}
</div>
{% if v.rows %}
<h3>Cases</h3>
<div class="filters" data-table="cases-{{ loop.index }}">
<label>kind <select class="filter-kind"><option value="">all</option><option>valid</option><option>near-miss</option><option>boundary</option></select></label>
<label>verdict <select class="filter-expected"><option value="">all</option><option>accept</option><option>reject</option></select></label>
<label>text contains <input class="filter-text" type="search" size="16"></label>
<span class="shown" aria-live="polite"></span>
</div>
{% if v.cut %}<p class="note">{{ "{:,}".format(v.cut) }} more cases are not shown (the page shows {{ "{:,}".format(row_limit) }} per field); the corpus files hold them all.</p>{% endif %}
<table class="cases" id="cases-{{ loop.index }}"><thead><tr><th>value</th><th>length</th><th>kind</th><th>verdict</th><th>nearest valid string</th><th>edit</th><th>why</th></tr></thead><tbody>
{% for r in v.rows %}<tr data-kind="{{ r.kind }}" data-expected="{{ r.expected }}" data-text="{{ r.raw }}"><td class="value">{{ r.text }}</td><td>{{ r.length }}</td><td>{{ r.kind }}</td><td class="{{ r.expected }}">{{ r.expected }}</td><td class="value">{{ r.witness }}</td><td class="mono">{{ r.edits }}</td><td>{{ r.reason }}</td></tr>
{% endfor %}</tbody></table>
{% endif %}
</section>
{% endfor %}
<script>
"use strict";
document.querySelectorAll(".filters").forEach(function (bar) {
  var table = document.getElementById(bar.dataset.table);
  var rows = Array.prototype.slice.call(table.tBodies[0].rows);
  var kind = bar.querySelector(".filter-kind"), expected = bar.querySelector(".filter-expected");
  var text = bar.querySelector(".filter-text"), shown = bar.querySelector(".shown");
  function apply() {
    var n = 0;
    rows.forEach(function (row) {
      var keep = (!kind.value || row.dataset.kind === kind.value) &&
                 (!expected.value || row.dataset.expected === expected.value) &&
                 (!text.value || row.dataset.text.indexOf(text.value) >= 0);
      row.hidden = !keep;
      if (keep) { n += 1; }
    });
    shown.textContent = n + " of " + rows.length + " cases shown";
  }
  [kind, expected].forEach(function (el) { el.addEventListener("change", apply); });
  text.addEventListener("input", apply);
  apply();
});
</script>
</body>
</html>
"""
