"""``python -m service.bench --out out/bench``: Plumbline against the plain-library floor."""

from service.bench.run import main

raise SystemExit(main())
