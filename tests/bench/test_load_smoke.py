"""The load test, small: a real server, a few clients for a few seconds; nothing is lost,
duplicated or answered 5xx, and every accepted job ends with exactly one draft."""

from __future__ import annotations

from service.bench import load


def test_a_short_load_run_loses_and_duplicates_nothing() -> None:
    result = load.run(clients=4, seconds=4, workers=1, drain_s=180, max_queued=8)
    assert load.consistent(result) == [], result
    assert result["accepted"] > 0
    assert result["server_errors"] == 0
    assert set(result["status_codes"]) <= {"202", "429"}  # 429: the queue was full; retried
    assert result["drafts"] == result["accepted"]
    assert result["requests"] == sum(result["status_codes"].values())


def test_consistency_finds_what_went_wrong() -> None:
    fine = {
        "server_errors": 0,
        "accepted": 2,
        "distinct_jobs": 2,
        "jobs_by_status": {"done": 2},
        "drafts": 2,
        "drafts_of_jobs": 2,
        "distinct_drafts_of_jobs": 2,
    }
    assert load.consistent(fine) == []
    assert load.consistent(fine | {"server_errors": 1}) == ["1 answers were 5xx"]
    assert load.consistent(fine | {"distinct_jobs": 1}) == ["a job id was given twice"]
    lost = load.consistent(fine | {"jobs_by_status": {"done": 1, "failed": 1}})
    assert lost == ["not every accepted job ended done: {'done': 1, 'failed': 1}"]
    twice = load.consistent(fine | {"drafts": 3})
    assert twice == ["drafts and jobs do not match one to one"]
