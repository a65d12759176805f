"""Test set-up shared by every tier: offscreen Qt, and no contact with the user's own settings."""

import os
import tempfile

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

# Qt settings, recent files and the recovery file go to a throw-away home for the whole run.
_ISOLATED_HOME = tempfile.mkdtemp(prefix="rankwise-tests-")
for _variable in ("XDG_CONFIG_HOME", "XDG_DATA_HOME", "XDG_STATE_HOME", "XDG_CACHE_HOME"):
    os.environ[_variable] = os.path.join(_ISOLATED_HOME, _variable.lower())
