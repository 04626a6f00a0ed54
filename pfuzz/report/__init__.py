"""Reports for people and machines: takes a profile or pattern (and an audit's report), gives
a self-contained HTML page (``html``), charts and automaton drawings as SVG (``charts``), and
the audit in JUnit XML and SARIF 2.1.0 for CI systems (``ci``)."""

__all__: list[str] = []
