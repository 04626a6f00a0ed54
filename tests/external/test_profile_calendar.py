"""The date and time profiles checked against the stdlib ``datetime`` and ``calendar``.

ISO 8601 calendar dates (extended format YYYY-MM-DD, Gregorian calendar with
its leap-year rule) and 24-hour times (hh:mm:ss). The subject is each field's
language as the profile loader builds it; the exact counts of both fields are checked
against ``datetime`` in ``test_profiles_standards.py``.
"""

from __future__ import annotations

import calendar
import datetime

import pytest

from test_profiles_standards import cases_to_check, field_language

DATE = ("iso-date.toml", "date")
TIME = ("time24.toml", "time")


def date_standard(s: str) -> bool:
    # ISO 8601 extended calendar date: four-digit year, month, day with hyphens;
    # the date itself must exist: stdlib datetime.date (proleptic Gregorian, years 1-9999)
    if not (len(s) == 10 and s[4] == s[7] == "-" and s.replace("-", "").isascii()
            and s.replace("-", "").isdigit() and s.count("-") == 2):
        return False
    try:
        datetime.date(int(s[:4]), int(s[5:7]), int(s[8:]))
    except ValueError:
        return False
    return True


def time_standard(s: str) -> bool:
    # hh:mm:ss with two digits each; the time must exist: stdlib datetime.time.fromisoformat
    if not (len(s) == 8 and s[2] == s[5] == ":" and s.replace(":", "").isascii()
            and s.replace(":", "").isdigit()):
        return False
    try:
        datetime.time.fromisoformat(s)
    except ValueError:
        return False
    return True


@pytest.mark.parametrize("field,standard", [(DATE, date_standard), (TIME, time_standard)])
def test_samples_boundaries_and_near_misses_agree_with_datetime(field, standard):
    lang = field_language(*field)
    for text in cases_to_check(*field):
        assert lang.accepts(text) == standard(text), text


@pytest.mark.parametrize("year", [1, 4, 100, 400, 1582, 1900, 2000, 2023, 2024, 9999])
def test_every_month_and_day_of_whole_years(year):
    # months 00-19 and 99, days 00-39 and 99: every real date and every near-by non-date
    lang = field_language(*DATE)
    accepted = 0
    for month in [*range(20), 99]:
        for day in [*range(40), 99]:
            text = f"{year:04d}-{month:02d}-{day:02d}"
            assert lang.accepts(text) == date_standard(text), text
            accepted += lang.accepts(text)
    assert accepted == (366 if calendar.isleap(year) else 365)  # stdlib calendar


def test_leap_day_exactly_in_leap_years():
    lang = field_language(*DATE)
    for year in range(1, 10000):
        # stdlib calendar.isleap: divisible by 4, except centuries not divisible by 400
        assert lang.accepts(f"{year:04d}-02-29") == calendar.isleap(year), year


def test_year_zero_is_not_admitted():
    # ISO 8601 admits year 0000 only by agreement between the parties; the profile does not
    # (and stdlib datetime.date cannot represent it)
    lang = field_language(*DATE)
    assert not lang.accepts("0000-01-01") and not lang.accepts("0000-02-29")
    assert lang.accepts("0001-01-01") and lang.accepts("9999-12-31")
    assert not lang.accepts("10000-01-01") and not lang.accepts("2024-1-01")


def test_sampled_dates_round_trip_through_fromisoformat():
    for text in field_language(*DATE).sample(500, seed=7):
        assert datetime.date.fromisoformat(text).isoformat() == text  # stdlib datetime


def test_faker_dates_over_the_whole_range_are_accepted():
    from faker import Faker

    fake = Faker()
    fake.seed_instance(7)
    lang = field_language(*DATE)
    for _ in range(300):  # faker's own date provider, over years 1-9999
        value = fake.date_between_dates(datetime.date(1, 1, 1), datetime.date(9999, 12, 31))
        assert lang.accepts(value.isoformat()), value


def test_time_language_is_exactly_the_86400_seconds_of_a_day():
    lang = field_language(*TIME)
    assert lang.total == 24 * 60 * 60
    # all 86,400 are accepted and the total is 86,400: the language is exactly this set
    for h in range(24):
        for m in range(60):
            for s in range(60):
                assert lang.accepts(f"{h:02d}:{m:02d}:{s:02d}")


def test_time_edges_against_fromisoformat():
    lang = field_language(*TIME)
    for h in range(26):
        for m in [*range(62), 99]:
            for s in (0, 1, 9, 10, 30, 58, 59, 60, 61, 99):
                text = f"{h:02d}:{m:02d}:{s:02d}"
                assert lang.accepts(text) == time_standard(text), text
    # end of day and leap second are excluded by the profile's stated choice, as datetime does
    for text in ("24:00:00", "23:59:60"):
        assert not lang.accepts(text) and not time_standard(text)
    for text in ("12:00", "12:00:00.5", "120000", "T12:00:00", "12:00:00Z"):
        assert not lang.accepts(text)
