"""A generated gallery: one report definition with a chart of every intent in every form, and more.

The scenario is invented: the Kestrel Sound Ferry Trust, a small ferry operator reporting twelve
months to November 2026, with data taken on 9 November (so November is a partial month). The data is
drawn from a seeded random generator, so the same seed gives the same definition, byte for byte.

Every measure is generated once and every dataset that carries it copies the same values, so the
gallery tells one story (a measure never has two values for one period).

It holds, on purpose: a partial last period (with and without a run-rate projection), a column of
estimates, a missing month, targets (a column and a single value), control charts with and without a
signal, a one-point series, daily, weekly, monthly, quarterly and yearly data, a logarithmic scale,
intervals (bounds and spreads), a pie that can be read and one that cannot, a share missing an
expected part, more series than colours (split into panels) and a highlighted series.

``python -m tests.quality.gallery [-o gallery.json] [--seed N]`` writes it out.
"""

from __future__ import annotations

import argparse
import json
import math
import random
import sys
from datetime import date, timedelta
from pathlib import Path
from typing import Any

SEED = 13

MONTHS = [date(2025, 12, 1)] + [date(2026, m, 1) for m in range(1, 12)]
"""December 2025 to November 2026; November is partial at ``AS_OF``."""
AS_OF = "2026-11-09T08:00:00+00:00"
MISSING_MONTH = date(2026, 8, 1)
"""The month the crossing log was lost: no data for it in the crossings dataset."""
SOURCE = "Kestrel Sound Ferry Trust operations log (invented for this example)"

ROUTES = ["Harbour to Isle", "Isle to Point", "Point to Mill Bay", "Mill Bay loop", "Night ferry"]
PIERS = ["North pier", "South pier", "Isle slip", "Point jetty", "Mill Bay quay"]
VESSELS = ["Kestrel", "Curlew", "Tern", "Merlin"]
TICKETS = ["Single fares", "Return fares", "Season passes", "Vehicle fares", "Group bookings"]


def _iso(day: date) -> str:
    return day.isoformat()


def _month_days(day: date) -> int:
    following = date(day.year + day.month // 12, day.month % 12 + 1, 1)
    return (following - day).days


class _Story:
    """Every measure of the scenario, generated once from the seed."""

    def __init__(self, seed: int) -> None:
        rnd = random.Random(seed)
        self.rnd = rnd
        season = [0.78, 0.74, 0.80, 0.92, 1.00, 1.10, 1.22, 1.30, 1.28, 1.08, 0.95, 0.86]
        # passengers: complete months, then 9 of 30 days of November (the partial month)
        self.passengers: list[int] = []
        for i, month in enumerate(MONTHS):
            whole = 21000 * season[i] * (1 + 0.01 * i) * rnd.uniform(0.97, 1.03)
            if month == MONTHS[-1]:
                whole *= 8 / _month_days(month)  # 8 whole days elapsed at AS_OF
            self.passengers.append(round(whole))
        self.vehicles = [round(p * rnd.uniform(0.115, 0.125)) for p in self.passengers]
        self.scheduled = [
            round(1480 * (1.15 if 5 <= i <= 9 else 1.0)) for i, _ in enumerate(MONTHS[:-1])
        ]
        self.sailed = [s - rnd.randint(4, 40) for s in self.scheduled]
        self.fuel = [round(s * rnd.uniform(61.0, 64.0)) for s in self.sailed]
        self.cost = [round(180000 + 14.5 * p + rnd.uniform(-4000, 4000)) for p in self.passengers]
        route_share = [0.34, 0.22, 0.18, 0.14, 0.07, 0.05]
        names = [*ROUTES, "Charter sailings"]
        self.by_route = {
            name: [round(p * share * rnd.uniform(0.9, 1.1)) for p in self.passengers[:-1]]
            for name, share in zip(names, route_share, strict=True)
        }
        self.complaints = [rnd.randint(30, 44) for _ in range(23)] + [61]
        self.complaints_calm = [rnd.randint(30, 44) for _ in range(24)]


def _column(name: str, kind: str, unit: str | None = None, **extra: Any) -> dict[str, Any]:
    found: dict[str, Any] = {"name": name, "type": kind}
    if unit is not None:
        found["unit"] = unit
    return {**found, **extra}


def _timed(
    name: str, description: str, time: str, frequency: str, columns: list[dict[str, Any]]
) -> dict[str, Any]:
    return {
        "name": name,
        "description": description,
        "source": SOURCE,
        "time_column": time,
        "frequency": frequency,
        "columns": [_column(time, "date"), *columns],
        "rows": [],
    }


def _plain(name: str, description: str, columns: list[dict[str, Any]]) -> dict[str, Any]:
    return {
        "name": name,
        "description": description,
        "source": SOURCE,
        "columns": columns,
        "rows": [],
    }


def _datasets(story: _Story) -> list[dict[str, Any]]:
    rnd = story.rnd
    months = [_iso(m) for m in MONTHS]
    found: list[dict[str, Any]] = []

    passengers = _timed(
        "passengers",
        "Passengers and vehicles carried each month; November is still running.",
        "month",
        "month",
        [
            _column("passengers", "integer", "passengers", projectable=True),
            _column("vehicles", "integer", "vehicles"),
        ],
    )
    passengers["rows"] = [
        {"month": m, "passengers": p, "vehicles": v}
        for m, p, v in zip(months, story.passengers, story.vehicles, strict=True)
    ]
    found.append(passengers)

    crossings = _timed(
        "crossings",
        "Crossings scheduled and sailed; the August log was lost.",
        "month",
        "month",
        [_column("scheduled", "integer", "crossings"), _column("sailed", "integer", "crossings")],
    )
    crossings["rows"] = [
        {"month": m, "scheduled": s, "sailed": d}
        for m, s, d in zip(months[:-1], story.scheduled, story.sailed, strict=True)
        if m != _iso(MISSING_MONTH)
    ]
    found.append(crossings)

    fuel = _timed(
        "fuel",
        "Fuel burnt each month, and the budget's forecast (an estimate).",
        "month",
        "month",
        [
            _column("fuel_litres", "integer", "litres"),
            _column("fuel_forecast", "integer", "litres", estimate=True),
        ],
    )
    fuel["rows"] = [
        {
            "month": m,
            "fuel_litres": f,
            "fuel_forecast": round(f * rnd.uniform(0.96, 1.04), -2),
        }
        for m, f in zip(months[:-1], story.fuel, strict=True)
    ]
    found.append(fuel)

    routes = _timed(
        "route_passengers",
        "Passengers by route, complete months only.",
        "month",
        "month",
        [_column(_slug(name), "integer", "passengers") for name in story.by_route],
    )
    routes["rows"] = [
        {"month": m, **{_slug(name): values[i] for name, values in story.by_route.items()}}
        for i, m in enumerate(months[:-1])
    ]
    found.append(routes)

    money = _timed(
        "cost_and_use",
        "Operating cost and passengers each month (complete months).",
        "month",
        "month",
        [
            _column("operating_cost", "number", "GBP"),
            _column("passengers", "integer", "passengers"),
        ],
    )
    money["rows"] = [
        {"month": m, "operating_cost": c, "passengers": p}
        for m, c, p in zip(months[:-1], story.cost[:-1], story.passengers[:-1], strict=True)
    ]
    found.append(money)

    complaints = _timed(
        "complaints",
        "Complaints received each month, two years.",
        "month",
        "month",
        [_column("complaints", "integer", "complaints")],
    )
    first = date(2024, 11, 1)
    history = [
        date(first.year + (first.month - 1 + k) // 12, (first.month - 1 + k) % 12 + 1, 1)
        for k in range(24)
    ]
    complaints["rows"] = [
        {"month": _iso(m), "complaints": c} for m, c in zip(history, story.complaints, strict=True)
    ]
    found.append(complaints)

    calm = _timed(
        "lost_property",
        "Items handed in to lost property each month, two years.",
        "month",
        "month",
        [_column("items", "integer", "items")],
    )
    calm["rows"] = [
        {"month": _iso(m), "items": c} for m, c in zip(history, story.complaints_calm, strict=True)
    ]
    found.append(calm)

    days = [date(2026, 9, 1) + timedelta(days=k) for k in range(68)]
    daily = _timed(
        "daily_passengers",
        "Passengers each day since 1 September; 8 November is the last whole day.",
        "day",
        "day",
        [_column("day_passengers", "integer", "passengers")],
    )
    daily["rows"] = [
        {
            "day": _iso(d),
            "day_passengers": round(
                (900 if d.weekday() >= 5 else 620) * (1 - k / 200) * rnd.uniform(0.9, 1.1)
            ),
        }
        for k, d in enumerate(days)
    ]
    found.append(daily)

    mondays = [date(2026, 5, 4) + timedelta(weeks=k) for k in range(26)]
    weekly = _timed(
        "weekly_waits",
        "Mean wait at the North pier each ISO week.",
        "week",
        "week",
        [_column("mean_wait", "number", "minutes")],
    )
    weekly["rows"] = [
        {"week": _iso(w), "mean_wait": round(rnd.gauss(7.5, 0.8), 1)} for w in mondays
    ]
    found.append(weekly)

    quarters = [date(2024 + q // 4, 3 * (q % 4) + 1, 1) for q in range(11)]
    quarterly = _timed(
        "quarterly_income",
        "Fare income each quarter.",
        "quarter",
        "quarter",
        [_column("fare_income", "number", "GBP")],
    )
    quarterly["rows"] = [
        {
            "quarter": _iso(q),
            "fare_income": round(310000 * (1.06 ** (k / 4)) * rnd.uniform(0.95, 1.05), 2),
        }
        for k, q in enumerate(quarters)
    ]
    found.append(quarterly)

    yearly = _timed(
        "yearly_members",
        "Members of the Trust at each year's end.",
        "year",
        "year",
        [_column("members", "integer", "members")],
    )
    yearly["rows"] = [
        {"year": f"{2016 + k}-01-01", "members": round(410 * 1.09**k * rnd.uniform(0.97, 1.03))}
        for k in range(10)
    ]
    found.append(yearly)

    growth = _timed(
        "app_bookings",
        "Bookings made in the new app each month since its launch.",
        "month",
        "month",
        [_column("app_bookings", "integer", "bookings")],
    )
    growth["rows"] = [
        {"month": m, "app_bookings": round(40 * math.exp(0.55 * k) * rnd.uniform(0.9, 1.1))}
        for k, m in enumerate(months[:-1])
    ]
    found.append(growth)

    launch = _timed(
        "night_ferry_launch",
        "Passengers on the new night ferry in its first month.",
        "month",
        "month",
        [_column("night_passengers", "integer", "passengers")],
    )
    launch["rows"] = [{"month": _iso(date(2026, 10, 1)), "night_passengers": 1184}]
    found.append(launch)

    punctual = _plain(
        "route_punctuality",
        "Share of crossings leaving within five minutes, October 2026.",
        [_column("route", "text"), _column("on_time", "number", "%")],
    )
    punctual["rows"] = [{"route": r, "on_time": round(rnd.uniform(84, 97), 1)} for r in ROUTES]
    found.append(punctual)

    rating = _plain(
        "route_rating",
        "Mean passenger rating (1 to 5) by route, with spread and responses, October 2026.",
        [
            _column("route", "text"),
            _column("rating", "number", "points"),
            _column("sd", "number", "points"),
            _column("responses", "integer", "responses"),
        ],
    )
    rating["rows"] = [
        {
            "route": r,
            "rating": round(rnd.uniform(3.7, 4.4), 2),
            "sd": round(rnd.uniform(0.7, 1.0), 2),
            "responses": rnd.randint(60, 240),
        }
        for r in ROUTES
    ]
    found.append(rating)

    waits = _plain(
        "pier_waits",
        "Mean wait by pier with its 90 % interval, October 2026.",
        [
            _column("pier", "text"),
            _column("wait", "number", "minutes"),
            _column("wait_low", "number", "minutes"),
            _column("wait_high", "number", "minutes"),
        ],
    )
    rows = []
    for p in PIERS:
        mean = round(rnd.uniform(4.0, 11.0), 1)
        half = round(rnd.uniform(0.6, 1.8), 1)
        rows.append({"pier": p, "wait": mean, "wait_low": mean - half, "wait_high": mean + half})
    waits["rows"] = rows
    found.append(waits)

    revenue = _plain(
        "ticket_revenue",
        "Fare revenue by ticket type, October 2026; group bookings were not yet counted.",
        [_column("ticket", "text"), _column("revenue", "number", "GBP")],
    )
    parts = [48210.0, 36440.0, 22950.0, 17480.0]
    revenue["rows"] = [{"ticket": t, "revenue": v} for t, v in zip(TICKETS, parts, strict=False)]
    found.append(revenue)

    seats = _plain(
        "seat_classes",
        "Seats sold by class on the Isle route, October 2026.",
        [_column("seat_class", "text"), _column("seats", "integer", "seats")],
    )
    seats["rows"] = [
        {"seat_class": "Standard", "seats": 6120},
        {"seat_class": "Saloon", "seats": 2310},
        {"seat_class": "Cycle space", "seats": 840},
    ]
    found.append(seats)

    crowded = _plain(
        "pier_footfall",
        "People passing the ticket gates by pier, October 2026.",
        [_column("pier", "text"), _column("footfall", "integer", "people")],
    )
    crowded["rows"] = [
        {"pier": p, "footfall": 5000 + 60 * k + rnd.randint(0, 40)} for k, p in enumerate(PIERS)
    ]
    found.append(crowded)

    vessels = _plain(
        "vessel_delivery",
        "Crossings sailed against plan by vessel, October 2026.",
        [
            _column("vessel", "text"),
            _column("vessel_sailed", "integer", "crossings"),
            _column("vessel_planned", "integer", "crossings"),
        ],
    )
    vessels["rows"] = [
        {"vessel": v, "vessel_sailed": plan - rnd.randint(-6, 30), "vessel_planned": plan}
        for v, plan in zip(VESSELS, [420, 390, 310, 180], strict=True)
    ]
    found.append(vessels)

    delays = _plain(
        "delays",
        "Minutes late of each late departure, October 2026, by route.",
        [_column("delay_route", "text"), _column("minutes_late", "number", "minutes")],
    )
    delays["rows"] = [
        {
            "delay_route": ROUTES[k % 4],
            "minutes_late": round(2.0 + rnd.expovariate(1 / (4.0 + k % 4)), 1),
        }
        for k in range(96)
    ]
    found.append(delays)

    profile = _plain(
        "route_profile",
        "Length, punctuality and cost of each route, October 2026.",
        [
            _column("route", "text"),
            _column("length_km", "number", "km"),
            _column("on_time", "number", "%"),
            _column("cost_per_crossing", "number", "GBP"),
        ],
    )
    on_time = {row["route"]: row["on_time"] for row in punctual["rows"]}
    profile["rows"] = [
        {
            "route": r,
            "length_km": length,
            "on_time": on_time[r],
            "cost_per_crossing": round(55 + 21 * length * rnd.uniform(0.9, 1.1), 2),
        }
        for r, length in zip(ROUTES, [3.2, 5.8, 7.1, 9.6, 12.4], strict=True)
    ]
    found.append(profile)

    return found


def _slug(name: str) -> str:
    return "".join(c if c.isalnum() else "_" for c in name.lower()).strip("_")


def _sections(story: _Story) -> list[dict[str, Any]]:
    routes = [_slug(name) for name in story.by_route]
    trend = "trend"
    return [
        {
            "heading": "Passengers",
            "narrative": "Passengers follow the seasons; November is still running.",
            "charts": [
                {
                    "id": "passengers-projected",
                    "intent": trend,
                    "title": "Passengers by month, with November's run rate",
                    "dataset": "passengers",
                    "measures": ["passengers"],
                    "from_zero": True,
                    "projection": {"method": "run_rate"},
                },
                {
                    "id": "passengers-fitted",
                    "intent": trend,
                    "title": "Passengers by month, scale fitted to the data",
                    "dataset": "passengers",
                    "measures": ["passengers"],
                },
                {
                    "id": "vehicles-partial",
                    "intent": trend,
                    "title": "Vehicles carried by month",
                    "dataset": "passengers",
                    "measures": ["vehicles"],
                    "from_zero": True,
                },
                {
                    "id": "routes-panels",
                    "intent": trend,
                    "title": "Passengers on each route",
                    "subtitle": "Six routes: more than colours can tell apart",
                    "dataset": "route_passengers",
                    "measures": routes,
                },
                {
                    "id": "routes-focus",
                    "intent": trend,
                    "title": "The Harbour to Isle route against the rest",
                    "dataset": "route_passengers",
                    "measures": routes,
                    "focus": routes[0],
                },
                {
                    "id": "routes-two",
                    "intent": trend,
                    "title": "The two busiest routes",
                    "dataset": "route_passengers",
                    "measures": routes[:2],
                    "from_zero": True,
                },
                {
                    "id": "daily-passengers",
                    "intent": trend,
                    "title": "Passengers each day this autumn",
                    "dataset": "daily_passengers",
                    "measures": ["day_passengers"],
                    "from_zero": True,
                },
                {
                    "id": "night-ferry-first-month",
                    "intent": trend,
                    "title": "Night ferry passengers in its first month",
                    "subtitle": "One month of data: a single point",
                    "dataset": "night_ferry_launch",
                    "measures": ["night_passengers"],
                    "from_zero": True,
                },
                {
                    "id": "app-bookings-log",
                    "intent": trend,
                    "title": "App bookings by month, logarithmic scale",
                    "dataset": "app_bookings",
                    "measures": ["app_bookings"],
                    "scale": "log",
                },
                {
                    "id": "members-yearly",
                    "intent": trend,
                    "title": "Members at each year's end",
                    "dataset": "yearly_members",
                    "measures": ["members"],
                    "from_zero": True,
                },
            ],
            "tables": [
                {"id": "passengers-table", "title": "Passengers by month", "dataset": "passengers"}
            ],
        },
        {
            "heading": "Service delivered",
            "narrative": "The August crossing log was lost, so August has no count.",
            "charts": [
                {
                    "id": "crossings-trend",
                    "intent": trend,
                    "title": "Crossings scheduled and sailed",
                    "dataset": "crossings",
                    "measures": ["scheduled", "sailed"],
                },
                {
                    "id": "crossings-index",
                    "intent": "relative_change",
                    "title": "Crossings scheduled and sailed, indexed",
                    "dataset": "crossings",
                    "measures": ["scheduled", "sailed"],
                },
                {
                    "id": "sailed-control",
                    "intent": "movement",
                    "title": "Crossings sailed: signal or routine variation?",
                    "dataset": "crossings",
                    "measure": "sailed",
                    "min_history": 6,
                },
                {
                    "id": "fuel-forecast",
                    "intent": trend,
                    "title": "Fuel burnt against the budget's forecast",
                    "dataset": "fuel",
                    "measures": ["fuel_litres", "fuel_forecast"],
                },
                {
                    "id": "fuel-forecast-alone",
                    "intent": trend,
                    "title": "The budget's fuel forecast",
                    "dataset": "fuel",
                    "measures": ["fuel_forecast"],
                    "from_zero": True,
                },
                {
                    "id": "weekly-waits",
                    "intent": trend,
                    "title": "Mean wait at the North pier by week",
                    "dataset": "weekly_waits",
                    "measures": ["mean_wait"],
                },
                {
                    "id": "weekly-waits-control",
                    "intent": "movement",
                    "title": "Waits at the North pier: signal or routine variation?",
                    "dataset": "weekly_waits",
                    "measure": "mean_wait",
                    "run_length": 7,
                },
            ],
            "tables": [
                {"id": "crossings-table", "title": "Crossings by month", "dataset": "crossings"}
            ],
        },
        {
            "heading": "Money",
            "charts": [
                {
                    "id": "cost-vs-passengers",
                    "intent": "relative_change",
                    "title": "Operating cost and passengers since December 2025",
                    "dataset": "cost_and_use",
                    "measures": ["operating_cost", "passengers"],
                },
                {
                    "id": "cost-vs-passengers-panels",
                    "intent": "relative_change",
                    "title": "Operating cost and passengers, side by side",
                    "dataset": "cost_and_use",
                    "measures": ["operating_cost", "passengers"],
                    "form": "panels",
                },
                {
                    "id": "cost-vs-passengers-change",
                    "intent": "relative_change",
                    "title": "Change in cost and passengers since March",
                    "dataset": "cost_and_use",
                    "measures": ["operating_cost", "passengers"],
                    "base_period": "2026-03-01",
                    "index_as": "percent_change",
                },
                {
                    "id": "fuel-and-crossings-panels",
                    "intent": "relative_change",
                    "title": "Fuel burnt and its forecast, side by side",
                    "dataset": "fuel",
                    "measures": ["fuel_litres", "fuel_forecast"],
                    "form": "panels",
                },
                {
                    "id": "quarterly-income",
                    "intent": trend,
                    "title": "Fare income by quarter",
                    "dataset": "quarterly_income",
                    "measures": ["fare_income"],
                    "from_zero": True,
                },
                {
                    "id": "ticket-revenue",
                    "intent": "share",
                    "title": "Fare revenue by ticket type, October 2026",
                    "dataset": "ticket_revenue",
                    "category": "ticket",
                    "measure": "revenue",
                    "expected_categories": TICKETS,
                },
                {
                    "id": "ticket-revenue-whole",
                    "intent": "share",
                    "title": "Fare revenue against the ledger's total",
                    "dataset": "ticket_revenue",
                    "category": "ticket",
                    "measure": "revenue",
                    "whole": 125080.0,
                },
                {
                    "id": "seat-classes-pie",
                    "intent": "share",
                    "title": "Seats sold by class on the Isle route",
                    "dataset": "seat_classes",
                    "category": "seat_class",
                    "measure": "seats",
                    "allow_pie": True,
                },
                {
                    "id": "footfall-pie-refused",
                    "intent": "share",
                    "title": "People at the ticket gates by pier",
                    "subtitle": "Asked for as a pie; the parts are too alike to read as one",
                    "dataset": "pier_footfall",
                    "category": "pier",
                    "measure": "footfall",
                    "allow_pie": True,
                },
                {
                    "id": "cost-per-crossing",
                    "intent": "compare",
                    "title": "Cost per crossing by route",
                    "dataset": "route_profile",
                    "category": "route",
                    "measure": "cost_per_crossing",
                    "sort": "as_given",
                },
            ],
        },
        {
            "heading": "Service quality",
            "charts": [
                {
                    "id": "on-time-by-route",
                    "intent": "compare",
                    "title": "Crossings on time by route, October 2026",
                    "dataset": "route_punctuality",
                    "category": "route",
                    "measure": "on_time",
                    "baseline": 80,
                },
                {
                    "id": "on-time-ascending",
                    "intent": "compare",
                    "title": "Crossings on time, least punctual first",
                    "dataset": "route_punctuality",
                    "category": "route",
                    "measure": "on_time",
                    "sort": "ascending",
                },
                {
                    "id": "on-time-differences",
                    "intent": "compare",
                    "title": "Crossings on time: the differences between routes",
                    "dataset": "route_punctuality",
                    "category": "route",
                    "measure": "on_time",
                    "focus": "differences",
                },
                {
                    "id": "rating-by-route",
                    "intent": "compare",
                    "title": "Passenger rating by route",
                    "subtitle": "Mean of 1–5 ratings with 95 % intervals",
                    "dataset": "route_rating",
                    "category": "route",
                    "measure": "rating",
                    "focus": "differences",
                    "interval": {"sd": "sd", "n": "responses", "level": 0.95},
                },
                {
                    "id": "waits-by-pier",
                    "intent": "compare",
                    "title": "Mean wait by pier, with 90 % intervals",
                    "dataset": "pier_waits",
                    "category": "pier",
                    "measure": "wait",
                    "interval": {"lower": "wait_low", "upper": "wait_high", "level": 0.9},
                },
                {
                    "id": "complaints-signal",
                    "intent": "movement",
                    "title": "Complaints per month: signal or routine variation?",
                    "dataset": "complaints",
                    "measure": "complaints",
                },
                {
                    "id": "lost-property-routine",
                    "intent": "movement",
                    "title": "Lost property per month: routine variation",
                    "dataset": "lost_property",
                    "measure": "items",
                },
                {
                    "id": "vessel-target-bars",
                    "intent": "target",
                    "title": "Crossings sailed against plan by vessel",
                    "dataset": "vessel_delivery",
                    "category": "vessel",
                    "actual": "vessel_sailed",
                    "target": "vessel_planned",
                },
                {
                    "id": "vessel-target-deviation",
                    "intent": "target",
                    "title": "Crossings sailed minus plan by vessel",
                    "dataset": "vessel_delivery",
                    "category": "vessel",
                    "actual": "vessel_sailed",
                    "target": "vessel_planned",
                    "form": "deviation",
                },
                {
                    "id": "on-time-target",
                    "intent": "target",
                    "title": "Crossings on time against the 90 % standard",
                    "dataset": "route_punctuality",
                    "category": "route",
                    "actual": "on_time",
                    "target_value": 90,
                },
                {
                    "id": "on-time-target-deviation",
                    "intent": "target",
                    "title": "Crossings on time above or below the 90 % standard",
                    "dataset": "route_punctuality",
                    "category": "route",
                    "actual": "on_time",
                    "target_value": 90,
                    "form": "deviation",
                },
            ],
        },
        {
            "heading": "Delays and routes",
            "charts": [
                {
                    "id": "delays-histogram",
                    "intent": "distribution",
                    "title": "How late were late departures?",
                    "dataset": "delays",
                    "measure": "minutes_late",
                },
                {
                    "id": "delays-histogram-fine",
                    "intent": "distribution",
                    "title": "How late were late departures, in finer bins",
                    "dataset": "delays",
                    "measure": "minutes_late",
                    "bins": 16,
                },
                {
                    "id": "delays-by-route",
                    "intent": "distribution",
                    "title": "Minutes late by route",
                    "dataset": "delays",
                    "measure": "minutes_late",
                    "form": "box",
                    "group": "delay_route",
                },
                {
                    "id": "delays-box",
                    "intent": "distribution",
                    "title": "Minutes late, all routes",
                    "dataset": "delays",
                    "measure": "minutes_late",
                    "form": "box",
                },
                {
                    "id": "length-vs-on-time",
                    "intent": "relationship",
                    "title": "Route length and punctuality",
                    "dataset": "route_profile",
                    "x": "length_km",
                    "y": "on_time",
                    "label": "route",
                    "fit": True,
                },
                {
                    "id": "length-vs-cost",
                    "intent": "relationship",
                    "title": "Route length and cost per crossing",
                    "dataset": "route_profile",
                    "x": "length_km",
                    "y": "cost_per_crossing",
                },
                {
                    "id": "length-vs-cost-fit",
                    "intent": "relationship",
                    "title": "Route length and cost per crossing, with a fitted line",
                    "dataset": "route_profile",
                    "x": "length_km",
                    "y": "cost_per_crossing",
                    "label": "route",
                    "fit": True,
                },
            ],
        },
    ]


def build(seed: int = SEED) -> dict[str, Any]:
    """The gallery's report definition (a plain dict, ready for ``json.dumps``)."""
    story = _Story(seed)
    return {
        "version": 1,
        "report": {
            "id": "kestrel-sound-gallery",
            "title": "Kestrel Sound Ferry Trust — every chart the service draws",
            "period": {
                "start": "2025-12-01",
                "end": "2026-11-30",
                "label": "Twelve months to November 2026",
            },
            "as_of": AS_OF,
            "owner": "Kestrel Sound Ferry Trust, operations desk (invented for this example)",
            "audience": "Anyone checking how the service draws",
            "locale": "en-GB",
        },
        "datasets": _datasets(story),
        "sections": _sections(story),
    }


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0] if __doc__ else None)
    parser.add_argument("-o", "--out", type=Path, help="write the definition here (else stdout)")
    parser.add_argument("--seed", type=int, default=SEED)
    args = parser.parse_args(argv)
    text = json.dumps(build(args.seed), indent=1, ensure_ascii=False) + "\n"
    if args.out is None:
        sys.stdout.write(text)
    else:
        args.out.write_text(text, encoding="utf-8")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
