"""Allow ``python -m rankwise``."""

from rankwise.app import main

raise SystemExit(main())
