"""Background builds on more than one machine: jobs on Celery workers through a Redis broker.

The embedded path (``service.runner.jobs.LocalJobs``: the service's own worker processes, SQLite, local
files) needs no set-up and stays the default. With ``PLUMBLINE_QUEUE_URL=redis://…`` the service
records the job and sends its id to the broker (``jobs.CeleryJobs``); any number of workers
(``plumbline worker``, or ``celery -A service.distributed.app worker``) build it (``tasks``),
reading the definition from the shared store (``service.archive.objects``) and writing progress,
the draft and the outcome to the shared archive.

Delivery is at least once (late acknowledgement; a message whose worker vanished is delivered
again after the broker's visibility timeout), so a build is idempotent: a finished job is not
built again, and the draft and the job's *done* are committed in one transaction that only one
delivery can win.
"""
