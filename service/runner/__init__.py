"""The job runner: worker processes that build, seal and verify packs, and background jobs.

- ``pool``: worker processes that can be stopped one by one (a deadline per job, a memory limit);
- ``workers``: the service's render workers and the functions they run (``build_pack``);
- ``budget``: one job under a time and memory budget (``run_alone``, for the command line), and
  what a worker loads before its memory limit applies;
- ``jobs``: background builds — :class:`~service.runner.jobs.Jobs`, the interface both runners
  satisfy (``LocalJobs`` here; ``service.distributed.jobs.CeleryJobs`` on a queue), and the job
  states (:class:`~service.runner.jobs.JobState`); ``views``: a job as its author sees it;
- ``services``: what the HTTP routes and the review pages share (archive, store, workers, jobs)
  and the steps that need a worker (build a draft, sign off and seal, verify).

The runner sits above the workflow and below the edges (``api``, ``web``, ``distributed``), which
import it and never each other. It is built in one place, the composition root ``service.app``.
"""
