"""Test set-up shared by every tier: offscreen Qt, and no contact with the user's own settings."""

import os
import tempfile

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

# Qt settings, recent files and the recovery file go to a throw-away home for the whole run.
_ISOLATED_HOME = tempfile.mkdtemp(prefix="rankwise-tests-")
for _variable in ("XDG_CONFIG_HOME", "XDG_DATA_HOME", "XDG_STATE_HOME", "XDG_CACHE_HOME"):
    os.environ[_variable] = os.path.join(_ISOLATED_HOME, _variable.lower())

# Property tests: no per-example time limit (a busy CI machine is no bug), and in CI the same
# examples on every run, so that a red run can be reproduced and a green one means the same thing.
from hypothesis import HealthCheck, settings  # noqa: E402

settings.register_profile("local", deadline=None)
settings.register_profile("ci", deadline=None, derandomize=True,
                          suppress_health_check=[HealthCheck.too_slow])
settings.load_profile("ci" if os.environ.get("CI") else "local")
