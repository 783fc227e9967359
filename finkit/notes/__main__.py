"""``python -m finkit.notes``: register the kernel (make), or sync template defaults."""

from finkit.notes.render import main

raise SystemExit(main())
