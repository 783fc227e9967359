"""``python -m finkit.batch --run-task TASK.json RESULT.json``: render one variant (Dask workers,
or a parent that cannot fork safely)."""

from finkit.batch.runner import main

raise SystemExit(main())
