"""pfuzz benchmarks: speed and memory, not timed tests. Run ``python -m pfuzz.benchmarks``."""
