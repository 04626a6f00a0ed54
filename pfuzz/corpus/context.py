"""Context columns for record rows: an allow-list of faker providers, seeded from pfuzz.

A record row mixes pattern fields (strings from our automata) with context
columns that make a fixture look like a real row: a name, a street, a town.
Those values come from faker's *context* providers only, named in the
allow-list below. Faker's pattern-filling helpers (``bothify``, ``lexify``,
``numerify``, ``hexify``, ``regexify`` ...) are deliberately absent: every
string that a validator is tested on comes from pfuzz's automata.

Reproducibility: each context column gets its own ``Faker`` instance, seeded
with ``seed_instance`` from a child seed of the corpus's one ``RandomSource``
(see ``pfuzz.corpus.writer``). Faker's values depend on the faker version (the
manifest records it). Faker's own date providers measure from today, which
would make yesterday's corpus differ from today's; the date providers here
therefore draw from fixed windows (``DATE_WINDOWS``) instead.

Cost: one ``Faker`` per context column, whose creation (loading the locale's
providers) costs far more than the values drawn from it; figures per locale:
``python -m pfuzz.benchmarks components``.
"""

from __future__ import annotations

import datetime
import functools
from typing import Callable

DEFAULT_LOCALE = "en_US"

#: Fixed windows for the date providers, so output never depends on today's date.
DATE_WINDOWS: dict[str, tuple[datetime.date, datetime.date]] = {
    "date": (datetime.date(1970, 1, 1), datetime.date(2024, 12, 31)),
    "date_of_birth": (datetime.date(1930, 1, 1), datetime.date(2006, 12, 31)),
}


def _method(name: str) -> Callable:
    return lambda fake: getattr(fake, name)()


def _dated(name: str) -> Callable:
    start, end = DATE_WINDOWS[name]
    return lambda fake: fake.date_between_dates(date_start=start, date_end=end).isoformat()


_PLAIN = (
    # people
    "name", "first_name", "last_name", "name_female", "name_male", "prefix", "suffix",
    # places
    "address", "street_address", "street_name", "city", "country", "postcode",
    # work and contact
    "company", "job", "email", "safe_email", "user_name", "phone_number",
    # calendar words and free text
    "day_of_week", "month_name", "word", "sentence",
)

#: Provider name (a profile's ``provider`` value) → how to draw one value from a Faker.
CONTEXT_PROVIDERS: dict[str, Callable] = {
    **{name: _method(name) for name in _PLAIN},
    **{name: _dated(name) for name in DATE_WINDOWS},
}


def available_locales() -> tuple[str, ...]:
    from faker.config import AVAILABLE_LOCALES
    return tuple(sorted(AVAILABLE_LOCALES))


def faker_version() -> str:
    import faker
    return faker.VERSION


@functools.lru_cache(maxsize=None)
def _faker_for_checks(locale: str):
    from faker import Faker
    return Faker(locale)


def supports(provider: str, locale: str) -> bool:
    """Whether ``provider`` is allow-listed and faker's ``locale`` offers it."""
    if provider not in CONTEXT_PROVIDERS:
        return False
    return provider in DATE_WINDOWS or hasattr(_faker_for_checks(locale), provider)


def context_values(provider: str, locale: str, seed: int, n: int) -> list[str]:
    """``n`` values of one context column, from a Faker seeded with ``seed``."""
    from faker import Faker

    fake = Faker(locale)
    fake.seed_instance(seed)
    draw = CONTEXT_PROVIDERS[provider]
    return [str(draw(fake)) for _ in range(n)]
