"""Build step: the top-level ``profiles/`` folder ships inside the wheel as
``pfuzz/profile/standard/`` (``pfuzz.profile.shipped`` finds it there). Everything else about
the package is in pyproject.toml."""

from setuptools import find_packages, setup

STANDARD = "pfuzz.profile.standard"

setup(
    packages=find_packages(include=["pfuzz", "pfuzz.*"]) + [STANDARD],
    package_dir={STANDARD: "profiles"},
    package_data={STANDARD: ["*.toml"]},
)
