"""The load test, small: a real server, a few clients for a few seconds; nothing is lost,
duplicated or answered 5xx, and every accepted job ends with exactly one draft."""

from __future__ import annotations

from bench import load


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


def test_a_short_soak_holds_steady() -> None:
    """The soak, CI-sized (about 45 s): a steady 2 definitions a second for 24 s with every job
    polled; no 5xx, no request without an answer, every post accepted, every job done with one
    draft, and the memory of the service and its workers grew less than the bound after warm-up."""
    result = load.soak(
        duration=24, rate=2, workers=2, sample_every=2, warmup_s=12, drain_s=120, variants=3
    )
    assert load.soak_problems(result, max_growth_mb=50) == [], result
    assert result["posted"] == 48
    assert result["server_errors"] == 0
    assert result["jobs_by_status"] == {"done": 48}
    assert result["poll_latency_ms"]["count"] > 0  # the jobs were polled, not only posted
    assert result["post_latency_ms"]["count"] == 48
    samples = result["memory_samples"]
    assert len(samples) >= 10
    assert all(s["processes"] >= 3 for s in samples)  # the service and its two render workers
    assert all(s["service_mb"] > 0 for s in samples)


def test_memory_growth_is_measured_after_the_warm_up() -> None:
    samples = [
        {"at_s": t, "service_mb": 100.0 + t, "total_mb": 300.0 + 2 * t}
        for t in (0.0, 10.0, 20.0, 30.0, 40.0, 50.0, 60.0)
    ]
    # after 20 s: the first three (20, 30, 40) have median 30, the last three (40, 50, 60) 50
    grown = load.growth(samples, warmup_s=20)
    assert grown == {
        "service_growth_mb": 20.0,
        "service_peak_mb": 160.0,
        "total_growth_mb": 40.0,
        "total_peak_mb": 420.0,
    }
    fine = {
        "server_errors": 0,
        "accepted": 2,
        "posted": 2,
        "distinct_jobs": 2,
        "jobs_by_status": {"done": 2},
        "drafts": 2,
        "drafts_of_jobs": 2,
        "distinct_drafts_of_jobs": 2,
        "transport_errors": {},
        "memory": grown,
    }
    assert load.soak_problems(fine, max_growth_mb=50) == []
    assert load.soak_problems(fine, max_growth_mb=30) == [
        "memory grew 40.0 MB after warm-up (total_growth_mb), over 30 MB"
    ]
    lost = load.soak_problems(fine | {"transport_errors": {"ReadTimeout": 1}}, max_growth_mb=50)
    assert lost == ["requests failed without an answer: {'ReadTimeout': 1}"]
    refused = load.soak_problems(fine | {"posted": 3}, max_growth_mb=50)
    assert refused == ["only 2 of 3 posts were accepted"]
