"""``python -m bench --out out/bench``: Plumbline against the plain-library floor."""

from bench.run import main

raise SystemExit(main())
